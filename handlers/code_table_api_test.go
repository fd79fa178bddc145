package handlers

import (
	"encoding/json"
	"fmt"
	"net/http"
	"strings"
	"testing"

	"lagwright/field"
	"lagwright/store/storetest"
)

// customCodeTable is an invented table (a made-up city's amendment, labelled as such):
// the 90.1-2016 size columns, one cooling row below 60 °F asking 1-1/2 in in every column
// with k 0.20–0.30 at 75 °F, and it covers domestic cold water.
const customCodeTable = `{"id":"example-city-2024","name":"Example City pipe insulation (invented for tests)","edition":"2024",
	"jurisdiction":"invented","kind":"pipe","systems":["domestic_cold_water","chilled_water"],
	"columns":[{"label":"<1","min_nominal_in":0,"max_nominal_in":1},{"label":"1 to <1-1/2","min_nominal_in":1,"max_nominal_in":1.5},
	  {"label":"1-1/2 to <4","min_nominal_in":1.5,"max_nominal_in":4},{"label":"4 to <8","min_nominal_in":4,"max_nominal_in":8},
	  {"label":"≥8","min_nominal_in":8,"max_nominal_in":null}],
	"rows":[{"service":"cooling","label":"<60","min_f":null,"max_f":60,"k_min":0.20,"k_max":0.30,"mean_rating_f":75,
	  "thickness_in":[1.5,1.5,1.5,1.5,1.5]}],
	"ref_end":"upper","footnotes":[{"name":"runouts","text":"runouts up to 12 ft: 1/2 in less"}],"source":"invented for tests"}`

// A custom table end to end: created through the API, listed beside the built-in one,
// used by POST /api/v1/calc and by a project line, edited with its version, refused
// deletion while a line names it, deleted once none does.
func TestCodeTableAPIEndToEnd(t *testing.T) {
	s, _ := newServer(t, storetest.NewDB(t))
	h := s.Routes()
	jsonHdr := map[string]string{"Content-Type": "application/json"}
	send := func(method, target, body string) (int, map[string]any) {
		t.Helper()
		rec := do(t, h, method, target, strings.NewReader(body), jsonHdr)
		var m map[string]any
		if rec.Body.Len() > 0 && rec.Body.Bytes()[0] == '{' {
			if err := json.Unmarshal(rec.Body.Bytes(), &m); err != nil {
				t.Fatalf("%s %s: %v: %s", method, target, err, rec.Body.String())
			}
		}
		return rec.Code, m
	}
	if code, m := send("POST", "/api/v1/code-tables", customCodeTable); code != http.StatusCreated || m["version"] != 1.0 || m["builtin"] != false {
		t.Fatalf("create: %d %v", code, m)
	}
	if code, _ := send("POST", "/api/v1/code-tables", customCodeTable); code != http.StatusConflict {
		t.Errorf("second create with the same id: %d, want 409", code)
	}

	rec := do(t, h, "GET", "/api/v1/code-tables", nil, nil)
	var list []map[string]any
	if err := json.Unmarshal(rec.Body.Bytes(), &list); err != nil || rec.Code != 200 {
		t.Fatalf("list: %d %v", rec.Code, err)
	}
	seen := map[string]map[string]any{}
	for _, e := range list {
		seen[e["id"].(string)] = e
	}
	if b := seen["ashrae-90.1-2016"]; b == nil || b["builtin"] != true || b["kind"] != "pipe" || b["edition"] != "90.1-2016" {
		t.Errorf("built-in table listed as %v", b)
	}
	if c := seen["example-city-2024"]; c == nil || c["builtin"] != false || fmt.Sprint(c["systems"]) != "[domestic_cold_water chilled_water]" {
		t.Errorf("custom table listed as %v", c)
	}

	// 10 °C = 50 °F, NPS 2 (1-1/2 to <4 column): 1.5 in = 38.1 mm; k 0.036 W/m·K = 0.2496
	// Btu·in/h·ft²·°F lies inside 0.20–0.30, so no correction (ASHRAE 90.1 footnote
	// procedure: only k outside the row's range is corrected).
	line := `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":10,"ambient_temp_c":24,"system":"domestic_cold_water",
		"layers":[{"k_w_mk":0.036,"thickness_mm":25}],"jacket":"pvc_jacket",
		"criteria":{"energy_code":"example-city-2024","condensation":false}}`
	code, calc := send("POST", "/api/v1/calc", line)
	if code != 200 {
		t.Fatalf("calc: %d %v", code, calc)
	}
	ec := calc["energy_code"].(map[string]any)
	if ec["table"] != "Example City pipe insulation (invented for tests)" || ec["edition"] != "2024" || ec["applies"] != true ||
		ec["table_thickness_mm"] != 38.1 || ec["corrected_mm"] != 38.1 || ec["pass"] != false {
		t.Errorf("calc energy_code = %v", ec)
	}
	if strings.Contains(fmt.Sprint(ec), "example-city-2024") {
		t.Errorf("the answer names the table by its id: %v", ec)
	}

	_, proj := send("POST", "/api/v1/projects", `{"name":"Code table project (invented)"}`)
	pid := int64(proj["id"].(float64))
	code, ln := send("POST", fmt.Sprintf("/api/v1/projects/%d/lines", pid), strings.Replace(line, `{"geometry"`, `{"tag":"CW-1","geometry"`, 1))
	if code != http.StatusCreated {
		t.Fatalf("line: %d %v", code, ln)
	}
	lec := ln["result"].(map[string]any)["energy_code"].(map[string]any)
	if lec["table_thickness_mm"] != 38.1 || lec["applies"] != true || lec["pass"] != false {
		t.Errorf("line energy_code = %v", lec)
	}

	if code, m := send("DELETE", "/api/v1/code-tables/example-city-2024", ""); code != http.StatusConflict || !strings.Contains(fmt.Sprint(m), "CW-1") {
		t.Errorf("delete while used: %d %v", code, m)
	}
	if code, _ := send("DELETE", "/api/v1/code-tables/ashrae-90.1-2016", ""); code != http.StatusConflict {
		t.Errorf("delete built-in: %d, want 409", code)
	}

	// Edit: the row now asks 1 in; the stored line's answer goes stale and follows it.
	edited := strings.Replace(customCodeTable, `[1.5,1.5,1.5,1.5,1.5]`, `[1,1,1,1,1]`, 1)
	edited = strings.Replace(edited, `"source":"invented for tests"`, `"source":"invented for tests","version":1`, 1)
	if code, m := send("PUT", "/api/v1/code-tables/example-city-2024", edited); code != 200 || m["version"] != 2.0 {
		t.Fatalf("put: %d %v", code, m)
	}
	if code, _ := send("PUT", "/api/v1/code-tables/example-city-2024", edited); code != http.StatusConflict {
		t.Errorf("put at a stale version: %d, want 409", code)
	}
	_, ln = send("GET", fmt.Sprintf("/api/v1/projects/%d/lines/%d", pid, int64(ln["id"].(float64))), "")
	if lec := ln["result"].(map[string]any)["energy_code"].(map[string]any); lec["table_thickness_mm"] != 25.4 || lec["pass"] != false {
		t.Errorf("after the edit the line's energy_code = %v, want 25.4 mm (25 mm short of it)", lec)
	}

	if code, _ := send("DELETE", fmt.Sprintf("/api/v1/projects/%d/lines/%d", pid, int64(ln["id"].(float64))), ""); code != http.StatusNoContent {
		t.Fatalf("delete line: %d", code)
	}
	if code, _ := send("DELETE", "/api/v1/code-tables/example-city-2024", ""); code != http.StatusNoContent {
		t.Errorf("delete unused: %d", code)
	}
}

// Validation names every bad cell.
func TestCodeTableAPIValidation(t *testing.T) {
	s, _ := newServer(t, storetest.NewDB(t))
	bad := strings.NewReplacer(`"systems":["domestic_cold_water","chilled_water"]`, `"systems":["domestic_cold_water","steam"]`,
		`"thickness_in":[1.5,1.5,1.5,1.5,1.5]`, `"thickness_in":[1.5,1.5,-1,1.5,99]`,
		`"k_min":0.20,"k_max":0.30`, `"k_min":0.30,"k_max":0.20`,
		`{"label":"4 to <8","min_nominal_in":4,"max_nominal_in":8}`, `{"label":"","min_nominal_in":4,"max_nominal_in":3}`,
	).Replace(customCodeTable)
	rec := do(t, s.Routes(), "POST", "/api/v1/code-tables", strings.NewReader(bad), map[string]string{"Content-Type": "application/json"})
	if rec.Code != http.StatusUnprocessableEntity {
		t.Fatalf("status %d: %s", rec.Code, rec.Body.String())
	}
	var doc struct {
		Errors []field.Error `json:"errors"`
	}
	if err := json.Unmarshal(rec.Body.Bytes(), &doc); err != nil {
		t.Fatal(err)
	}
	got := map[string]bool{}
	for _, e := range doc.Errors {
		got[e.Field] = true
	}
	for _, f := range []string{"systems[1]", "rows[0].thickness_in[2]", "rows[0].thickness_in[4]", "rows[0].k_max",
		"columns[3].label", "columns[3].max_nominal_in"} {
		if !got[f] {
			t.Errorf("no error for %s in %v", f, doc.Errors)
		}
	}
}
