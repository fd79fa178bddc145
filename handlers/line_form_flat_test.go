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

// TestLineFormFlatHeatFlux: on a flat surface the maximum heat flow is a heat flux, so
// the form labels and converts it per area. 1 Btu/h·ft² = 3.154591 W/m² (ASHRAE
// Handbook—Fundamentals, ch. 38 conversion factors; common practice).
func TestLineFormFlatHeatFlux(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	p := createTestProject(t, st, "us")
	base := fmt.Sprintf("/projects/%d", p.ID)
	f := lineFormValuesFor()
	f.Set("shape", "flat-up")
	f.Del("pipe_size")
	f.Del("fittings.elbows")
	f.Del("fittings.valves")
	f.Set("area_m2", "200")
	f.Set("criteria.max_heat_flow_w_per_m", "10")
	if rec := postPage(t, h, base+"/lines", f, nil); rec.Code != http.StatusSeeOther {
		t.Fatalf("save flat line = %d: %s", rec.Code, rec.Body)
	}
	l := projectLinesOf(t, st, p.ID)[0]
	var in analysis.Input
	if err := json.Unmarshal(l.Input, &in); err != nil {
		t.Fatal(err)
	}
	if in.Criteria == nil || in.Criteria.MaxHeatFlowWPerM == nil || math.Abs(*in.Criteria.MaxHeatFlowWPerM-31.54591) > 1e-3 {
		t.Fatalf("stored flat heat-flow limit %+v, want 31.546 W/m²", in.Criteria)
	}
	body := do(t, h, "GET", fmt.Sprintf("%s/lines/%d", base, l.ID), nil, nil).Body.String()
	i := strings.Index(body, `name="criteria.max_heat_flow_w_per_m"`)
	if i < 0 {
		t.Fatal("no maximum heat flow field on the flat line's form")
	}
	if near := body[i:min(len(body), i+400)]; !strings.Contains(near, "Btu/h·ft²") || !strings.Contains(near, `value="10"`) {
		t.Errorf("flat line's maximum heat flow field should read 10 Btu/h·ft²: %s", near)
	}
}
