package handlers

import (
	"encoding/json"
	"lagwright/catalog"
	"net/http"
	"net/http/httptest"
	"net/url"
	"strings"
	"testing"

	"lagwright/analysis"
	"lagwright/units"
)

// fuzzForm is a valid form with the fields of raw (a query string, possibly broken)
// laid over it, then key set to value.
func fuzzForm(t *testing.T, valid url.Values, raw, key, value string) (url.Values, *http.Request) {
	t.Helper()
	form := url.Values{}
	for k, v := range valid {
		form[k] = append([]string(nil), v...)
	}
	if extra, _ := url.ParseQuery(raw); extra != nil { // keeps what parses
		for k, v := range extra {
			form[k] = v
		}
	}
	if key != "" {
		form.Set(key, value)
	}
	req := httptest.NewRequest("POST", "/", strings.NewReader(form.Encode()))
	req.Header.Set("Content-Type", "application/x-www-form-urlencoded")
	if err := req.ParseForm(); err != nil {
		t.Fatalf("ParseForm of an encoded form: %v", err)
	}
	return form, req
}

var lineFormSeeds = []struct{ raw, key, value string }{
	{"", "operating_temp_c", "NaN"},
	{"", "operating_temp_c", "-Inf"},
	{"", "length_m", "1e309"},
	{"", "layers[0].thickness_mm", `1-1/2"`},
	{"", "layers[9999999].material", "elastomeric_c534_gr1"},
	{"", "fittings.elbows", "99999999999999999999"},
	{"", "shape", "<script>alert(1)</script>"},
	{"", "pipe_size", `"><img src=x onerror=alert(1)>`},
	{"tag=%zz&&==&layers[0].thickness_mm=-0", "", ""},
	{"", "tag", strings.Repeat("x", 100)},
	{"", "version", "-9223372036854775809"},
	{"", "flow.mass_flow_kg_s", "0x1p-1074"},
}

// FuzzLineForm: reading the line form never panics, keeps what was typed, and never
// lets a number through that JSON cannot hold (NaN, ±Inf).
func FuzzLineForm(f *testing.F) {
	for _, s := range lineFormSeeds {
		f.Add(s.raw, s.key, s.value)
	}
	keep := &analysis.Input{Geometry: "pipe"}
	f.Fuzz(func(t *testing.T, raw, key, value string) {
		form, req := fuzzForm(t, lineFormValuesFor(), raw, key, value)
		for _, sys := range []units.System{units.SI, units.US} {
			for _, k := range []*analysis.Input{nil, keep} {
				st, lf := lineFormFromRequest(req, sys, k)
				if got := st.Values.Get("tag"); got != form.Get("tag") {
					t.Fatalf("tag kept as %q, typed %q", got, form.Get("tag"))
				}
				if _, err := json.Marshal(lf.Input); err != nil {
					t.Fatalf("input does not marshal (NaN or Inf got through?): %v", err)
				}
				_ = lf.validateMeta()
				if n := layerRows(st); n > maxLayerRows+minLayerRows {
					t.Fatalf("%d layer rows", n)
				}
			}
		}
	})
}

// FuzzProjectForm: reading the project form never panics, keeps what was typed, and
// gives settings that marshal.
func FuzzProjectForm(f *testing.F) {
	for _, s := range []struct{ raw, key, value string }{
		{"", "settings.indoor.ambient_temp_c", "NaN"},
		{"", "settings.outdoor.wind_m_s", "1e400"},
		{"", "units", "furlongs"},
		{"", "name", "<script>alert(1)</script>"},
		{"", "settings.economics.discount_rate", "-1/0"},
		{"settings.criteria.energy_code=%00&version=x", "", ""},
		{"", "settings.fittings.elbow_m", "3/4\""},
	} {
		f.Add(s.raw, s.key, s.value)
	}
	f.Fuzz(func(t *testing.T, raw, key, value string) {
		form, req := fuzzForm(t, testProjectForm(), raw, key, value)
		st, in := projectFormFromRequest(req)
		if got := st.Values.Get("name"); got != form.Get("name") {
			t.Fatalf("name kept as %q, typed %q", got, form.Get("name"))
		}
		if _, err := json.Marshal(in.Settings); err != nil {
			t.Fatalf("settings do not marshal: %v", err)
		}
		_ = in.validate(catalog.CodeTableByID)
	})
}
