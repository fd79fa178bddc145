package handlers

import (
	"context"
	"encoding/json"
	"fmt"
	"net/http"
	"net/url"
	"strings"
	"testing"

	"lagwright/analysis"
	"lagwright/demo"
	"lagwright/store"
	"lagwright/store/storetest"
)

func getJSON(t *testing.T, h http.Handler, method, target, body string) (int, map[string]any) {
	t.Helper()
	rec := do(t, h, method, target, strings.NewReader(body), map[string]string{"Content-Type": "application/json"})
	var m map[string]any
	if rec.Body.Len() > 0 {
		if err := json.Unmarshal(rec.Body.Bytes(), &m); err != nil {
			var list []any
			if json.Unmarshal(rec.Body.Bytes(), &list) != nil {
				t.Fatalf("%s %s: not JSON: %s", method, target, rec.Body)
			}
			m = map[string]any{"list": list}
		}
	}
	return rec.Code, m
}

// formFields lists the fields named in a JSON error answer.
func formFields(m map[string]any) []string {
	var out []string
	list, _ := m["errors"].([]any)
	for _, e := range list {
		out = append(out, e.(map[string]any)["field"].(string))
	}
	return out
}

func hasText(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

func TestProjectAPI(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()

	code, p := getJSON(t, h, "POST", "/api/v1/projects", `{"name": "API plant", "units": "us", "settings": {"indoor": {"ambient_temp_c": 22}}}`)
	if code != http.StatusCreated || p["name"] != "API plant" || p["version"] != 1.0 {
		t.Fatalf("create = %d %v", code, p)
	}
	set := p["settings"].(map[string]any)
	if set["indoor"].(map[string]any)["ambient_temp_c"] != 22.0 || set["outdoor"].(map[string]any)["ambient_temp_c"] != 30.0 {
		t.Errorf("settings not merged over the defaults: %v", set)
	}
	id := int64(p["id"].(float64))
	u := fmt.Sprintf("/api/v1/projects/%d", id)

	for _, c := range []struct {
		name, body string
		fields     []string
	}{
		{"unknown key and bad type", `{"name": "x", "colour": "red", "settings": {"indoor": {"wind_m_s": "fast"}}}`, []string{"colour", "settings.indoor.wind_m_s"}},
		{"missing name, bad units, out of range", `{"name": "", "units": "metric", "settings": {"criteria": {"dew_margin_k": 50}}}`, []string{"name", "units", "settings.criteria.dew_margin_k"}},
	} {
		code, m := getJSON(t, h, "POST", "/api/v1/projects", c.body)
		if code != http.StatusUnprocessableEntity {
			t.Errorf("%s: = %d, want 422", c.name, code)
		}
		for _, f := range c.fields {
			if !hasText(formFields(m), f) {
				t.Errorf("%s: no error for %s in %v", c.name, f, formFields(m))
			}
		}
	}

	code, p2 := getJSON(t, h, "PATCH", u, `{"version": 1, "client": "Them", "settings": {"outdoor": {"wind_m_s": 5}}}`)
	if code != 200 || p2["version"] != 2.0 || p2["client"] != "Them" || p2["name"] != "API plant" ||
		p2["settings"].(map[string]any)["outdoor"].(map[string]any)["wind_m_s"] != 5.0 ||
		p2["settings"].(map[string]any)["indoor"].(map[string]any)["ambient_temp_c"] != 22.0 {
		t.Errorf("patch = %d %v", code, p2)
	}
	if code, _ := getJSON(t, h, "PATCH", u, `{"version": 1, "client": "Stale"}`); code != http.StatusConflict {
		t.Errorf("stale patch = %d, want 409", code)
	}
	if code, m := getJSON(t, h, "PATCH", u, `{"client": "No version"}`); code != 422 || !hasText(formFields(m), "version") {
		t.Errorf("patch without version = %d", code)
	}
	if code, m := getJSON(t, h, "GET", "/api/v1/projects", ""); code != 200 || len(m["list"].([]any)) != 1 {
		t.Errorf("list = %d %v", code, m)
	}
	if code, _ := getJSON(t, h, "DELETE", u, ""); code != http.StatusNoContent {
		t.Errorf("delete = %d", code)
	}
	if code, _ := getJSON(t, h, "GET", u, ""); code != 404 {
		t.Errorf("deleted project = %d, want 404", code)
	}
}

const steamLine = `{"tag": "STM-1", "service": "LP steam", "geometry": "pipe", "pipe_size": "NPS 4", "fluid": "steam",
	"steam_gauge_pressure_kpa": 700, "length_m": 30, "fittings": {"elbows": 2},
	"layers": [{"material": "mineral_fiber_pipe_c547_t1", "thickness_mm": 12.7}], "jacket": "aluminium_new"}`

func TestLineAPI(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	p := createTestProject(t, st, "si")
	base := fmt.Sprintf("/api/v1/projects/%d/lines", p.ID)

	code, l := getJSON(t, h, "POST", base, steamLine)
	if code != http.StatusCreated {
		t.Fatalf("create = %d %v", code, l)
	}
	res, _ := l["result"].(map[string]any)
	if l["tag"] != "STM-1" || l["pipe_size"] != "NPS 4" || l["length_m"] != 30.0 || l["version"] != 1.0 || res == nil ||
		res["heat_flow_w_per_m"] == nil || l["fittings"].(map[string]any)["elbows"] != 2.0 || l["input"] == nil {
		t.Fatalf("created line %v", l)
	}
	if status, _ := l["status"].([]any); len(status) == 0 || status[0] != StatusTooHot {
		t.Errorf("status %v, want too_hot first (12.7 mm on 700 kPa steam)", l["status"])
	}
	u := fmt.Sprintf("%s/%d", base, int64(l["id"].(float64)))

	for _, c := range []struct {
		name, body string
		fields     []string
	}{
		{"unknown key, bad type", `{"tag": "X-1", "geometry": "pipe", "pipe_size": "NPS 2", "operating_temp_c": "hot", "colour": 1}`, []string{"colour", "operating_temp_c"}},
		{"analysis rejects", `{"tag": "X-2", "geometry": "pipe", "pipe_size": "NPS 2", "operating_temp_c": 80, "layers": [{"material": "mineral_fiber_pipe_c547_t1", "thickness_mm": -3}], "jacket": "pvc_jacket"}`, []string{"layers[0].thickness_mm"}},
		{"line columns", `{"tag": "", "location": "roof", "geometry": "pipe", "pipe_size": "NPS 2", "operating_temp_c": 80}`, []string{"tag", "location"}},
		{"unknown material", `{"tag": "X-3", "geometry": "pipe", "pipe_size": "NPS 2", "operating_temp_c": 80, "layers": [{"material": "unobtainium", "thickness_mm": 25}], "jacket": "pvc_jacket"}`, []string{"layers[0].material"}},
	} {
		code, m := getJSON(t, h, "POST", base, c.body)
		if code != http.StatusUnprocessableEntity {
			t.Errorf("%s: = %d, want 422", c.name, code)
		}
		for _, f := range c.fields {
			if !hasText(formFields(m), f) {
				t.Errorf("%s: no error for %s in %v", c.name, f, formFields(m))
			}
		}
	}
	if n := len(projectLinesOf(t, st, p.ID)); n != 1 {
		t.Errorf("%d lines stored after invalid posts, want 1", n)
	}
	if code, _ := getJSON(t, h, "POST", base, steamLine); code != http.StatusConflict {
		t.Errorf("duplicate tag = %d, want 409", code)
	}

	code, l2 := getJSON(t, h, "PATCH", u, `{"version": 1, "layers": [{"material": "mineral_fiber_pipe_c547_t1", "thickness_mm": 63.5}]}`)
	if code != 200 || l2["version"] != 2.0 || l2["tag"] != "STM-1" || l2["length_m"] != 30.0 {
		t.Fatalf("patch = %d %v", code, l2)
	}
	if status := l2["status"].([]any); len(status) != 1 || status[0] == StatusTooHot {
		t.Errorf("63.5 mm still too hot: %v", status)
	}
	if code, _ := getJSON(t, h, "PATCH", u, `{"version": 1, "service": "stale"}`); code != http.StatusConflict {
		t.Errorf("stale patch = %d, want 409", code)
	}
	if code, m := getJSON(t, h, "PATCH", u, `{"version": 2, "operating_temp_c": 5000}`); code != 422 || len(formFields(m)) == 0 {
		t.Errorf("bad patch = %d %v", code, m)
	}
	// A GET, sent back as it is with one change, is accepted.
	_, cur := getJSON(t, h, "GET", u, "")
	cur["notes"] = "round trip"
	js, _ := json.Marshal(cur)
	if code, m := getJSON(t, h, "PATCH", u, string(js)); code != 200 || m["notes"] != "round trip" || m["version"] != 3.0 {
		t.Errorf("round-trip patch = %d %v", code, formFields(m))
	}
	if code, m := getJSON(t, h, "GET", base, ""); code != 200 || len(m["list"].([]any)) != 1 {
		t.Errorf("list = %d", code)
	}
	if code, _ := getJSON(t, h, "DELETE", u, ""); code != http.StatusNoContent {
		t.Errorf("delete = %d", code)
	}
	if code, _ := getJSON(t, h, "GET", u, ""); code != 404 {
		t.Errorf("deleted line = %d, want 404", code)
	}
}

// TestStoredResultsStaleAndFresh: a view of fresh lines does no physics (a marker put in
// the stored result survives a second view); changing the project's conditions makes
// the results stale, and the next view recomputes and stores them.
func TestStoredResultsStaleAndFresh(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	ctx := context.Background()
	p := createTestProject(t, st, "si")
	base := fmt.Sprintf("/projects/%d", p.ID)
	if code, m := getJSON(t, h, "POST", "/api/v1"+base+"/lines", steamLine); code != 201 {
		t.Fatalf("create line = %d %v", code, m)
	}
	l := projectLinesOf(t, st, p.ID)[0]
	hash0 := l.ResultHash

	// Put a marker in the stored result under the same hash: a view must read it back.
	var stored analysis.Stored
	_ = json.Unmarshal(l.Result, &stored)
	stored.Output.SurfaceTempC = 123.456
	if err := st.SaveResults(ctx, []store.ResultUpdate{{LineID: l.ID, Result: stored.Marshal(), Hash: hash0}}); err != nil {
		t.Fatal(err)
	}
	for i := range 2 {
		if rec := do(t, h, "GET", base, nil, nil); rec.Code != 200 || !strings.Contains(rec.Body.String(), ">123.5<") {
			t.Fatalf("view %d: the stored (marked) result was not used", i+1)
		}
	}
	var after analysis.Stored
	if got := projectLinesOf(t, st, p.ID)[0]; got.ResultHash != hash0 || json.Unmarshal(got.Result, &after) != nil ||
		after.Output == nil || after.Output.SurfaceTempC != 123.456 {
		t.Errorf("a view of a fresh line rewrote its result")
	}

	// Change the indoor conditions through the edit form: the result goes stale.
	f := testProjectForm()
	f.Set("units", "si")
	f.Set("settings.indoor.ambient_temp_c", "35")
	f.Set("settings.outdoor.ambient_temp_c", "30")
	f.Set("settings.outdoor.wind_m_s", "3")
	f.Set("settings.criteria.max_surface_temp_c", "60")
	f.Set("settings.criteria.dew_margin_k", "1")
	f.Set("settings.outdoor.conditions.freeze.ambient_temp_c", "-10")
	f.Set("settings.outdoor.conditions.freeze.initial_temp_c", "10")
	f.Set("settings.fittings.elbow_m", "0.6")
	f.Set("settings.fittings.valve_m", "1.5")
	f.Set("version", "1")
	if rec := postPage(t, h, base+"/edit", f, nil); rec.Code != http.StatusSeeOther {
		t.Fatalf("edit project = %d: %s", rec.Code, rec.Body)
	}
	if got := projectLinesOf(t, st, p.ID)[0]; got.ResultHash != hash0 {
		t.Errorf("saving the project recomputed lines; the next view should")
	}
	if rec := do(t, h, "GET", base, nil, nil); rec.Code != 200 || strings.Contains(rec.Body.String(), ">123.5<") {
		t.Fatalf("view after the conditions changed still shows the old result")
	}
	got := projectLinesOf(t, st, p.ID)[0]
	var fresh analysis.Stored
	_ = json.Unmarshal(got.Result, &fresh)
	if got.ResultHash == hash0 || fresh.Output == nil || fresh.Output.ConditionsUsed.Design.AmbientTempC != 35 {
		t.Errorf("after the change: hash changed %v, design ambient %v", got.ResultHash != hash0, fresh.Output)
	}
	if got.Version != l.Version {
		t.Errorf("recomputing changed the line's version %d → %d (an open form would go stale)", l.Version, got.Version)
	}
	// And a second view leaves it alone.
	do(t, h, "GET", base, nil, nil)
	if again := projectLinesOf(t, st, p.ID)[0]; again.ResultHash != got.ResultHash || string(again.Result) != string(got.Result) {
		t.Errorf("second view changed the stored result")
	}
}

// TestDemoProject: the button creates the demo; every line analyses without field
// errors at the project's conditions; the two lines that are wrong on purpose are flagged.
func TestDemoProject(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	rec := postPage(t, h, "/projects/demo", url.Values{}, nil)
	if rec.Code != http.StatusSeeOther {
		t.Fatalf("demo = %d", rec.Code)
	}
	list, _ := st.Projects(context.Background())
	if len(list) != 1 || list[0].Name != demo.Name || list[0].LineCount < 30 || list[0].LineCount > 60 {
		t.Fatalf("demo projects %v", list)
	}
	_, views := freshLines(t, s, list[0].Project)
	flags := map[string][]string{}
	for _, v := range views {
		if len(v.Result.Errors) > 0 || v.Result.Output == nil {
			t.Errorf("%s: %v", v.Line.Tag, v.Result.Errors)
		}
		flags[v.Line.Tag] = lineStatus(v.Effective, v.Result)
	}
	if !hasText(flags["STM-207"], StatusTooHot) || !hasText(flags["CHW-309"], StatusCondenses) || !hasText(flags["HHW-101"], StatusOK) {
		t.Errorf("flags: STM-207 %v, CHW-309 %v, HHW-101 %v", flags["STM-207"], flags["CHW-309"], flags["HHW-101"])
	}
	body := do(t, h, "GET", rec.Header().Get("Location")+"?sort=-surface", nil, nil).Body.String()
	first := strings.Index(body, `data-testid="line-row"`)
	if first < 0 || !strings.Contains(body[first:first+200], `data-tag="STM-207"`) {
		t.Errorf("sorted by surface temperature descending, the first row is not STM-207")
	}
	if !strings.Contains(body, `aria-sort="descending"`) || !strings.Contains(body, `data-testid="total-heat"`) || !strings.Contains(body, "Btu/h") {
		t.Errorf("project page lacks the sort mark or the totals in US units")
	}
}
