package store_test

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"reflect"
	"testing"

	"lagwright/store"
	"lagwright/store/storetest"
)

// EachScheduleLines reads the lines in their order, in batches, with the named parts
// of each stored result as #>> writes them (nil for null, missing, or no result).
func TestEachScheduleLines(t *testing.T) {
	st := storetest.NewDB(t)
	ctx := context.Background()
	p, err := st.CreateProject(ctx, store.Project{Name: "Streamed lines", Units: "si"})
	if err != nil {
		t.Fatal(err)
	}
	results := []string{
		`{"output":{"geometry":"pipe","heat_flow_w":12.5,"sizing":{"governing":"personnel_protection","unmet":["freeze"]},"energy_code":null}}`,
		`{"errors":[{"field":"length_m","message":"must be positive"}]}`,
		``, // no result stored
	}
	var lines []store.Line
	for i, r := range results {
		lines = append(lines, store.Line{Tag: fmt.Sprintf("L-%d", i), Input: json.RawMessage(`{"geometry":"pipe"}`),
			Result: json.RawMessage(r), ResultHash: fmt.Sprintf("h%d", i)})
	}
	if _, err := st.CreateLines(ctx, p.ID, lines, make(store.LineMaterials, len(lines))); err != nil {
		t.Fatal(err)
	}
	paths := [][]string{{"output", "geometry"}, {"output", "heat_flow_w"}, {"output", "sizing", "governing"},
		{"output", "sizing", "unmet"}, {"output", "energy_code", "pass"}, {"errors"}}
	var sizes []int
	var got []store.StreamedLine
	err = st.EachScheduleLines(ctx, p.ID, paths, 2, func(b []store.StreamedLine) error {
		sizes = append(sizes, len(b))
		got = append(got, b...)
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(sizes, []int{2, 1}) {
		t.Errorf("batches %v, want [2 1]", sizes)
	}
	str := func(parts [][]byte) []string {
		out := make([]string, len(parts))
		for i, v := range parts {
			if v == nil {
				out[i] = "<nil>"
			} else {
				out[i] = string(v)
			}
		}
		return out
	}
	want := [][]string{
		{"pipe", "12.5", "personnel_protection", `["freeze"]`, "<nil>", "<nil>"},
		{"<nil>", "<nil>", "<nil>", "<nil>", "<nil>", `[{"field": "length_m", "message": "must be positive"}]`},
		{"<nil>", "<nil>", "<nil>", "<nil>", "<nil>", "<nil>"},
	}
	if len(got) != len(want) {
		t.Fatalf("%d lines, want %d", len(got), len(want))
	}
	for i, l := range got {
		if l.Tag != lines[i].Tag || l.ResultHash != lines[i].ResultHash || l.HasResult != (results[i] != "") || string(l.Input) != `{"geometry": "pipe"}` {
			t.Errorf("line %d: %s %s result %v input %s", i, l.Tag, l.ResultHash, l.HasResult, l.Input)
		}
		if g := str(l.ResultParts); !reflect.DeepEqual(g, want[i]) {
			t.Errorf("line %s parts %q, want %q", l.Tag, g, want[i])
		}
	}
	stop := errors.New("stop")
	if err := st.EachScheduleLines(ctx, p.ID, paths, 1, func([]store.StreamedLine) error { return stop }); !errors.Is(err, stop) {
		t.Errorf("fn's error: got %v", err)
	}
}
