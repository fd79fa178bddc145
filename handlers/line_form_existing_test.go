package handlers

import (
	"encoding/json"
	"fmt"
	"math"
	"net/http"
	"strings"
	"testing"

	"lagwright/analysis"
	"lagwright/store/storetest"
)

// TestLineFormAsFound: the line form saves an as-found survey in SI (1 in = 25.4 mm,
// NIST SP 811), shows it back, names its bad fields beside them (422) and clears it.
func TestLineFormAsFound(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	p := createTestProject(t, st, "us")
	base := fmt.Sprintf("/projects/%d", p.ID)
	f := lineFormValuesFor()
	f.Set("existing.condition", "wet")
	f.Set("existing.material", "elastomeric_c534_gr1")
	f.Set("existing.thickness_mm", "0.5")
	f.Set("existing.missing_pct", "10")
	f.Set("existing.bare.valves", "1")
	if rec := postPage(t, h, base+"/lines", f, nil); rec.Code != http.StatusSeeOther {
		t.Fatalf("save line with a survey = %d: %s", rec.Code, rec.Body)
	}
	l := projectLinesOf(t, st, p.ID)[0]
	var in analysis.Input
	if err := json.Unmarshal(l.Input, &in); err != nil {
		t.Fatal(err)
	}
	e := in.Existing
	if e == nil || e.Condition != "wet" || len(e.Layers) != 1 || math.Abs(*e.Layers[0].ThicknessMM-12.7) > 1e-9 ||
		e.MissingFraction == nil || math.Abs(*e.MissingFraction-0.1) > 1e-12 || len(e.BareFittings) != 1 || e.BareFittings[0] != "valves" {
		t.Fatalf("stored survey %+v", e)
	}
	lineURL := fmt.Sprintf("%s/lines/%d", base, l.ID)
	body := do(t, h, "GET", lineURL, nil, nil).Body.String()
	for _, want := range []string{`data-testid="as-found"`, `name="existing.bare.valves" value="1" checked`, `value="10"`} {
		if !strings.Contains(body, want) {
			t.Errorf("line page lacks %q", want)
		}
	}
	bad := lineFormValuesFor()
	bad.Set("version", fmt.Sprint(l.Version))
	bad.Set("existing.condition", "damaged")
	bad.Set("existing.material", "elastomeric_c534_gr1")
	bad.Set("existing.thickness_mm", "0.5")
	bad.Set("existing.k_factor", "0.2")
	rec := postPage(t, h, lineURL, bad, nil)
	if rec.Code != http.StatusUnprocessableEntity || !strings.Contains(rec.Body.String(), `data-testid="err-existing.k_factor"`) {
		t.Errorf("k factor 0.2 = %d, want 422 with the message beside the field", rec.Code)
	}
	clear := lineFormValuesFor()
	clear.Set("version", fmt.Sprint(l.Version))
	if rec := postPage(t, h, lineURL, clear, nil); rec.Code != http.StatusSeeOther {
		t.Fatalf("clear survey = %d: %s", rec.Code, rec.Body)
	}
	in = analysis.Input{}
	_ = json.Unmarshal(projectLinesOf(t, st, p.ID)[0].Input, &in)
	if in.Existing != nil {
		t.Errorf("survey not cleared: %+v", in.Existing)
	}
}
