package store_test

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"sync"
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

// TestImportBesideOtherWrites: imports run while single lines are added, and two
// imports at once, all succeed with distinct ids and distinct positions; an import
// whose tags were taken meanwhile names them (not a wrong "duplicate id" cause).
func TestImportBesideOtherWrites(t *testing.T) {
	st := storetest.NewDB(t)
	ctx := context.Background()
	p, err := st.CreateProject(ctx, store.Project{Name: "busy", Units: "si"})
	if err != nil {
		t.Fatal(err)
	}
	batch := func(prefix string, n int) []store.Line {
		var ls []store.Line
		for i := range n {
			ls = append(ls, store.Line{Tag: fmt.Sprintf("%s-%04d", prefix, i), Input: json.RawMessage(`{"geometry":"pipe"}`)})
		}
		return ls
	}
	errs := make(chan error, 100)
	var wg sync.WaitGroup
	for _, prefix := range []string{"IMP-A", "IMP-B", "IMP-C"} {
		wg.Go(func() {
			_, err := st.CreateLines(ctx, p.ID, batch(prefix, 500), nil)
			errs <- err
		})
	}
	for w := range 4 {
		wg.Go(func() {
			for i := range 15 {
				_, err := st.CreateLine(ctx, store.Line{ProjectID: p.ID, Tag: fmt.Sprintf("ONE-%d-%d", w, i), Input: json.RawMessage(`{"geometry":"pipe"}`)}, nil)
				errs <- err
			}
		})
	}
	wg.Wait()
	close(errs)
	for err := range errs {
		if err != nil {
			t.Errorf("write beside an import: %v", err)
		}
	}
	lines, err := st.Lines(ctx, p.ID)
	if err != nil {
		t.Fatal(err)
	}
	if len(lines) != 3*500+4*15 {
		t.Errorf("%d lines saved, want %d", len(lines), 3*500+4*15)
	}
	seen := map[int]string{}
	for _, l := range lines {
		if other, ok := seen[l.Position]; ok {
			t.Fatalf("position %d shared by %s and %s", l.Position, other, l.Tag)
		}
		seen[l.Position] = l.Tag
	}

	_, err = st.CreateLines(ctx, p.ID, append(batch("NEW", 3), store.Line{Tag: "IMP-B-0007"}), nil)
	var dup *store.DuplicateTagsError
	if !errors.As(err, &dup) || !errors.Is(err, store.ErrDuplicateTag) || len(dup.Tags) != 1 || dup.Tags[0] != "IMP-B-0007" {
		t.Errorf("import with a taken tag: %v; want DuplicateTagsError naming IMP-B-0007", err)
	}
}
