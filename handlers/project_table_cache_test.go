package handlers

import (
	"context"
	"encoding/json"
	"fmt"
	"net/http"
	"net/url"
	"strings"
	"sync"
	"sync/atomic"
	"testing"
	"time"

	"lagwright/analysis"
	"lagwright/results"
	"lagwright/store"
	"lagwright/store/storetest"
)

// TestProjectTableCache: the project page's line-list table is served from memory once
// a view of fresh lines has rendered it, byte for byte what a server without the cache
// renders; every change to what the table shows (a line edited, a result saved even
// under the same hash, the project's settings or units, a used material's properties
// or name, a line added or deleted) gives a new page, again identical to an uncached
// render. Expected pages are the app's own uncached output (no external reference).
func TestProjectTableCache(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	ctx := context.Background()
	mf, err := st.Material(ctx, "mineral_fiber_pipe_c547_t1")
	if err != nil {
		t.Fatal(err)
	}
	mf.Slug, mf.Name, mf.Builtin = "test_mf", "Test fibre", false
	if _, err := st.CreateMaterial(ctx, mf); err != nil {
		t.Fatal(err)
	}
	p := createTestProject(t, st, "si")
	base := fmt.Sprintf("/projects/%d", p.ID)
	line := strings.Replace(steamLine, "mineral_fiber_pipe_c547_t1", "test_mf", 1)
	for i, tag := range []string{"STM-1", "STM-2"} {
		body := strings.Replace(line, `"STM-1"`, `"`+tag+`"`, 1)
		body = strings.Replace(body, `"length_m": 30`, fmt.Sprintf(`"length_m": %d`, 30+10*i), 1)
		if code, m := getJSON(t, h, "POST", "/api/v1"+base+"/lines", body); code != 201 {
			t.Fatalf("create line = %d %v", code, m)
		}
	}
	view := func(h http.Handler, target string) string {
		t.Helper()
		rec := do(t, h, "GET", target, nil, nil)
		if rec.Code != 200 {
			t.Fatalf("GET %s = %d", target, rec.Code)
		}
		return rec.Body.String()
	}
	// settle views the page until it is cached, checks the cached page against an
	// uncached render, and returns it.
	settle := func(step, target string) string {
		t.Helper()
		var pages []string
		for range 3 {
			pages = append(pages, view(h, target))
		}
		if pages[1] != pages[2] {
			t.Fatalf("%s: two views of unchanged lines differ", step)
		}
		fp, err := st.ListFingerprint(ctx, p.ID)
		if err != nil {
			t.Fatal(err)
		}
		pr, _ := st.Project(ctx, p.ID)
		u, _ := url.Parse(target)
		e, ok := s.tables().get(newTableKey(p.ID, pr.Version, pr.Units, u.Query().Get("sort"), fp))
		if !ok {
			t.Fatalf("%s: the table was not cached after views of fresh lines", step)
		}
		if !strings.Contains(pages[2], string(e.html)) || len(e.html) < 1000 {
			t.Errorf("%s: the page does not carry the cached table", step)
		}
		other, _ := newServer(t, st) // its own, empty cache
		if got := view(other.Routes(), target); got != pages[2] {
			t.Errorf("%s: the cached page differs from an uncached render", step)
		}
		return pages[2]
	}
	changed := func(step, before string) string {
		t.Helper()
		after := settle(step, base)
		if after == before {
			t.Errorf("%s: the page did not change", step)
		}
		return after
	}

	page := settle("first views", base)
	if !strings.Contains(page, "Test fibre") {
		t.Fatal("the page does not show the line's material")
	}
	if sorted := settle("sorted", base+"?sort=-length"); sorted == page {
		t.Errorf("sorting by length descending gave the same page")
	}

	// A line edited (its service): the version changes.
	l := projectLinesOf(t, st, p.ID)[0]
	l.Service = "LP steam, east header"
	if _, err := st.UpdateLine(ctx, l, []string{"test_mf"}); err != nil {
		t.Fatal(err)
	}
	page = changed("line edited", page)
	if !strings.Contains(page, "LP steam, east header") {
		t.Errorf("line edited: the new service is not shown")
	}

	// A result saved under the same hash (version and hash unchanged): the marker shows.
	l = projectLinesOf(t, st, p.ID)[0]
	var stored analysis.Stored
	if err := json.Unmarshal(l.Result, &stored); err != nil || stored.Output == nil {
		t.Fatalf("stored result: %v", err)
	}
	stored.Output.SurfaceTempC = 123.456
	if err := st.SaveResults(ctx, []store.ResultUpdate{{LineID: l.ID, Result: stored.Marshal(), Hash: l.ResultHash}}); err != nil {
		t.Fatal(err)
	}
	page = changed("result saved", page)
	if !strings.Contains(page, ">123.5<") {
		t.Errorf("result saved: the saved result is not shown")
	}

	// The project's settings change: recomputed, the marker is gone.
	pr, _ := st.Project(ctx, p.ID)
	set, _ := results.Settings(pr)
	set.Indoor.AmbientTempC = 31
	pr.Settings, _ = json.Marshal(set)
	if pr, err = st.UpdateProject(ctx, pr); err != nil {
		t.Fatal(err)
	}
	page = changed("settings changed", page)
	if strings.Contains(page, ">123.5<") {
		t.Errorf("settings changed: the old result is still shown")
	}

	// The project's units change.
	pr.Units = "us"
	if pr, err = st.UpdateProject(ctx, pr); err != nil {
		t.Fatal(err)
	}
	page = changed("units changed", page)

	// The used material's conductivity, then its name.
	m, _ := st.Material(ctx, "test_mf")
	for i := range m.KPoints {
		m.KPoints[i].K *= 1.2
	}
	if m, err = st.UpdateMaterial(ctx, m); err != nil {
		t.Fatal(err)
	}
	page = changed("material k changed", page)
	m.Name = "Test fibre, renamed"
	if _, err = st.UpdateMaterial(ctx, m); err != nil {
		t.Fatal(err)
	}
	page = changed("material renamed", page)
	if !strings.Contains(page, "Test fibre, renamed") {
		t.Errorf("material renamed: the new name is not shown")
	}

	// A line deleted.
	if err := st.DeleteLine(ctx, p.ID, projectLinesOf(t, st, p.ID)[1].ID); err != nil {
		t.Fatal(err)
	}
	page = changed("line deleted", page)
	if strings.Contains(page, "STM-2") {
		t.Errorf("line deleted: still listed")
	}
}

// TestTableCacheBound: the cache keeps at most its size in bytes of HTML, dropping
// the least recently used entry first, and refuses a table too large for it.
func TestTableCacheBound(t *testing.T) {
	c := newTableCache(4000)
	k := func(i int) tableKey { return newTableKey(int64(i), 1, "si", "", "fp") }
	html := make([]byte, 1000)
	for i := 1; i <= 4; i++ {
		c.put(&tableEntry{key: k(i), html: html})
	}
	if _, ok := c.get(k(1)); !ok { // 1 is now the most recent
		t.Fatal("entry 1 missing")
	}
	c.put(&tableEntry{key: k(5), html: html})
	if _, ok := c.get(k(2)); ok {
		t.Error("entry 2 (least recently used) kept beyond the bound")
	}
	for _, i := range []int{1, 3, 4, 5} {
		if _, ok := c.get(k(i)); !ok {
			t.Errorf("entry %d dropped", i)
		}
	}
	c.put(&tableEntry{key: k(6), html: make([]byte, 1001)}) // over a quarter of the bound
	if _, ok := c.get(k(6)); ok {
		t.Error("a table over a quarter of the bound was kept")
	}
	if b, n := c.held(); b != 4000 || n != 4 || len(c.byKey) != 4 {
		t.Errorf("holds %d bytes in %d tables, want 4000 in 4", b, n)
	}
}

// TestProjectSortJunk: ?sort= values that name no column show the list order and
// share one cached table, so a viewer cannot grow the cache with junk values.
func TestProjectSortJunk(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	p := createTestProject(t, st, "si")
	base := fmt.Sprintf("/projects/%d", p.ID)
	if code, m := getJSON(t, h, "POST", "/api/v1"+base+"/lines", steamLine); code != 201 {
		t.Fatalf("create line = %d %v", code, m)
	}
	for range 3 { // until the lines' results and freshness keys are saved
		do(t, h, "GET", base, nil, nil)
	}
	_, n0 := s.tables().held()
	var first string
	for i := range 20 {
		rec := do(t, h, "GET", fmt.Sprintf("%s?sort=junk%d", base, i), nil, nil)
		if rec.Code != http.StatusOK {
			t.Fatalf("sort=junk%d = %d", i, rec.Code)
		}
		if i == 0 {
			first = rec.Body.String()
		} else if rec.Body.String() != first {
			t.Fatalf("sort=junk%d renders another page than sort=junk0", i)
		}
	}
	if _, n := s.tables().held(); n != n0 {
		t.Errorf("20 junk sort values took the cache from %d tables to %d", n0, n)
	}
	if rec := do(t, h, "GET", base+"?sort=-tag", nil, nil); rec.Code != http.StatusOK || !strings.Contains(rec.Body.String(), `aria-sort="descending"`) {
		t.Errorf("a known sort key is not applied (%d)", rec.Code)
	}
}

// TestProjectPageFirstViewsRenderOnce: many views arriving together at a project whose
// answers are all stale (as after an import or a library change) share one render,
// so each line is analysed once, not once per view.
func TestProjectPageFirstViewsRenderOnce(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	ctx := context.Background()
	if rec := postPage(t, h, "/projects/demo", url.Values{}, nil); rec.Code != http.StatusSeeOther {
		t.Fatalf("demo = %d", rec.Code)
	}
	list, _ := st.Projects(ctx)
	p := list[0].Project
	lines, err := st.Lines(ctx, p.ID)
	if err != nil || len(lines) == 0 {
		t.Fatalf("%d lines, %v", len(lines), err)
	}
	var stale []store.ResultUpdate
	for _, l := range lines {
		stale = append(stale, store.ResultUpdate{LineID: l.ID, Result: l.Result, Hash: "stale"})
	}
	if err := st.SaveResults(ctx, stale); err != nil {
		t.Fatal(err)
	}
	var calls atomic.Int64
	release := make(chan struct{})
	s.results = s.results.WithEngine(func(in []analysis.Input, lib analysis.Resolver) ([]analysis.Stored, error) {
		<-release // hold the first render until every view has arrived
		calls.Add(int64(len(in)))
		return analysis.AnalyseMany(in, lib)
	})
	const views = 8
	var wg sync.WaitGroup
	codes := make([]int, views)
	for i := range views {
		wg.Add(1)
		go func() {
			defer wg.Done()
			codes[i] = do(t, h, "GET", fmt.Sprintf("/projects/%d", p.ID), nil, nil).Code
		}()
	}
	time.Sleep(300 * time.Millisecond) // the views reach the cache; one builds, the rest wait
	close(release)
	wg.Wait()
	for i, c := range codes {
		if c != http.StatusOK {
			t.Errorf("view %d = %d", i, c)
		}
	}
	if n := calls.Load(); n != int64(len(lines)) {
		t.Errorf("%d views of %d stale lines analysed %d lines, want %d (one render)", views, len(lines), n, len(lines))
	}
}
