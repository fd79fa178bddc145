package handlers

import (
	"context"
	"encoding/json"
	"fmt"
	"net/http"
	"net/url"
	"reflect"
	"strings"
	"testing"

	"lagwright/analysis"
	"lagwright/results"
	"lagwright/store"
	"lagwright/store/storetest"
	"lagwright/units"
)

// TestProjectLineListFromSummaries: the line list built from the stored answers' cut-down
// summaries (results.List) shows exactly what the whole answers show, for every demo line
// (pipes, ducts, steam, cold lines, the two wrong on purpose), first through the hash
// and then through the saved freshness keys.
func TestProjectLineListFromSummaries(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	ctx := context.Background()
	if rec := postPage(t, h, "/projects/demo", url.Values{}, nil); rec.Code != http.StatusSeeOther {
		t.Fatalf("demo = %d", rec.Code)
	}
	list, _ := st.Projects(ctx)
	p := list[0].Project
	set, whole := freshLines(t, s, p) // computes and saves every answer
	lib, _ := st.Library(ctx)
	for pass := range 2 {
		raw, _ := st.ListLines(ctx, p.ID)
		keyed := 0
		for _, r := range raw {
			if r.ResultKey != "" {
				keyed++
			}
		}
		if want := []int{0, len(raw)}[pass]; keyed != want {
			t.Fatalf("pass %d: %d of %d lines keyed, want %d", pass, keyed, len(raw), want)
		}
		slim, _, err := s.results.List(ctx, p, set, lib)
		if err != nil || len(slim) != len(whole) {
			t.Fatalf("pass %d: %d lines, %v", pass, len(slim), err)
		}
		for _, sys := range []units.System{units.SI, units.US} {
			for i := range whole {
				a := buildListRow(p.ID, whole[i], sys, nameLookup{lib})
				b := buildListRow(p.ID, slim[i], sys, nameLookup{lib})
				if !reflect.DeepEqual(a, b) {
					t.Errorf("pass %d, %s, %s: from the summary %+v, from the whole answer %+v", pass, sys, whole[i].Line.Tag, b.view, a.view)
				}
			}
		}
	}
}

// TestProjectLineListKeys: a saved freshness key is trusted only under the same line,
// project, library and hash. The marker is a changed stored result under the same hash:
// shown while the line is fresh, gone once it is recomputed.
func TestProjectLineListKeys(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	ctx := context.Background()
	mf, err := st.Material(ctx, "mineral_fiber_pipe_c547_t1")
	if err != nil {
		t.Fatal(err)
	}
	for _, slug := range []string{"test_mf", "test_other"} {
		m := mf
		m.Slug, m.Name, m.Builtin = slug, "Test "+slug, false
		if _, err := st.CreateMaterial(ctx, m); err != nil {
			t.Fatal(err)
		}
	}
	p := createTestProject(t, st, "si")
	base := fmt.Sprintf("/projects/%d", p.ID)
	line := strings.Replace(steamLine, "mineral_fiber_pipe_c547_t1", "test_mf", 1)
	if code, m := getJSON(t, h, "POST", "/api/v1"+base+"/lines", line); code != 201 {
		t.Fatalf("create line = %d %v", code, m)
	}
	mark := func() {
		t.Helper()
		l := projectLinesOf(t, st, p.ID)[0]
		var stored analysis.Stored
		if err := json.Unmarshal(l.Result, &stored); err != nil || stored.Output == nil {
			t.Fatalf("stored result: %v", err)
		}
		stored.Output.SurfaceTempC = 123.456
		if err := st.SaveResults(ctx, []store.ResultUpdate{{LineID: l.ID, Result: stored.Marshal(), Hash: l.ResultHash}}); err != nil {
			t.Fatal(err)
		}
	}
	marked := func() bool {
		t.Helper()
		rec := do(t, h, "GET", base, nil, nil)
		if rec.Code != 200 {
			t.Fatalf("view = %d", rec.Code)
		}
		return strings.Contains(rec.Body.String(), ">123.5<")
	}
	key := func() string {
		raw, _ := st.ListLines(ctx, p.ID)
		return raw[0].ResultKey
	}
	mark()
	if !marked() || key() == "" || !marked() {
		t.Fatalf("a fresh line: the marker must show on every view and the key be saved (key %q)", key())
	}
	k0 := key()

	// Another material changes: the key no longer matches, the hash still does.
	other, _ := st.Material(ctx, "test_other")
	other.Name = "Test other, renamed"
	if _, err := st.UpdateMaterial(ctx, other); err != nil {
		t.Fatal(err)
	}
	if !marked() || key() == k0 || key() == "" {
		t.Errorf("an unrelated material edit: marker shown %v, key renewed %v", marked(), key() != k0)
	}

	// The line's own material changes: stale, recomputed.
	used, _ := st.Material(ctx, "test_mf")
	used.KPoints[0].K *= 1.2
	if _, err := st.UpdateMaterial(ctx, used); err != nil {
		t.Fatal(err)
	}
	if marked() {
		t.Errorf("after its material changed the line still shows the old stored result")
	}

	// The project's settings change (version bump): stale, recomputed.
	mark()
	if !marked() {
		t.Fatal("marker lost")
	}
	pr, _ := st.Project(ctx, p.ID)
	set, _ := results.Settings(pr)
	set.Indoor.AmbientTempC = 31
	pr.Settings, _ = json.Marshal(set)
	if _, err := st.UpdateProject(ctx, pr); err != nil {
		t.Fatal(err)
	}
	if marked() {
		t.Errorf("after the project's conditions changed the line still shows the old stored result")
	}

	// A result saved under another hash by someone else keeps the old key: not trusted.
	mark()
	if !marked() {
		t.Fatal("marker lost")
	}
	l := projectLinesOf(t, st, p.ID)[0]
	if err := st.SaveResults(ctx, []store.ResultUpdate{{LineID: l.ID, Result: l.Result, Hash: "other"}}); err != nil {
		t.Fatal(err)
	}
	if marked() {
		t.Errorf("a result under another hash was trusted through the old key")
	}
	if got := projectLinesOf(t, st, p.ID)[0]; got.ResultHash != l.ResultHash || got.Version != l.Version {
		t.Errorf("recomputed: hash %q (want %q), version %d (want %d)", got.ResultHash, l.ResultHash, got.Version, l.Version)
	}
}
