package main

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"math"
	"strings"
	"testing"
)

// The freeze-time example of ASHRAE Handbook—Fundamentals ch. 23 (insulation for
// mechanical systems), reproduced through the calc command on its default basis: 2 in
// steel pipe (NPS 2, schedule 40), 1.5 in of insulation with k 0.30 Btu·in/h·ft²·°F, still
// water at 42 °F; air at −18 °F → 1.4 h to 32 °F, air at 20 °F → 4.6 h. The handbook's
// method neglects the pipe wall and the films, so the handbook basis must land within 3 %;
// the fuller model (wall heat capacity, outer film) must give longer times.
func TestCalcFreezeHandbookExample(t *testing.T) {
	const kSI = 0.30 * 0.1442279 // Btu·in/(h·ft²·°F) → W/m·K (NIST SP 811 factor, 0.1442279)
	f2c := func(f float64) float64 { return (f - 32) / 1.8 }
	for _, c := range []struct{ airF, wantH float64 }{{-18, 1.4}, {20, 4.6}} {
		line := func(model string) string {
			return fmt.Sprintf(`{"geometry":"pipe","pipe_size":"NPS 2","fluid":"water","operating_temp_c":%g,"ambient_temp_c":%g,
				"layers":[{"k_w_mk":%g,"thickness_mm":38.1}],"surface_emittance":0.9,"criteria":{"freeze_hours":1%s}}`,
				f2c(42), f2c(c.airF), kSI, model)
		}
		h := calcFreezeHours(t, line(""))
		if math.Abs(h-c.wantH)/c.wantH > 0.03 {
			t.Errorf("air %g °F: %.3f h to 0 °C on the default (handbook) basis, handbook answer %g h (±3 %%)", c.airF, h, c.wantH)
		}
		same := calcFreezeHours(t, line(`,"freeze_model":"handbook"`))
		if same != h {
			t.Errorf("air %g °F: freeze_model \"handbook\" %.4f h differs from the default %.4f h", c.airF, same, h)
		}
		full := calcFreezeHours(t, line(`,"freeze_model":"full"`))
		if !(full > h*1.1) {
			t.Errorf("air %g °F: full model %.3f h should be clearly longer than the handbook basis %.3f h", c.airF, full, h)
		}
	}
}

func calcFreezeHours(t *testing.T, in string) float64 {
	t.Helper()
	var stdout, stderr bytes.Buffer
	if err := run(context.Background(), []string{"calc"}, env(nil), strings.NewReader(in), &stdout, &stderr); err != nil {
		t.Fatalf("calc: %v (%s) %s", err, stderr.String(), stdout.String())
	}
	var out struct {
		Hours       *float64 `json:"freeze_hours_to_0c"`
		Assumptions []string `json:"assumptions"`
	}
	if err := json.Unmarshal(stdout.Bytes(), &out); err != nil || out.Hours == nil {
		t.Fatalf("freeze_hours_to_0c missing: %v %s", err, stdout.String())
	}
	found := false
	for _, a := range out.Assumptions {
		found = found || strings.Contains(a, "freeze_model")
	}
	if !found {
		t.Errorf("assumptions must name the freeze model: %q", out.Assumptions)
	}
	return *out.Hours
}
