package store_test

import (
	"context"
	"encoding/json"
	"fmt"
	"testing"

	"lagwright/store"
	"lagwright/store/storetest"
)

// SaveResults stores results by batch (few) and by copy (many) alike, and never
// bumps a line's version (results are derived data).
func TestSaveResultsFewAndMany(t *testing.T) {
	st := storetest.NewDB(t)
	ctx := context.Background()
	p, err := st.CreateProject(ctx, store.Project{Name: "results", Units: "si"})
	if err != nil {
		t.Fatal(err)
	}
	var lines []store.Line
	for i := range 150 {
		lines = append(lines, store.Line{Tag: fmt.Sprintf("L-%03d", i), Input: json.RawMessage(`{"geometry":"pipe"}`)})
	}
	if _, err := st.CreateLines(ctx, p.ID, lines, nil); err != nil {
		t.Fatal(err)
	}
	saved, err := st.Lines(ctx, p.ID)
	if err != nil {
		t.Fatal(err)
	}
	for _, n := range []int{3, 150} { // under and over the bulk threshold
		var ups []store.ResultUpdate
		for i, l := range saved[:n] {
			ups = append(ups, store.ResultUpdate{LineID: l.ID, Result: json.RawMessage(fmt.Sprintf(`{"n":%d,"i":%d}`, n, i)), Hash: fmt.Sprintf("h%d-%d", n, i)})
		}
		if err := st.SaveResults(ctx, ups); err != nil {
			t.Fatalf("SaveResults(%d): %v", n, err)
		}
		after, err := st.Lines(ctx, p.ID)
		if err != nil {
			t.Fatal(err)
		}
		for i, l := range after[:n] {
			var got struct{ N, I int }
			if err := json.Unmarshal(l.Result, &got); err != nil || got.N != n || got.I != i || l.ResultHash != fmt.Sprintf("h%d-%d", n, i) {
				t.Fatalf("line %d after SaveResults(%d): result %s hash %s", i, n, l.Result, l.ResultHash)
			}
			if l.Version != saved[i].Version {
				t.Errorf("line %d: version moved %d → %d", i, saved[i].Version, l.Version)
			}
		}
	}
}
