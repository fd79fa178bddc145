package handlers

import (
	"context"
	"encoding/json"
	"net/http"
	"reflect"
	"slices"
	"strings"
	"testing"

	"lagwright/catalog"
	"lagwright/field"
	"lagwright/store"
	"lagwright/store/storetest"
)

const siteFoamJSON = `{"slug":"site_foam","name":"Site foam","category":"custom foam","spec":"maker data sheet",
	"k_points":[[0,0.030],[24,0.032],[50,0.035]],"min_temp_c":-40,"max_temp_c":120,
	"thicknesses_mm":[20,30,40],"max_layer_mm":40,"source":"invented data sheet for tests"}`

func jsonHeader() map[string]string { return map[string]string{"Content-Type": "application/json"} }

// errorFields reads the fields of an API error answer.
func errorFields(t *testing.T, body []byte) []string {
	t.Helper()
	var doc struct {
		Errors []field.Error `json:"errors"`
	}
	if err := json.Unmarshal(body, &doc); err != nil {
		t.Fatalf("error body %s: %v", body, err)
	}
	var out []string
	for _, e := range doc.Errors {
		out = append(out, e.Field)
	}
	return out
}

func TestMaterialAPI(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()

	// The list: every built-in with every documented key, in SI.
	rec := do(t, h, http.MethodGet, "/api/v1/materials", nil, nil)
	if rec.Code != http.StatusOK {
		t.Fatalf("list: %d", rec.Code)
	}
	var list []map[string]any
	if err := json.Unmarshal(rec.Body.Bytes(), &list); err != nil {
		t.Fatal(err)
	}
	if len(list) != len(catalog.Materials()) {
		t.Errorf("list has %d, want %d", len(list), len(catalog.Materials()))
	}
	for _, key := range []string{"slug", "name", "category", "spec", "k_points", "min_temp_c", "max_temp_c",
		"thicknesses_mm", "max_layer_mm", "compressible", "source", "builtin", "version"} {
		if _, ok := list[0][key]; !ok {
			t.Errorf("list item lacks %q", key)
		}
	}
	rec = do(t, h, http.MethodGet, "/api/v1/materials/elastomeric_c534_gr1", nil, nil)
	var one materialJSON
	if err := json.Unmarshal(rec.Body.Bytes(), &one); err != nil || rec.Code != 200 {
		t.Fatalf("get: %d %v", rec.Code, err)
	}
	c, _ := catalog.MaterialBySlug("elastomeric_c534_gr1")
	if one.KPoints[1] != [2]float64{c.KPoints[1].MeanC, c.KPoints[1].K} || !one.Builtin || one.Version != 1 || one.MaxTempC != c.MaxC {
		t.Errorf("get = %+v", one)
	}

	usedBy := func() {
		p, err := st.CreateProject(context.Background(), store.Project{Name: "Plant room", Units: "si"})
		if err == nil {
			_, err = st.CreateLine(context.Background(), store.Line{ProjectID: p.ID, Tag: "CHW-7",
				Input: json.RawMessage(`{"layers":[{"material":"site_foam","thickness_mm":20}],"jacket":"site_jacket"}`)},
				[]string{"site_foam"})
		}
		if err != nil {
			t.Fatal(err)
		}
	}

	for _, tc := range []struct {
		name, method, path, body string
		before                   func()
		status                   int
		fields                   []string // of an error answer; nil: not checked
		contains                 string
	}{
		{name: "unknown", method: "GET", path: "/api/v1/materials/nope", status: 404},
		{name: "create", method: "POST", path: "/api/v1/materials", body: siteFoamJSON, status: 201, contains: `"version": 1`},
		{name: "create again", method: "POST", path: "/api/v1/materials", body: siteFoamJSON, status: 409, fields: []string{"slug"}},
		{name: "create with a built-in slug", method: "POST", path: "/api/v1/materials",
			body: strings.Replace(siteFoamJSON, "site_foam", "polyiso_c591", 1), status: 409, fields: []string{"slug"}},
		{name: "create with bad k points", method: "POST", path: "/api/v1/materials",
			body:   strings.Replace(strings.Replace(siteFoamJSON, `"site_foam"`, `"other_foam"`, 1), "[50,0.035]", "[10,0.035]", 1),
			status: 422, fields: []string{"k_points[2]"}},
		{name: "create with a three-number point", method: "POST", path: "/api/v1/materials",
			body:   strings.Replace(strings.Replace(siteFoamJSON, `"site_foam"`, `"other_foam"`, 1), "[50,0.035]", "[50,0.035,1]", 1),
			status: 422, fields: []string{"k_points[2]"}},
		{name: "create with an unknown key", method: "POST", path: "/api/v1/materials",
			body: `{"slug":"x1","colour":"red"}`, status: 422, fields: []string{"colour"}},
		{name: "create with a wrong type", method: "POST", path: "/api/v1/materials",
			body: `{"slug":"x1","min_temp_c":"cold"}`, status: 422, fields: []string{"min_temp_c"}},
		{name: "create not JSON", method: "POST", path: "/api/v1/materials", body: `{"slug":`, status: 422, fields: []string{""}},
		{name: "create with nothing", method: "POST", path: "/api/v1/materials", body: `{"slug":"empty_one"}`, status: 422,
			fields: []string{"name", "category", "source", "k_points", "max_temp_c", "thicknesses_mm", "max_layer_mm"}},
		{name: "patch without version", method: "PATCH", path: "/api/v1/materials/site_foam", body: `{"name":"x"}`,
			status: 422, fields: []string{"version"}},
		{name: "patch", method: "PATCH", path: "/api/v1/materials/site_foam",
			body: `{"version":1,"k_points":[[0,0.031],[50,0.036]]}`, status: 200, contains: `"version": 2`},
		{name: "patch stale", method: "PATCH", path: "/api/v1/materials/site_foam", body: `{"version":1,"name":"x"}`, status: 409},
		{name: "patch bad", method: "PATCH", path: "/api/v1/materials/site_foam", body: `{"version":2,"min_temp_c":500}`,
			status: 422, fields: []string{"max_temp_c"}},
		{name: "patch a built-in", method: "PATCH", path: "/api/v1/materials/polyiso_c591", body: `{"version":1,"name":"x"}`, status: 409},
		{name: "patch unknown", method: "PATCH", path: "/api/v1/materials/nope", body: `{"version":1}`, status: 404},
		{name: "delete a built-in", method: "DELETE", path: "/api/v1/materials/polyiso_c591", status: 409, contains: "read-only"},
		{name: "delete in use", method: "DELETE", path: "/api/v1/materials/site_foam", before: usedBy, status: 409, contains: "CHW-7 (Plant room)"},
		{name: "create another", method: "POST", path: "/api/v1/materials",
			body: strings.Replace(siteFoamJSON, `"site_foam"`, `"spare_foam"`, 1), status: 201},
		{name: "delete unused", method: "DELETE", path: "/api/v1/materials/spare_foam", status: 204},
		{name: "deleted is gone", method: "GET", path: "/api/v1/materials/spare_foam", status: 404},
		{name: "delete unknown", method: "DELETE", path: "/api/v1/materials/spare_foam", status: 404},

		{name: "jackets", method: "GET", path: "/api/v1/jackets", status: 200, contains: `"slug": "all_service_jacket"`},
		{name: "jacket", method: "GET", path: "/api/v1/jackets/fsk", status: 200, contains: `"permeance_perm": 0.02`},
		{name: "jacket unknown", method: "GET", path: "/api/v1/jackets/nope", status: 404},
		{name: "jacket create", method: "POST", path: "/api/v1/jackets",
			body: `{"slug":"site_jacket","name":"Site jacket","emittance":0.85,"vapour_retarder":true,"source":"test"}`, status: 201},
		{name: "jacket duplicate", method: "POST", path: "/api/v1/jackets",
			body: `{"slug":"site_jacket","name":"Site jacket","emittance":0.85,"source":"test"}`, status: 409, fields: []string{"slug"}},
		{name: "jacket built-in slug", method: "POST", path: "/api/v1/jackets",
			body: `{"slug":"canvas","name":"Mine","emittance":0.85,"source":"test"}`, status: 409, fields: []string{"slug"}},
		{name: "jacket bad emittance", method: "POST", path: "/api/v1/jackets",
			body: `{"slug":"bad_jacket","name":"Bad","emittance":1.5,"source":"test"}`, status: 422, fields: []string{"emittance"}},
		{name: "jacket patch", method: "PATCH", path: "/api/v1/jackets/site_jacket", body: `{"version":1,"emittance":0.8}`,
			status: 200, contains: `"version": 2`},
		{name: "jacket patch stale", method: "PATCH", path: "/api/v1/jackets/site_jacket", body: `{"version":1,"emittance":0.7}`, status: 409},
		{name: "jacket patch built-in", method: "PATCH", path: "/api/v1/jackets/canvas", body: `{"version":1,"emittance":0.7}`, status: 409},
		{name: "jacket delete built-in", method: "DELETE", path: "/api/v1/jackets/canvas", status: 409},
		{name: "jacket delete in use", method: "DELETE", path: "/api/v1/jackets/site_jacket", status: 409, contains: "CHW-7"},
		{name: "pipe materials", method: "GET", path: "/api/v1/pipe-materials", status: 200, contains: `"slug": "carbon_steel"`},
	} {
		t.Run(tc.name, func(t *testing.T) {
			if tc.before != nil {
				tc.before()
			}
			rec := do(t, h, tc.method, tc.path, strings.NewReader(tc.body), jsonHeader())
			if rec.Code != tc.status {
				t.Fatalf("%s %s = %d, want %d: %s", tc.method, tc.path, rec.Code, tc.status, rec.Body)
			}
			if tc.fields != nil {
				if got := errorFields(t, rec.Body.Bytes()); !slices.Equal(got, tc.fields) {
					t.Errorf("fields %v, want %v (%s)", got, tc.fields, rec.Body)
				}
			}
			if !strings.Contains(rec.Body.String(), tc.contains) {
				t.Errorf("answer lacks %q: %s", tc.contains, rec.Body)
			}
			if tc.status == 201 && !strings.HasPrefix(rec.Header().Get("Location"), "/api/v1/") {
				t.Errorf("Location = %q", rec.Header().Get("Location"))
			}
		})
	}

	// The patch reached the database and the analysis' library.
	m, err := st.Material(context.Background(), "site_foam")
	if err != nil {
		t.Fatal(err)
	}
	if want := []catalog.KPoint{{MeanC: 0, K: 0.031}, {MeanC: 50, K: 0.036}}; m.Version != 2 || !reflect.DeepEqual(m.KPoints, want) {
		t.Errorf("after patch: version %d points %v", m.Version, m.KPoints)
	}
}
