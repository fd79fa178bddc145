package handlers

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"net/http"
	"net/url"
	"strconv"
	"strings"
	"testing"

	"lagwright/analysis"
	"lagwright/store"
	"lagwright/store/storetest"
	"lagwright/units"
)

// lineFormValuesFor is a chilled-water line typed in US units.
func lineFormValuesFor() url.Values {
	return url.Values{
		"tag": {"CHW-1"}, "service": {"Chilled water supply"}, "location": {"indoor"}, "exposure": {"exposed"},
		"shape": {"pipe-horizontal"}, "pipe_size": {"NPS 2"}, "fluid": {"water"}, "operating_temp_c": {"44"},
		"length_m": {"120"}, "fittings.elbows": {"4"}, "fittings.valves": {"2"},
		"layers[0].material": {"elastomeric_c534_gr1"}, "layers[0].thickness_mm": {"1"},
		"layers[1].material": {""}, "layers[1].thickness_mm": {""},
		"jacket": {"pvc_jacket"}, "notes": {"north wall"},
	}
}

func projectLinesOf(t *testing.T, st *store.Store, pid int64) []store.Line {
	t.Helper()
	l, err := st.Lines(context.Background(), pid)
	if err != nil {
		t.Fatal(err)
	}
	return l
}

func nearValue(a, b, tol float64) bool { return math.Abs(a-b) <= tol }

func TestLinePagesCreateEditDuplicateDelete(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	p := createTestProject(t, st, "us")
	base := fmt.Sprintf("/projects/%d", p.ID)

	rec := do(t, h, "GET", base+"/lines/new", nil, nil)
	body := rec.Body.String()
	if rec.Code != 200 || !strings.Contains(body, `name="layers[1].thickness_mm"`) || !strings.Contains(body, `hx-trigger="input changed delay:300ms, change"`) ||
		!strings.Contains(body, `hx-sync="this:replace"`) || !strings.Contains(body, `<option value="NPS 2"`) || !strings.Contains(body, `<option value="CTS 1"`) {
		t.Fatalf("new line page = %d: lacks two layer rows, the live-results attributes or the size picker", rec.Code)
	}

	rec = postPage(t, h, base+"/lines", lineFormValuesFor(), nil)
	if rec.Code != http.StatusSeeOther {
		t.Fatalf("save line = %d: %s", rec.Code, rec.Body)
	}
	lines := projectLinesOf(t, st, p.ID)
	if len(lines) != 1 {
		t.Fatalf("%d lines after save", len(lines))
	}
	var in analysis.Input
	_ = json.Unmarshal(lines[0].Input, &in)
	if in.PipeSize != "NPS 2" || len(in.Layers) != 1 || !nearValue(*in.Layers[0].ThicknessMM, 25.4, 1e-9) || // blank row ignored; 1 in = 25.4 mm exactly
		!nearValue(*in.OperatingTempC, 6.666666667, 1e-6) || !nearValue(*in.LengthM, 36.576, 1e-9) { // 44 °F; 120 ft = 36.576 m exactly
		t.Errorf("stored input %s", lines[0].Input)
	}
	if lines[0].ResultHash == "" || len(lines[0].Result) == 0 || string(lines[0].Fittings) != `{"caps": 0, "tees": 0, "elbows": 4, "valves": 2, "reducers": 0, "strainers": 0, "flange_pairs": 0}` {
		t.Errorf("stored result hash %q, fittings %s", lines[0].ResultHash, lines[0].Fittings)
	}
	lineURL := fmt.Sprintf("%s/lines/%d", base, lines[0].ID)

	// The line page shows the stored values in US units and the results with cautions.
	rec = do(t, h, "GET", lineURL, nil, nil)
	body = rec.Body.String()
	for _, want := range []string{`value="44"`, `value="120"`, `value="1"`, `data-testid="r-heat-flow"`, `Btu/h·ft`,
		`data-testid="cautions"`, `licensed engineer`, `data-testid="profile"`, `<svg`, `data-testid="sizing"`} {
		if !strings.Contains(body, want) {
			t.Errorf("line page lacks %s", want)
		}
	}

	// The project page lists it with its units and a totals row.
	rec = do(t, h, "GET", base, nil, nil)
	body = rec.Body.String()
	for _, want := range []string{`data-tag="CHW-1"`, `NPS 2`, `120.0`, `44.0`, `Btu/h·ft`, `data-testid="total-length">120.0 ft`, `data-testid="total-heat"`, `°F`} {
		if !strings.Contains(body, want) {
			t.Errorf("project page lacks %s", want)
		}
	}

	// A per-line humidity set through the API is not on the form: saving the form keeps it.
	if rec := do(t, h, "PATCH", "/api/v1"+lineURL, strings.NewReader(fmt.Sprintf(`{"version": %d, "relative_humidity_pct": 85, "criteria": {"economic": true}}`, lines[0].Version)), nil); rec.Code != 200 {
		t.Fatalf("API patch = %d: %s", rec.Code, rec.Body)
	}
	lines[0].Version++

	// Edit: change the thickness with a fraction and save.
	f := lineFormValuesFor()
	f.Set("version", fmt.Sprint(lines[0].Version))
	f.Set("layers[0].thickness_mm", "1-1/2")
	if rec := postPage(t, h, lineURL, f, nil); rec.Code != http.StatusSeeOther {
		t.Fatalf("edit line = %d: %s", rec.Code, rec.Body)
	}
	l, _ := st.Line(context.Background(), p.ID, lines[0].ID)
	_ = json.Unmarshal(l.Input, &in)
	if !nearValue(*in.Layers[0].ThicknessMM, 38.1, 1e-9) || l.Version != lines[0].Version+1 {
		t.Errorf("after edit: thickness %v, version %d", *in.Layers[0].ThicknessMM, l.Version)
	}
	if in.RelativeHumidityPct == nil || *in.RelativeHumidityPct != 85 || in.Criteria == nil || in.Criteria.Economic == nil || !*in.Criteria.Economic {
		t.Errorf("saving the form dropped keys it does not show: %s", l.Input)
	}

	// Duplicate (POST) opens the copy.
	rec = postPage(t, h, lineURL+"/duplicate", url.Values{}, nil)
	if rec.Code != http.StatusSeeOther {
		t.Fatalf("duplicate = %d", rec.Code)
	}
	lines = projectLinesOf(t, st, p.ID)
	if len(lines) != 2 || lines[1].Tag != "CHW-1-copy" || string(lines[1].Input) != string(lines[0].Input) ||
		rec.Header().Get("Location") != fmt.Sprintf("%s/lines/%d", base, lines[1].ID) {
		t.Fatalf("after duplicate: %d lines, Location %q", len(lines), rec.Header().Get("Location"))
	}
	if postPage(t, h, lineURL+"/duplicate", url.Values{}, nil); projectLinesOf(t, st, p.ID)[2].Tag != "CHW-1-copy2" {
		t.Errorf("second duplicate is not CHW-1-copy2")
	}

	// Delete: a confirm page without JS, then the POST.
	copyURL := fmt.Sprintf("%s/lines/%d", base, lines[1].ID)
	rec = do(t, h, "GET", copyURL+"/delete", nil, nil)
	if rec.Code != 200 || !strings.Contains(rec.Body.String(), `action="`+copyURL+`/delete"`) || len(projectLinesOf(t, st, p.ID)) != 3 {
		t.Fatalf("delete confirm page = %d (and GET must not delete)", rec.Code)
	}
	rec = postPage(t, h, copyURL+"/delete", url.Values{}, nil)
	if rec.Code != http.StatusSeeOther || rec.Header().Get("Location") != base {
		t.Errorf("delete = %d → %q", rec.Code, rec.Header().Get("Location"))
	}
	rec = postPage(t, h, lineURL+"/delete", url.Values{}, map[string]string{"HX-Request": "true"})
	if rec.Code != http.StatusNoContent || rec.Header().Get("HX-Redirect") != base {
		t.Errorf("htmx delete = %d, HX-Redirect %q", rec.Code, rec.Header().Get("HX-Redirect"))
	}
	if n := len(projectLinesOf(t, st, p.ID)); n != 1 {
		t.Errorf("%d lines after two deletes, want 1", n)
	}
	if rec := do(t, h, "GET", copyURL, nil, nil); rec.Code != http.StatusNotFound {
		t.Errorf("deleted line page = %d, want 404", rec.Code)
	}
}

func TestLineFormValidation(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	p := createTestProject(t, st, "us")
	base := fmt.Sprintf("/projects/%d", p.ID)

	for _, c := range []struct {
		name   string
		set    map[string]string
		errors []string // fields with a message beside them
		kept   []string // typed values on the page again
	}{
		{"unparseable values", map[string]string{"tag": "", "layers[0].thickness_mm": "thick", "length_m": "12,5", "operating_temp_c": "hot"},
			[]string{"tag", "layers[0].thickness_mm", "length_m", "operating_temp_c"}, []string{`value="thick"`, `value="12,5"`, `value="hot"`}},
		{"analysis rejects the line", map[string]string{"layers[0].thickness_mm": "-1", "operating_temp_c": "2000 °F"},
			[]string{"layers[0].thickness_mm", "operating_temp_c"}, []string{`value="-1"`, `value="2000 °F"`}},
		{"material missing on a row with a thickness", map[string]string{"layers[1].thickness_mm": "1/2"},
			[]string{"layers[1].material"}, []string{`value="1/2"`}},
		{"unknown pipe size", map[string]string{"pipe_size": "NPS 7"}, []string{"pipe_size"}, []string{`value="NPS 7"`}},
		// 150 psig steam saturates near 366 °F (steam tables, from memory): 300 °F is below it.
		{"steam below saturation, tracing factor out of range", map[string]string{"fluid": "steam", "steam_gauge_pressure_kpa": "150",
			"operating_temp_c": "300", "criteria.maintain_temp_c": "50", "criteria.heat_trace_factor": "5", "criteria.freeze_model": "full", "vapour_retarder": "canvas"},
			[]string{"operating_temp_c", "criteria.heat_trace_factor", "vapour_retarder"}, []string{`value="300"`, `value="5"`, `value="full" selected`}},
	} {
		t.Run(c.name, func(t *testing.T) {
			f := lineFormValuesFor()
			for k, v := range c.set {
				f.Set(k, v)
			}
			rec := postPage(t, h, base+"/lines", f, nil)
			body := rec.Body.String()
			if rec.Code != http.StatusUnprocessableEntity {
				t.Fatalf("= %d, want 422", rec.Code)
			}
			for _, e := range c.errors {
				if !strings.Contains(body, `data-testid="err-`+e+`"`) {
					t.Errorf("no message beside %s", e)
				}
			}
			for _, k := range append(c.kept, `value="Chilled water supply"`, `north wall`) {
				if !strings.Contains(body, k) {
					t.Errorf("typed input %s lost", k)
				}
			}
			if n := len(projectLinesOf(t, st, p.ID)); n != 0 {
				t.Errorf("%d lines saved from an invalid form", n)
			}
		})
	}
}

func TestLineFormVersionConflict(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	p := createTestProject(t, st, "si")
	base := fmt.Sprintf("/projects/%d", p.ID)
	if rec := postPage(t, h, base+"/lines", lineFormValuesFor(), nil); rec.Code != http.StatusSeeOther {
		t.Fatalf("save = %d", rec.Code)
	}
	l := projectLinesOf(t, st, p.ID)[0]
	lineURL := fmt.Sprintf("%s/lines/%d", base, l.ID)
	// Someone else saves first (through the API).
	rec := do(t, h, "PATCH", "/api/v1"+lineURL, strings.NewReader(fmt.Sprintf(`{"version": %d, "service": "theirs"}`, l.Version)), nil)
	if rec.Code != 200 {
		t.Fatalf("API patch = %d: %s", rec.Code, rec.Body)
	}
	f := lineFormValuesFor()
	f.Set("version", fmt.Sprint(l.Version))
	f.Set("service", "mine, typed carefully")
	f.Set("layers[0].thickness_mm", "32")
	rec = postPage(t, h, lineURL, f, nil)
	body := rec.Body.String()
	if rec.Code != http.StatusConflict || !strings.Contains(body, `data-testid="conflict"`) ||
		!strings.Contains(body, `value="mine, typed carefully"`) || !strings.Contains(body, `value="32"`) ||
		!strings.Contains(body, fmt.Sprintf(`name="version" value="%d"`, l.Version+1)) {
		t.Errorf("stale save = %d, want 409 with a notice, the typed input and the current version", rec.Code)
	}
	got, _ := st.Line(context.Background(), p.ID, l.ID)
	if got.Service != "theirs" {
		t.Errorf("stale save overwrote: service %q", got.Service)
	}
}

func TestLineResultsFragment(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	p := createTestProject(t, st, "us")
	target := fmt.Sprintf("/projects/%d/lines/results", p.ID)
	f := lineFormValuesFor()
	f.Set("fluid", "steam")
	f.Set("operating_temp_c", "")
	f.Set("steam_gauge_pressure_kpa", "100")
	f.Set("layers[0].material", "mineral_fiber_pipe_c547_t1")
	f.Set("layers[0].thickness_mm", "1/2")
	f.Set("jacket", "aluminium_new")
	rec := postPage(t, h, target, f, map[string]string{"HX-Request": "true"})
	body := rec.Body.String()
	if rec.Code != 200 || strings.Contains(body, "<html") {
		t.Fatalf("fragment = %d (whole page: %v)", rec.Code, strings.Contains(body, "<html"))
	}
	for _, want := range []string{`data-testid="r-heat-flow"`, `data-testid="r-condensate"`, `data-status="too_hot"`, `Personnel protection`, `data-testid="profile"`} {
		if !strings.Contains(body, want) {
			t.Errorf("fragment lacks %s", want)
		}
	}
	// Without JS the Calculate button re-renders the whole page; nothing saved.
	rec = postPage(t, h, target, f, nil)
	if rec.Code != 200 || !strings.Contains(rec.Body.String(), "<html") || !strings.Contains(rec.Body.String(), `value="100"`) {
		t.Errorf("calculate = %d, want the whole page with the typed values", rec.Code)
	}
	// Errors in the fragment: 200 (htmx swaps 2xx only), listed.
	f.Set("layers[0].thickness_mm", "x")
	rec = postPage(t, h, target, f, map[string]string{"HX-Request": "true"})
	if rec.Code != 200 || !strings.Contains(rec.Body.String(), `data-testid="result-problems"`) {
		t.Errorf("fragment with errors = %d", rec.Code)
	}
	if n := len(projectLinesOf(t, st, p.ID)); n != 0 {
		t.Errorf("results endpoint saved %d lines", n)
	}
}

// TestFormUnitParsing: form values typed in the project's units, with fractions and units.
func TestFormUnitParsing(t *testing.T) {
	for _, c := range []struct {
		name string
		f    numField
		sys  units.System
		in   string
		want float64 // SI
		err  bool
	}{
		{"mixed number, inches", numField{Q: units.Length}, units.US, "1-1/2", 38.1, false},         // exact: 1 in = 25.4 mm (NIST SP 811)
		{"fraction with inch mark", numField{Q: units.Length}, units.US, `3/4"`, 19.05, false},      // exact
		{"mixed number with a space", numField{Q: units.Length}, units.US, "2 1/2 in", 63.5, false}, // exact
		{"mm typed in a US project", numField{Q: units.Length}, units.US, "25 mm", 25, false},       // a unit overrides
		{"inches typed in an SI project", numField{Q: units.Length}, units.SI, "1 in", 25.4, false}, // exact
		{"plain mm", numField{Q: units.Length}, units.SI, "38", 38, false},
		{"°F", numField{Q: units.Temp}, units.US, "212", 100, false}, // exact: (212 − 32)·5/9
		{"°C in a US project", numField{Q: units.Temp}, units.US, "20 °C", 20, false},
		{"°F typed in an SI project", numField{Q: units.Temp}, units.SI, "-40 F", -40, false}, // exact: −40 °F = −40 °C
		{"temperature difference °F", numField{Q: units.TempDiff}, units.US, "1.8", 1, false}, // exact: 1.8 °F = 1 K
		{"feet", numField{Q: units.LongLength}, units.US, "100", 30.48, false},                // exact: 1 ft = 0.3048 m
		{"psi gauge", numField{Q: units.Pressure}, units.US, "15", 103.4213594, false},        // exact: 1 psi = 6.894757293 kPa
		{"specific heat Btu/lb·°F", numField{Q: cpQuantity}, units.US, "1", 4186.8, false},    // exact: IT Btu/(lb·°F) = 4186.8 J/(kg·K)
		{"percent", numField{Scale: 0.01}, units.SI, "5 %", 0.05, false},
		{"whole number", numField{Int: true}, units.US, "4", 4, false},
		{"not a number", numField{Q: units.Length}, units.US, "thick", 0, true},
		{"decimal comma", numField{Q: units.LongLength}, units.SI, "12,5", 0, true},
		{"wrong unit", numField{Q: units.Length}, units.US, "3 °F", 0, true},
		{"fractional count", numField{Int: true}, units.US, "1.5", 0, true},
		{"below absolute zero", numField{Q: units.Temp}, units.US, "-500", 0, true},
	} {
		t.Run(c.name, func(t *testing.T) {
			v, err := c.f.parse(c.sys, c.in)
			if (err != nil) != c.err {
				t.Fatalf("parse(%q) error %v, want error %v", c.in, err, c.err)
			}
			if c.err {
				return
			}
			var got float64
			switch x := v.(type) {
			case int:
				got = float64(x)
			case float64:
				got = x
			}
			if !nearValue(got, c.want, 1e-6*math.Max(1, math.Abs(c.want))) {
				t.Errorf("parse(%q) = %.9g, want %.9g", c.in, got, c.want)
			}
			// What the form shows for the stored value reads back: near it on its own
			// (rounded for reading), exactly with the hidden exact value beside it.
			shown := c.f.format(c.sys, got)
			back, err := c.f.parse(c.sys, shown)
			if err != nil {
				t.Fatalf("format(%g) does not read back: %v", got, err)
			}
			if bf, ok := back.(float64); ok && !nearValue(bf, got, 5e-3*math.Max(1, math.Abs(got))) {
				t.Errorf("format/parse round trip %.12g → %q → %.12g", got, shown, bf)
			}
			if _, isInt := back.(int); !isInt {
				exact, ok := c.f.exact(strconv.FormatFloat(got, 'g', -1, 64), c.sys, shown)
				if bf, _ := exact.(float64); !ok || bf != got {
					t.Errorf("exact round trip %.12g → %q → %v, %v", got, shown, exact, ok)
				}
				if _, ok := c.f.exact(strconv.FormatFloat(got, 'g', -1, 64), c.sys, shown+"1"); ok {
					t.Errorf("a changed field %q kept the exact value %g", shown+"1", got)
				}
			}
		})
	}
}
