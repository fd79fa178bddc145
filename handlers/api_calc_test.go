package handlers

import (
	"encoding/json"
	"net/http"
	"strings"
	"testing"

	"lagwright/analysis"
	"lagwright/field"
	"lagwright/store/storetest"
)

// POST /api/v1/calc gives the same JSON as the command's engine with the catalog
// resolver (built-in slugs resolve the same from the database), and 422 with every
// bad field named.
func TestAPICalc(t *testing.T) {
	s, _ := newServer(t, storetest.NewDB(t))
	h := s.Routes()
	in := `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":6,"ambient_temp_c":24,"relative_humidity_pct":60,
		"layers":[{"material":"elastomeric_c534_gr1","thickness_mm":25.4}],"jacket":"pvc_jacket","criteria":{"energy_code":"ashrae-90.1-2016"}}`
	rec := do(t, h, http.MethodPost, "/api/v1/calc", strings.NewReader(in), map[string]string{"Content-Type": "application/json"})
	if rec.Code != http.StatusOK {
		t.Fatalf("status %d: %s", rec.Code, rec.Body.String())
	}
	want, err := analysis.Run([]byte(in), analysis.CatalogResolver{})
	if err != nil {
		t.Fatal(err)
	}
	wantJSON, _ := json.MarshalIndent(want, "", "  ")
	if got := strings.TrimSpace(rec.Body.String()); got != string(wantJSON) {
		t.Errorf("API and catalog answers differ:\n%s\n---\n%s", got, wantJSON)
	}

	rec = do(t, h, http.MethodPost, "/api/v1/calc", strings.NewReader(`{"geometry":"pipe","operating_temp_c":"x","layers":[{"thickness_mm":0}]}`),
		map[string]string{"Content-Type": "application/json"})
	if rec.Code != http.StatusUnprocessableEntity {
		t.Fatalf("bad input: status %d", rec.Code)
	}
	var doc struct {
		Errors []field.Error `json:"errors"`
	}
	if err := json.Unmarshal(rec.Body.Bytes(), &doc); err != nil {
		t.Fatal(err)
	}
	fields := map[string]bool{}
	for _, e := range doc.Errors {
		fields[e.Field] = true
	}
	for _, f := range []string{"operating_temp_c", "ambient_temp_c", "pipe_size", "layers[0].thickness_mm", "layers[0].material"} {
		if !fields[f] {
			t.Errorf("no error for %s in %+v", f, doc.Errors)
		}
	}
}
