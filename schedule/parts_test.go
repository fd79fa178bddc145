package schedule

import (
	"bytes"
	"encoding/json"
	"errors"
	"reflect"
	"testing"

	"lagwright/analysis"
	"lagwright/demo"
	"lagwright/field"
	"lagwright/units"
)

// pathText is what PostgreSQL's #>> gives for path in the JSON js: nil for null or a
// missing key, strings unquoted, anything else as its JSON text.
func pathText(t *testing.T, js []byte, path []string) []byte {
	t.Helper()
	v := json.RawMessage(js)
	for _, k := range path {
		var m map[string]json.RawMessage
		if err := json.Unmarshal(v, &m); err != nil || m == nil {
			return nil
		}
		var ok bool
		if v, ok = m[k]; !ok {
			return nil
		}
	}
	switch {
	case string(v) == "null":
		return nil
	case v[0] == '"':
		var s string
		if err := json.Unmarshal(v, &s); err != nil {
			t.Fatal(err)
		}
		return []byte(s)
	}
	return v
}

// fromParts rebuilds a line's answer the way the streamed exports read it: its stored
// JSON cut into the parts ResultPaths name, then StoredFromParts.
func fromParts(t *testing.T, l Line) Line {
	t.Helper()
	st := analysis.Stored{Output: l.Output}
	if l.Output == nil {
		_, err := analysis.Analyse(l.Input, analysis.CatalogResolver{})
		if !errors.As(err, &st.Errors) {
			t.Fatalf("%s: no output and no field errors (%v)", l.Tag, err)
		}
	}
	js := st.Marshal()
	var parts [][]byte
	for _, p := range ResultPaths() {
		parts = append(parts, pathText(t, js, p))
	}
	back, err := StoredFromParts(parts)
	if err != nil {
		t.Fatalf("%s: %v", l.Tag, err)
	}
	l.Output, l.Errors = back.Output, nil
	for _, e := range back.Errors {
		l.Errors = append(l.Errors, e.Field+": "+e.Message)
	}
	return l
}

// The rows, totals and header built from the parts equal those built from the whole
// answers, for the test project and the demo project (every geometry, errors, cold
// lines, freeze protection, heat tracing, compressed blankets, energy-code rows).
func TestStoredFromParts(t *testing.T) {
	p, lines := fixture(t, units.SI)
	dp := Project{ID: 1, Name: demo.Name, Units: units.US, Settings: demo.Settings()}
	var dlines []Line
	for i, dl := range demo.Lines() {
		eff := dp.Settings.Effective(dl.Location, dl.Input, dl.Fittings)
		l := Line{ID: int64(i + 1), Tag: dl.Tag, Service: dl.Service, Location: dl.Location, Exposure: dl.Exposure,
			Notes: dl.Notes, Input: eff, Fittings: dl.Fittings}
		out, err := analysis.Analyse(eff, analysis.CatalogResolver{})
		var fe field.Errors
		switch {
		case errors.As(err, &fe):
			for _, e := range fe {
				l.Errors = append(l.Errors, e.Field+": "+e.Message)
			}
		case err != nil:
			t.Fatalf("%s: %v", dl.Tag, err)
		default:
			l.Output = out
		}
		dlines = append(dlines, l)
	}
	for _, c := range []struct {
		name  string
		p     Project
		lines []Line
	}{{"fixture", p, lines}, {"demo", dp, dlines}} {
		slim := make([]Line, len(c.lines))
		for i, l := range c.lines {
			slim[i] = fromParts(t, l)
		}
		want := Build(c.p, c.lines, analysis.CatalogResolver{}, 0, fixedDate)
		got := Build(c.p, slim, analysis.CatalogResolver{}, 0, fixedDate)
		if !reflect.DeepEqual(got, want) {
			for i := range want.Rows {
				if !reflect.DeepEqual(got.Rows[i], want.Rows[i]) {
					t.Errorf("%s: row %s from parts:\n%+v\nwant\n%+v", c.name, want.Rows[i].Tag, got.Rows[i], want.Rows[i])
				}
			}
			t.Errorf("%s: schedule from parts differs (header cautions %q, want %q)", c.name, got.Header.Cautions, want.Header.Cautions)
		}
		var gb, wb bytes.Buffer
		if err := WriteCSV(&gb, got); err != nil {
			t.Fatal(err)
		}
		if err := WriteCSV(&wb, want); err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(gb.Bytes(), wb.Bytes()) {
			t.Errorf("%s: CSV from parts differs", c.name)
		}
	}
}

// Parts that do not read as their fields are an error (the export then recomputes the
// line), as is a list of the wrong length.
func TestStoredFromPartsErrors(t *testing.T) {
	n := len(ResultPaths())
	parts := make([][]byte, n)
	parts[outputMarker] = []byte("pipe")
	if _, err := StoredFromParts(parts); err != nil {
		t.Fatalf("minimal output: %v", err)
	}
	for _, c := range []struct {
		path []string
		v    string
	}{
		{[]string{"output", "heat_flow_w"}, `"12"`},
		{[]string{"output", "energy_code", "pass"}, `1`},
		{[]string{"output", "layers"}, `{"thickness_mm":1}`},
		{[]string{"errors"}, `"none"`},
	} {
		bad := make([][]byte, n)
		bad[outputMarker] = []byte("pipe")
		for i, p := range ResultPaths() {
			if reflect.DeepEqual(p, c.path) {
				bad[i] = []byte(c.v)
			}
		}
		if _, err := StoredFromParts(bad); err == nil {
			t.Errorf("%v = %s: no error", c.path, c.v)
		}
	}
	if _, err := StoredFromParts(parts[:n-1]); err == nil {
		t.Error("one part short: no error")
	}
}
