package handlers

import (
	"context"
	"encoding/json"
	"fmt"
	"net/http"
	"net/url"
	"strings"
	"testing"
	"time"

	"lagwright/analysis"
	"lagwright/demo"
	"lagwright/results"
	"lagwright/schedule"
	"lagwright/store"
	"lagwright/store/storetest"
)

func TestScheduleRoutes(t *testing.T) {
	st := storetest.NewDB(t)
	s, logs := newServer(t, st)
	h := s.Routes()
	p, err := demo.Create(context.Background(), st)
	if err != nil {
		t.Fatal(err)
	}
	lines, err := st.Lines(context.Background(), p.ID)
	if err != nil || len(lines) == 0 {
		t.Fatalf("demo lines: %d, %v", len(lines), err)
	}
	base := fmt.Sprintf("/projects/%d", p.ID)
	line := fmt.Sprintf("%s/lines/%d", base, lines[0].ID)
	for _, tc := range []struct {
		path, ctype, disposition, body string
		status                         int
	}{
		{base + "/schedule", "text/html", "", lines[0].Tag, 200},
		{base + "/schedule.csv", "text/csv; charset=utf-8", `attachment; filename="schedule-kettlewick-brewing-cellar-and-brewhouse-expansion-demo-draft.csv"`, "Tag,Service", 200},
		{base + "/schedule.xlsx", "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet", "attachment;", "PK", 200},
		{base + "/schedule.pdf", "application/pdf", "attachment;", "%PDF-", 200},
		{line + "/sheet", "text/html", "", "Engineer of record", 200},
		{line + "/sheet.pdf", "application/pdf", "attachment;", "%PDF-", 200},
		{"/projects/999999/schedule", "text/html", "", "", 404},
		{"/projects/999999/schedule.csv", "text/html", "", "", 404},
		{"/projects/abc/schedule", "text/html", "", "", 404},
		{base + "/lines/999999/sheet", "text/html", "", "", 404},
		{base + "/schedule?rev=7", "text/html", "", "", 404},
		{base + "/schedule.csv?rev=7", "text/html", "", "", 404},
		{base + "/schedule.csv?rev=abc", "text/html", "", "", 422},
	} {
		rec := do(t, h, "GET", tc.path, nil, nil)
		if rec.Code != tc.status {
			t.Errorf("GET %s = %d, want %d: %s", tc.path, rec.Code, tc.status, rec.Body.String()[:min(300, rec.Body.Len())])
			continue
		}
		if ct := rec.Header().Get("Content-Type"); !strings.HasPrefix(ct, tc.ctype) {
			t.Errorf("GET %s Content-Type = %q, want %q", tc.path, ct, tc.ctype)
		}
		if cd := rec.Header().Get("Content-Disposition"); !strings.HasPrefix(cd, tc.disposition) {
			t.Errorf("GET %s Content-Disposition = %q, want %q…", tc.path, cd, tc.disposition)
		}
		if !strings.Contains(rec.Body.String(), tc.body) {
			t.Errorf("GET %s body lacks %q", tc.path, tc.body)
		}
	}
	if strings.Contains(logs.String(), "internal error") {
		t.Errorf("internal errors logged:\n%s", logs)
	}
}

func TestScheduleRevisions(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	ctx := context.Background()
	p, err := demo.Create(ctx, st)
	if err != nil {
		t.Fatal(err)
	}
	base := fmt.Sprintf("/projects/%d", p.ID)

	// Nothing issued: ?rev=1 is not found, the draft lists no changes.
	if rec := do(t, h, "GET", base+"/schedule.csv?rev=1", nil, nil); rec.Code != 404 {
		t.Fatalf("rev 1 before issue = %d", rec.Code)
	}
	form := url.Values{"note": {"issued for bid"}}.Encode()
	rec := do(t, h, "POST", base+"/schedule/revisions", strings.NewReader(form), map[string]string{"Content-Type": "application/x-www-form-urlencoded"})
	if rec.Code != http.StatusSeeOther || rec.Header().Get("Location") != base+"/schedule?rev=1" {
		t.Fatalf("issue = %d, Location %q", rec.Code, rec.Header().Get("Location"))
	}
	rev1 := do(t, h, "GET", base+"/schedule.csv?rev=1", nil, nil)
	if rev1.Code != 200 || !strings.Contains(rev1.Body.String(), "Revision,Rev 1") || !strings.Contains(rev1.Body.String(), "issued for bid") {
		t.Fatalf("rev 1 csv = %d:\n%.600s", rev1.Code, rev1.Body)
	}
	if cd := rev1.Header().Get("Content-Disposition"); !strings.Contains(cd, "-rev1.csv") {
		t.Errorf("rev 1 file name = %q", cd)
	}
	rev1xlsx := do(t, h, "GET", base+"/schedule.xlsx?rev=1", nil, nil).Body.Bytes()

	// Change a line's length; the issued revision stays as it was.
	lines, _ := st.Lines(ctx, p.ID)
	l := lines[0]
	var in analysis.Input
	if err := json.Unmarshal(l.Input, &in); err != nil {
		t.Fatal(err)
	}
	*in.LengthM = *in.LengthM * 2
	l.Input, _ = json.Marshal(in)
	mats, _ := in.Slugs()
	if _, err := st.UpdateLine(ctx, l, mats); err != nil {
		t.Fatal(err)
	}
	again := do(t, h, "GET", base+"/schedule.csv?rev=1", nil, nil)
	if again.Body.String() != rev1.Body.String() {
		t.Error("rev 1 CSV changed after a line was edited")
	}
	if x := do(t, h, "GET", base+"/schedule.xlsx?rev=1", nil, nil).Body.Bytes(); len(x) != len(rev1xlsx) {
		t.Errorf("rev 1 XLSX changed size after a line was edited: %d → %d bytes", len(rev1xlsx), len(x))
	}
	draft := do(t, h, "GET", base+"/schedule.csv", nil, nil)
	if draft.Body.String() == rev1.Body.String() {
		t.Error("the draft did not change with the line")
	}

	// The draft page lists the change since Rev 1, with the fields that changed.
	page := do(t, h, "GET", base+"/schedule", nil, nil).Body.String()
	for _, want := range []string{"Changes since Rev 1", "1 changed", l.Tag + "</strong> changed", "length", "heat flow", "Rev 1</a>"} {
		if !strings.Contains(page, want) {
			t.Errorf("draft page lacks %q", want)
		}
	}
	// The issued revision's page shows it as issued, with no issue form.
	revPage := do(t, h, "GET", base+"/schedule?rev=1", nil, nil).Body.String()
	if !strings.Contains(revPage, "Rev 1") || strings.Contains(revPage, "Issue revision") {
		t.Error("rev 1 page should show Rev 1 without the issue form")
	}

	// Rev 2 numbers on; both stay downloadable.
	rec = do(t, h, "POST", base+"/schedule/revisions", strings.NewReader(""), map[string]string{"Content-Type": "application/x-www-form-urlencoded"})
	if rec.Header().Get("Location") != base+"/schedule?rev=2" {
		t.Fatalf("second issue → %q", rec.Header().Get("Location"))
	}
	for _, n := range []int{1, 2} {
		if rec := do(t, h, "GET", fmt.Sprintf("%s/schedule.pdf?rev=%d", base, n), nil, nil); rec.Code != 200 {
			t.Errorf("rev %d pdf = %d", n, rec.Code)
		}
	}
	if rec := do(t, h, "POST", "/projects/999999/schedule/revisions", strings.NewReader(""), map[string]string{"Content-Type": "application/x-www-form-urlencoded"}); rec.Code != 404 {
		t.Errorf("issue on a missing project = %d, want 404", rec.Code)
	}
	long := url.Values{"note": {strings.Repeat("x", 501)}}.Encode()
	if rec := do(t, h, "POST", base+"/schedule/revisions", strings.NewReader(long), map[string]string{"Content-Type": "application/x-www-form-urlencoded"}); rec.Code != 422 {
		t.Errorf("issue with a long note = %d, want 422", rec.Code)
	}
}

// withoutDate drops the CSV's "Date,…" line (the draft carries today's date).
func withoutDate(csv string) string {
	var out []string
	for _, l := range strings.Split(csv, "\n") {
		if !strings.HasPrefix(l, "Date,") {
			out = append(out, l)
		}
	}
	return strings.Join(out, "\n")
}

// The draft exports stream the lines and read only the parts of each answer that the
// schedule shows; they give the same schedule as the whole answers do, and recompute
// (and save) only the stale lines.
func TestScheduleExportStreamed(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	ctx := context.Background()
	p, err := demo.Create(ctx, st)
	if err != nil {
		t.Fatal(err)
	}
	csvPath := fmt.Sprintf("/projects/%d/schedule.csv", p.ID)
	first := do(t, h, "GET", csvPath, nil, nil)
	if first.Code != 200 {
		t.Fatalf("first export = %d", first.Code)
	}
	// The same schedule from the whole stored answers (the calculation sheet's path).
	set, views := freshLines(t, s, p)
	lib, err := st.Library(ctx)
	if err != nil {
		t.Fatal(err)
	}
	lines := make([]schedule.Line, len(views))
	for i, v := range views {
		lines[i] = results.ScheduleLine(v)
	}
	sp := scheduleHead(p, set)
	var want strings.Builder
	if err := schedule.WriteCSV(&want, schedule.Build(sp, lines, lib, 0, time.Now())); err != nil {
		t.Fatal(err)
	}
	if withoutDate(first.Body.String()) != withoutDate(want.String()) {
		t.Fatalf("streamed CSV differs from the CSV of the whole answers:\n%.2000s\nwant\n%.2000s", first.Body, want.String())
	}

	// Doctor two stored answers' surface temperature: one keeps its (fresh) hash and
	// must be shown as stored; the other is stale and must be recomputed and saved.
	stored, err := st.Lines(ctx, p.ID)
	if err != nil || len(stored) < 2 {
		t.Fatalf("lines: %d, %v", len(stored), err)
	}
	doctor := func(l store.Line, surfaceC float64) json.RawMessage {
		var res map[string]map[string]any
		if err := json.Unmarshal(l.Result, &res); err != nil || res["output"] == nil {
			t.Fatalf("%s: stored result %v", l.Tag, err)
		}
		res["output"]["surface_temp_c"] = surfaceC
		js, _ := json.Marshal(res)
		return js
	}
	stale, fresh := stored[0], stored[1]
	if err := st.SaveResults(ctx, []store.ResultUpdate{
		{LineID: stale.ID, Result: doctor(stale, 987.6), Hash: "stale"},
		{LineID: fresh.ID, Result: doctor(fresh, 1234.5), Hash: fresh.ResultHash},
	}); err != nil {
		t.Fatal(err)
	}
	doctored, err := st.Lines(ctx, p.ID)
	if err != nil {
		t.Fatal(err)
	}
	got := do(t, h, "GET", csvPath, nil, nil).Body.String()
	if !strings.Contains(got, "2254.1") { // 1234.5 °C in °F: the fresh line read as stored
		t.Error("a fresh line's stored answer was not used")
	}
	if strings.Contains(got, "1809.7") { // 987.6 °C in °F: the stale line not recomputed
		t.Error("a stale line's stored answer was used")
	}
	after, err := st.Lines(ctx, p.ID)
	if err != nil {
		t.Fatal(err)
	}
	if after[0].ResultHash != stale.ResultHash || string(after[0].Result) != string(stale.Result) {
		t.Errorf("stale line: saved hash %q, want %q; result saved as recomputed: %v", after[0].ResultHash, stale.ResultHash,
			string(after[0].Result) == string(stale.Result))
	}
	if string(after[1].Result) != string(doctored[1].Result) {
		t.Error("a fresh line's stored answer was rewritten")
	}
}
