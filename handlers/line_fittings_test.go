package handlers

import (
	"encoding/json"
	"fmt"
	"net/http"
	"strings"
	"testing"

	"lagwright/analysis"
	"lagwright/store/storetest"
)

// The line form carries each fitting kind's finish, the covers and the supports into
// the stored input, shows them again, and the results list the heat of each kind; a
// bad choice comes back beside its field with 422.
func TestLineFormFittingsAndSupports(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	p := createTestProject(t, st, "si")
	base := fmt.Sprintf("/projects/%d", p.ID)

	f := lineFormValuesFor()
	f.Set("operating_temp_c", "6")
	f.Set("length_m", "40")
	f.Set("layers[0].thickness_mm", "25")
	f.Set("fitting_finish.valves", "bare")
	f.Set("fitting_finish.elbows", "cover")
	f.Set("fitting_cover.thickness_mm", "40")
	f.Set("supports.kind", "clamp")
	f.Set("supports.spacing_m", "2.5")
	if rec := postPage(t, h, base+"/lines", f, nil); rec.Code != http.StatusSeeOther {
		t.Fatalf("save line = %d: %s", rec.Code, rec.Body)
	}
	l := projectLinesOf(t, st, p.ID)[0]
	var in analysis.Input
	_ = json.Unmarshal(l.Input, &in)
	if in.FittingFinish == nil || in.FittingFinish.Valves != "bare" || in.FittingFinish.Elbows != "cover" ||
		in.FittingCover == nil || *in.FittingCover.ThicknessMM != 40 || in.Supports == nil || in.Supports.Kind != "clamp" || *in.Supports.SpacingM != 2.5 {
		t.Fatalf("stored input %s", l.Input)
	}
	var stored analysis.Stored
	_ = json.Unmarshal(l.Result, &stored)
	if o := stored.Output; o == nil || o.Supports == nil || o.Supports.Count != 16 || o.FittingsHeatW["valves"] >= 0 {
		t.Fatalf("stored answer: %+v", stored.Output)
	}
	rec := do(t, h, "GET", fmt.Sprintf("%s/lines/%d", base, l.ID), nil, nil)
	body := rec.Body.String()
	for _, want := range []string{`data-testid="r-heat-valves"`, `data-testid="r-supports"`, `<option value="bare" selected`, `value="2.5"`} {
		if !strings.Contains(body, want) {
			t.Errorf("line page lacks %s", want)
		}
	}
	f.Set("fitting_finish.valves", "painted")
	f.Set("tag", "CHW-2")
	rec = postPage(t, h, base+"/lines", f, nil)
	if rec.Code != http.StatusUnprocessableEntity || !strings.Contains(rec.Body.String(), `must be &#34;insulated&#34;, &#34;cover&#34; or &#34;bare&#34;`) {
		t.Errorf("bad finish = %d", rec.Code)
	}
}
