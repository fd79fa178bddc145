package handlers

import (
	"context"
	"fmt"
	"net/http"
	"net/url"
	"sync/atomic"
	"testing"

	"lagwright/analysis"
	"lagwright/results"
	"lagwright/store"
	"lagwright/store/storetest"
)

// TestViewsDoNotRecomputeFreshLines: once every line's answer is stored and fresh, no
// page, export or API read calls the engine; a line made stale is recomputed once.
func TestViewsDoNotRecomputeFreshLines(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	ctx := context.Background()
	if rec := postPage(t, h, "/projects/demo", url.Values{}, nil); rec.Code != http.StatusSeeOther {
		t.Fatalf("demo = %d", rec.Code)
	}
	list, _ := st.Projects(ctx)
	p := list[0].Project
	freshLines(t, s, p) // every answer fresh from here on
	lines, err := st.Lines(ctx, p.ID)
	if err != nil || len(lines) == 0 {
		t.Fatalf("%d lines, %v", len(lines), err)
	}

	var calls atomic.Int64
	counting := s.results
	s.results = counting.WithEngine(func(in []analysis.Input, lib analysis.Resolver) ([]analysis.Stored, error) {
		calls.Add(int64(len(in)))
		return analysis.AnalyseMany(in, lib)
	})
	base := fmt.Sprintf("/projects/%d", p.ID)
	views := []string{base, base + "?sort=-heat", base + "/schedule", base + "/schedule.csv", base + "/schedule.xlsx",
		base + "/schedule.pdf", base + "/economics", "/api/v1" + base + "/lines"}
	for _, l := range lines {
		lb := fmt.Sprintf("%s/lines/%d", base, l.ID)
		views = append(views, lb, lb+"/sheet", lb+"/compare", "/api/v1"+lb)
	}
	for _, v := range views {
		before := calls.Load()
		rec := do(t, h, "GET", v, nil, nil)
		if rec.Code != http.StatusOK {
			t.Errorf("GET %s = %d", v, rec.Code)
		}
		if n := calls.Load() - before; n != 0 {
			t.Errorf("GET %s analysed %d lines whose stored answers are fresh", v, n)
		}
	}

	// The check can fail: a line whose stored hash no longer matches is recomputed, once.
	stale := lines[0]
	if err := st.SaveResults(ctx, []store.ResultUpdate{{LineID: stale.ID, Result: stale.Result, Hash: "stale"}}); err != nil {
		t.Fatal(err)
	}
	lb := fmt.Sprintf("%s/lines/%d", base, stale.ID)
	for i, want := range []int64{1, 0} {
		before := calls.Load()
		if rec := do(t, h, "GET", lb, nil, nil); rec.Code != http.StatusOK {
			t.Fatalf("GET %s = %d", lb, rec.Code)
		}
		if n := calls.Load() - before; n != want {
			t.Errorf("view %d of the stale line analysed %d lines, want %d", i+1, n, want)
		}
	}
}

// freshLines reads a project's lines with fresh answers, as the pages do.
func freshLines(t *testing.T, s *Server, p store.Project) (analysis.ProjectSettings, []results.Line) {
	t.Helper()
	ctx := context.Background()
	set, err := results.Settings(p)
	if err != nil {
		t.Fatal(err)
	}
	lib, err := s.store.Library(ctx)
	if err != nil {
		t.Fatal(err)
	}
	lines, err := s.results.Project(ctx, p, set, lib)
	if err != nil {
		t.Fatal(err)
	}
	return set, lines
}
