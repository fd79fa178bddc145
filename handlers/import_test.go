package handlers

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"math"
	"mime/multipart"
	"net/http"
	"net/http/httptest"
	"regexp"
	"runtime"
	"strings"
	"testing"
	"time"

	"lagwright/analysis"
	"lagwright/linelist"
	"lagwright/results"
	"lagwright/store"
	"lagwright/store/storetest"
	"lagwright/units"
)

func newImportProject(t *testing.T, st *store.Store, sys units.System) store.Project {
	t.Helper()
	p, err := st.CreateProject(context.Background(), store.Project{Name: "Import test plant", Units: string(sys)})
	if err != nil {
		t.Fatal(err)
	}
	return p
}

type importAnswer struct {
	Created int                 `json:"created"`
	Errors  []linelist.RowError `json:"errors"`
}

func postImport(t *testing.T, h http.Handler, projectID int64, body string) (int, importAnswer) {
	t.Helper()
	rec := do(t, h, "POST", fmt.Sprintf("/api/v1/projects/%d/import", projectID), strings.NewReader(body),
		map[string]string{"Content-Type": "text/csv"})
	var a importAnswer
	if err := json.Unmarshal(rec.Body.Bytes(), &a); err != nil {
		t.Fatalf("answer %d is not JSON: %v\n%s", rec.Code, err, rec.Body)
	}
	return rec.Code, a
}

func importedLines(t *testing.T, st *store.Store, projectID int64) []store.Line {
	t.Helper()
	lines, err := st.Lines(context.Background(), projectID)
	if err != nil {
		t.Fatal(err)
	}
	return lines
}

const importGood = "tag,service,location,pipe_size,length [m],elbows,operating_temp [°C],layer1_material,layer1_thickness [mm],jacket,duct_width [mm],duct_height [mm],steam_pressure [kPa g],notes\n" +
	"HW-1,Heating hot water,indoor,NPS 2,30,4,82,mineral_fiber_pipe_c547_t1,40,all_service_jacket,,,,first\n" +
	"CHW-1,Chilled water,indoor,DN100,12.5,,6,Flexible elastomeric; Grade 1,25,pvc_jacket,,,,\n" +
	"SA-1,Supply air,indoor,,20,,13,glass_blanket_c553,50,fsk,600,400,,\n" +
	"ST-1,Steam,outdoor,NPS 4,45,2,,calcium_silicate_c533_t1,65,aluminium_weathered,,,1000,\n"

// A good file: every line saved with its result, hashed as the project page would
// hash it, so the page recomputes nothing.
func TestImportAPIGoodFile(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	p := newImportProject(t, st, units.SI)
	// The material name "Flexible elastomeric; Grade 1" is not a slug: use a real name.
	body := strings.Replace(importGood, "Flexible elastomeric; Grade 1", "Flexible elastomeric, Grade 1", 1)
	body = strings.Replace(body, "Flexible elastomeric, Grade 1", `"Flexible elastomeric, Grade 1"`, 1)
	code, a := postImport(t, s.Routes(), p.ID, body)
	if code != http.StatusOK || a.Created != 4 || len(a.Errors) != 0 {
		t.Fatalf("import = %d %+v", code, a)
	}
	lines := importedLines(t, st, p.ID)
	if len(lines) != 4 {
		t.Fatalf("%d lines saved, want 4", len(lines))
	}
	set, _ := results.Settings(p)
	lib, err := st.Library(context.Background())
	if err != nil {
		t.Fatal(err)
	}
	wantTags := []string{"HW-1", "CHW-1", "SA-1", "ST-1"}
	for i, l := range lines {
		own, fit, err := results.Decode(l)
		if err != nil {
			t.Fatal(err)
		}
		eff := set.Effective(l.Location, own, fit)
		if l.Tag != wantTags[i] || l.ResultHash != results.Hash(lib, eff) {
			t.Errorf("line %d: tag %q, hash %q: not as the project page would hash it", i, l.Tag, l.ResultHash)
		}
		var res analysis.Stored
		if err := json.Unmarshal(l.Result, &res); err != nil || res.Output == nil || len(res.Errors) > 0 {
			t.Errorf("line %s: stored result %s", l.Tag, l.Result)
		}
	}
	_, fit0, _ := results.Decode(lines[0])
	if lines[1].Location != "indoor" || lines[3].Location != "outdoor" || lines[0].Notes != "first" || fit0 != (analysis.Fittings{Elbows: 4}) ||
		lines[2].Exposure != "exposed" {
		t.Errorf("line fields: %s %s %q %+v", lines[1].Location, lines[3].Location, lines[0].Notes, fit0)
	}
	own, _, _ := results.Decode(lines[1])
	if own.Layers[0].Material != "elastomeric_c534_gr1" {
		t.Errorf("material by name resolved to %q", own.Layers[0].Material)
	}
	// The page's loader finds every result fresh: nothing to recompute.
	if _, views := freshLines(t, s, p); len(views) != 4 {
		t.Fatalf("%d lines, want 4", len(views))
	}
	after := importedLines(t, st, p.ID)
	for i := range after {
		if after[i].ResultHash != lines[i].ResultHash || !bytes.Equal(after[i].Result, lines[i].Result) {
			t.Errorf("line %s was recomputed by the page", after[i].Tag)
		}
	}
}

// A file with bad rows: nothing saved, every bad row and column named.
func TestImportAPIBadRows(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	p := newImportProject(t, st, units.US)
	body := "tag,pipe_size,length [ft],operating_temp [°F],layer1_material,layer1_thickness [in],jacket\n" +
		"OK-1,NPS 2,100,180,mineral_fiber_pipe_c547_t1,1-1/2,all_service_jacket\n" + // row 2: good
		"B-3,NPS 2,100,180,unobtainium,1,all_service_jacket\n" + // row 3: unknown material
		"B-4,NPS 30,100,180,mineral_fiber_pipe_c547_t1,1,all_service_jacket\n" + // row 4: size not in the tables
		"B-5,NPS 2,100,350,elastomeric_c534_gr1,1,all_service_jacket\n" + // row 5: 350 °F above elastomeric's limit
		"B-6,NPS 2,100,180,mineral_fiber_pipe_c547_t1,0,all_service_jacket\n" + // row 6: analysis error on the thickness
		"B-7,NPS 2,10 kg,180,mineral_fiber_pipe_c547_t1,1,all_service_jacket\n" + // row 7: wrong unit in a cell
		"OK-1,NPS 2,100,180,mineral_fiber_pipe_c547_t1,1,all_service_jacket\n" + // row 8: duplicate tag in the file
		"B-9,NPS 2,100,180,mineral_fiber_pipe_c547_t1,1,tinfoil\n" + // row 9: unknown jacket
		"B-10,NPS 2,100,,mineral_fiber_pipe_c547_t1,1,all_service_jacket\n" // row 10: no temperature
	code, a := postImport(t, s.Routes(), p.ID, body)
	if code != http.StatusUnprocessableEntity || a.Created != 0 {
		t.Fatalf("import = %d %+v, want 422", code, a)
	}
	want := map[[2]string]string{
		{"3", "layer1_material"}:       "unknown material",
		{"4", "pipe_size"}:             "NPS 30",
		{"5", "layer1_material"}:       "above its service limit",
		{"6", "layer1_thickness [in]"}: "greater than 0",
		{"7", "length [ft]"}:           "kg",
		{"8", "tag"}:                   "already used on row 2",
		{"9", "jacket"}:                "unknown jacket",
		{"10", "operating_temp [°F]"}:  "required",
	}
	got := map[[2]string]string{}
	for _, e := range a.Errors {
		got[[2]string{fmt.Sprint(e.Row), e.Field}] = e.Message
	}
	for k, frag := range want {
		if !strings.Contains(got[k], frag) {
			t.Errorf("row %s, %s: got %q, want a message with %q", k[0], k[1], got[k], frag)
		}
	}
	if len(got) != len(want) {
		t.Errorf("errors %+v\nwant exactly %d", a.Errors, len(want))
	}
	if n := len(importedLines(t, st, p.ID)); n != 0 {
		t.Errorf("%d lines saved from a bad file, want 0", n)
	}
}

func TestImportDuplicateTagsAndMissingProject(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	p := newImportProject(t, st, units.SI)
	one := "tag,pipe_size,operating_temp [°C],layer1_material,layer1_thickness [mm],jacket\nA-1,NPS 1,60,mineral_fiber_pipe_c547_t1,25,all_service_jacket\n"
	if code, a := postImport(t, h, p.ID, one); code != 200 || a.Created != 1 {
		t.Fatalf("first import = %d %+v", code, a)
	}
	code, a := postImport(t, h, p.ID, one+"A-2,NPS 1,60,mineral_fiber_pipe_c547_t1,25,all_service_jacket\n")
	if code != 422 || len(a.Errors) != 1 || a.Errors[0].Row != 2 || a.Errors[0].Field != "tag" ||
		!strings.Contains(a.Errors[0].Message, "already used in this project") {
		t.Errorf("second import = %d %+v, want 422 naming row 2's tag", code, a)
	}
	if n := len(importedLines(t, st, p.ID)); n != 1 {
		t.Errorf("%d lines after the refused import, want 1", n)
	}
	rec := do(t, h, "POST", "/api/v1/projects/999999/import", strings.NewReader(one), nil)
	if rec.Code != 404 || !strings.Contains(rec.Body.String(), `"errors"`) {
		t.Errorf("unknown project = %d %s, want 404 JSON", rec.Code, rec.Body)
	}
	if rec := do(t, h, "GET", "/projects/999999/import", nil, nil); rec.Code != 404 {
		t.Errorf("import page of an unknown project = %d", rec.Code)
	}
}

// The template round-trips: its example row, imported and exported back through the
// same columns, is the same line.
func TestImportTemplateRoundTrip(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	for _, sys := range []units.System{units.SI, units.US} {
		t.Run(string(sys), func(t *testing.T) {
			p := newImportProject(t, st, sys)
			rec := do(t, h, "GET", "/api/v1/import/template.csv?units="+string(sys), nil, nil)
			if rec.Code != 200 || rec.Header().Get("Content-Type") != "text/csv; charset=utf-8" ||
				!strings.Contains(rec.Header().Get("Content-Disposition"), "attachment") {
				t.Fatalf("template = %d %v", rec.Code, rec.Header())
			}
			tmpl := rec.Body.String()
			orig, errs := linelist.Parse(strings.NewReader(tmpl))
			if len(errs) > 0 || len(orig) != 1 {
				t.Fatalf("template parses to %d rows, %v", len(orig), errs)
			}
			if code, a := postImport(t, h, p.ID, tmpl); code != 200 || a.Created != 1 {
				t.Fatalf("importing the template = %d %+v", code, a)
			}
			l := importedLines(t, st, p.ID)[0]
			own, fit, err := results.Decode(l)
			if err != nil {
				t.Fatal(err)
			}
			back := linelist.Row{Tag: l.Tag, Service: l.Service, Location: l.Location, Exposure: l.Exposure, Notes: l.Notes,
				Fittings: fit, Input: own}
			headers := linelist.Header(sys)
			var b bytes.Buffer
			if err := linelist.Write(&b, headers, []linelist.Row{back}); err != nil {
				t.Fatal(err)
			}
			again, errs := linelist.Parse(&b)
			if len(errs) > 0 {
				t.Fatal(errs)
			}
			x, y := orig[0], again[0]
			if x.Tag != y.Tag || x.Service != y.Service || x.Location != y.Location || x.Exposure != y.Exposure ||
				x.Notes != y.Notes || x.Fittings != y.Fittings {
				t.Errorf("line fields differ:\n%+v\n%+v", x, y)
			}
			xj, _ := json.Marshal(x.Input)
			yj, _ := json.Marshal(y.Input)
			if !sameJSON(xj, yj, 1e-9) {
				t.Errorf("input differs:\n%s\n%s", xj, yj)
			}
		})
	}
}

// sameJSON compares two JSON documents with numbers equal within a relative tolerance.
func sameJSON(a, b []byte, tol float64) bool {
	var x, y any
	if json.Unmarshal(a, &x) != nil || json.Unmarshal(b, &y) != nil {
		return false
	}
	var eq func(x, y any) bool
	eq = func(x, y any) bool {
		switch xv := x.(type) {
		case map[string]any:
			yv, ok := y.(map[string]any)
			if !ok || len(xv) != len(yv) {
				return false
			}
			for k := range xv {
				if !eq(xv[k], yv[k]) {
					return false
				}
			}
			return true
		case []any:
			yv, ok := y.([]any)
			if !ok || len(xv) != len(yv) {
				return false
			}
			for i := range xv {
				if !eq(xv[i], yv[i]) {
					return false
				}
			}
			return true
		case float64:
			yv, ok := y.(float64)
			return ok && math.Abs(xv-yv) <= tol*math.Max(1, math.Abs(xv))
		}
		return x == y
	}
	return eq(x, y)
}

// importMultipart builds a multipart form with text fields.
func importMultipart(t *testing.T, fields map[string]string) (*bytes.Buffer, string) {
	t.Helper()
	var b bytes.Buffer
	mw := multipart.NewWriter(&b)
	for k, v := range fields {
		if err := mw.WriteField(k, v); err != nil {
			t.Fatal(err)
		}
	}
	if err := mw.Close(); err != nil {
		t.Fatal(err)
	}
	return &b, mw.FormDataContentType()
}

var importHidden = regexp.MustCompile(`<input type="hidden" name="text" value="([^"]*)"`)

// Rows pasted from a spreadsheet (tab-separated) preview and commit through the pages.
func TestImportPastedRowsPreviewAndCommit(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	p := newImportProject(t, st, units.US)
	pasted := "Tag\tService\tPipe Size\tLength [ft]\tOperating_Temp [degF]\tLayer1_Material\tLayer1_Thickness [in]\tJacket\r\n" +
		"HW-10\tHeating, supply\t1-1/2\"\t120\t180\tmineral_fiber_pipe_c547_t1\t1\tall_service_jacket\r\n" +
		"HW-11\tHeating, return\tNPS 1-1/2\t120\t160\tmineral_fiber_pipe_c547_t1\t1\tall_service_jacket\r\n"
	body, ct := importMultipart(t, map[string]string{"rows": pasted})
	rec := do(t, h, "POST", fmt.Sprintf("/projects/%d/import", p.ID), body, map[string]string{"Content-Type": ct})
	page := rec.Body.String()
	if rec.Code != 200 {
		t.Fatalf("preview = %d\n%s", rec.Code, page)
	}
	for _, want := range []string{"2 lines read, no problems", "Heat loss of the runs", "HW-10", "Heating, supply", "NPS 1-1/2", "120.0 ft", "180.0 °F",
		"1 in Mineral fiber pipe insulation", "Btu/h·ft", "Import 2 lines"} {
		if !strings.Contains(page, want) {
			t.Errorf("preview lacks %q", want)
		}
	}
	if n := len(importedLines(t, st, p.ID)); n != 0 {
		t.Fatalf("the preview saved %d lines", n)
	}
	m := importHidden.FindStringSubmatch(page)
	if m == nil {
		t.Fatal("preview has no hidden text to commit")
	}
	text := htmlUnescape(m[1])
	if text != pasted {
		t.Errorf("hidden text differs from the pasted text:\n%q\n%q", text, pasted)
	}
	body, ct = importMultipart(t, map[string]string{"text": text})
	rec = do(t, h, "POST", fmt.Sprintf("/projects/%d/import/commit", p.ID), body, map[string]string{"Content-Type": ct})
	if rec.Code != http.StatusSeeOther || rec.Header().Get("Location") != fmt.Sprintf("/projects/%d", p.ID) {
		t.Fatalf("commit = %d %q\n%s", rec.Code, rec.Header().Get("Location"), rec.Body)
	}
	if lines := importedLines(t, st, p.ID); len(lines) != 2 || lines[0].Service != "Heating, supply" {
		t.Errorf("lines after commit: %+v", lines)
	}

	// A second preview of the same rows: every row refused by its tag, no commit button.
	body, ct = importMultipart(t, map[string]string{"rows": pasted})
	rec = do(t, h, "POST", fmt.Sprintf("/projects/%d/import", p.ID), body, map[string]string{"Content-Type": ct})
	page = rec.Body.String()
	if rec.Code != 422 || !strings.Contains(page, "2 of 2 rows have problems") || !strings.Contains(page, "Row 3, Tag") ||
		strings.Contains(page, `name="text"`) {
		t.Errorf("preview of duplicates = %d\n%s", rec.Code, page)
	}
	// Nothing given: the form again, with a message.
	body, ct = importMultipart(t, map[string]string{"rows": ""})
	rec = do(t, h, "POST", fmt.Sprintf("/projects/%d/import", p.ID), body, map[string]string{"Content-Type": ct})
	if rec.Code != 422 || !strings.Contains(rec.Body.String(), "Choose a CSV file") {
		t.Errorf("empty preview = %d", rec.Code)
	}
}

func htmlUnescape(s string) string {
	return strings.NewReplacer("&lt;", "<", "&gt;", ">", "&#34;", `"`, "&#39;", "'", "&quot;", `"`, "&#x9;", "\t", "&#xA;", "\n", "&#xD;", "\r", "&#10;", "\n", "&#13;", "\r", "&#9;", "\t", "&amp;", "&").Replace(s)
}

// generateRows writes n varied, valid lines (pipes hot and cold, ducts, steam).
func generateRows(n int) string {
	var b strings.Builder
	b.WriteString("tag,service,location,pipe_size,length [m],elbows,valves,operating_temp [°C],steam_pressure [kPa g],layer1_material,layer1_thickness [mm],jacket,duct_width [mm],duct_height [mm]\n")
	sizes := []string{"NPS 1/2", "NPS 1", "NPS 2", "NPS 4", "DN150", "CTS 3/4"}
	for i := range n {
		switch i % 4 {
		case 0:
			fmt.Fprintf(&b, "HW-%05d,Heating hot water,indoor,%s,%d,%d,1,%d,,mineral_fiber_pipe_c547_t1,%d,all_service_jacket,,\n",
				i, sizes[i%len(sizes)], 5+i%40, i%5, 60+i%30, []int{25, 40, 50}[i%3])
		case 1:
			fmt.Fprintf(&b, "CHW-%05d,Chilled water,indoor,%s,%d,2,0,%d,,elastomeric_c534_gr1,%d,pvc_jacket,,\n",
				i, sizes[i%len(sizes)], 5+i%40, 5+i%4, []int{19, 25, 32}[i%3])
		case 2:
			fmt.Fprintf(&b, "SA-%05d,Supply air,indoor,,%d,0,0,%d,,glass_blanket_c553,50,fsk,%d,%d\n",
				i, 5+i%20, 12+i%3, 300+10*(i%50), 200+10*(i%30))
		default:
			fmt.Fprintf(&b, "ST-%05d,Steam,outdoor,NPS 3,%d,3,2,,%d,calcium_silicate_c533_t1,%d,aluminium_weathered,,\n",
				i, 10+i%50, 400+i%600, []int{50, 65, 75}[i%3])
		}
	}
	return b.String()
}

// A large commit runs in the background; its progress page polls until done.
func TestImportJobProgress(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	p := newImportProject(t, st, units.SI)
	body, ct := importMultipart(t, map[string]string{"text": generateRows(importJobRows + 100)})
	rec := do(t, h, "POST", fmt.Sprintf("/projects/%d/import/commit", p.ID), body, map[string]string{"Content-Type": ct})
	loc := rec.Header().Get("Location")
	if rec.Code != http.StatusSeeOther || !strings.HasPrefix(loc, fmt.Sprintf("/projects/%d/import/jobs/", p.ID)) {
		t.Fatalf("big commit = %d %q", rec.Code, loc)
	}
	deadline := time.Now().Add(60 * time.Second)
	var frag string
	for time.Now().Before(deadline) {
		rec = do(t, h, "GET", loc, nil, map[string]string{"HX-Request": "true"})
		frag = rec.Body.String()
		if rec.Code != 200 || strings.Contains(frag, "<html") {
			t.Fatalf("progress fragment = %d\n%s", rec.Code, frag)
		}
		if strings.Contains(frag, `data-phase="done"`) || strings.Contains(frag, `data-phase="failed"`) {
			break
		}
		if !strings.Contains(frag, `hx-get="`+loc+`"`) || !strings.Contains(frag, `hx-trigger="load delay:500ms"`) {
			t.Fatalf("running fragment does not poll:\n%s", frag)
		}
		time.Sleep(100 * time.Millisecond)
	}
	if !strings.Contains(frag, `data-phase="done"`) || !strings.Contains(frag, "600 lines imported") || strings.Contains(frag, "hx-get") {
		t.Fatalf("final fragment:\n%s", frag)
	}
	if n := len(importedLines(t, st, p.ID)); n != 600 {
		t.Errorf("%d lines saved, want 600", n)
	}
	full := do(t, h, "GET", loc, nil, nil)
	if full.Code != 200 || !strings.Contains(full.Body.String(), "<html") || strings.Contains(full.Body.String(), "http-equiv") {
		t.Errorf("finished progress page = %d (no refresh wanted once done)", full.Code)
	}
	if rec := do(t, h, "GET", fmt.Sprintf("/projects/%d/import/jobs/nothing", p.ID), nil, nil); rec.Code != 404 {
		t.Errorf("unknown job = %d", rec.Code)
	}
}

// Ten thousand lines against PostgreSQL: parse, check, analyse on every core, save by
// COPY; then the same through the API into a second project. The times are logged
// (docs/performance.md, "Import").
func TestImport10000Lines(t *testing.T) {
	if testing.Short() {
		t.Skip("10,000-line import skipped in -short")
	}
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	ctx := context.Background()
	text := generateRows(linelist.MaxRows)

	t0 := time.Now()
	rows, errs := linelist.Parse(strings.NewReader(text))
	parsed := time.Since(t0)
	if len(rows) != linelist.MaxRows || len(errs) > 0 {
		t.Fatalf("parse: %d rows, %v", len(rows), errs)
	}
	p := newImportProject(t, st, units.SI)
	t0 = time.Now()
	plan, err := s.planImport(ctx, p, []byte(text), nil)
	if err != nil || !plan.OK() {
		t.Fatalf("plan: %v %v", err, plan.Problems)
	}
	planned := time.Since(t0)
	t0 = time.Now()
	if n, err := st.CreateLines(ctx, p.ID, plan.Lines, plan.Materials); err != nil || n != linelist.MaxRows {
		t.Fatalf("save: %d %v", n, err)
	}
	saved := time.Since(t0)

	p2 := newImportProject(t, st, units.SI)
	t0 = time.Now()
	rec := httptest.NewRecorder()
	h.ServeHTTP(rec, httptest.NewRequest("POST", fmt.Sprintf("/api/v1/projects/%d/import", p2.ID), strings.NewReader(text)))
	total := time.Since(t0)
	if rec.Code != 200 || !strings.Contains(rec.Body.String(), `"created": 10000`) {
		t.Fatalf("import = %d %s", rec.Code, rec.Body)
	}
	for _, id := range []int64{p.ID, p2.ID} {
		if n := len(importedLines(t, st, id)); n != linelist.MaxRows {
			t.Fatalf("project %d: %d lines saved", id, n)
		}
	}
	t.Logf("10,000 lines (%d KiB of CSV) on %d cores: parse %v; parse+check+analyse %v; save (COPY, one transaction) %v; whole API import %v",
		len(text)>>10, runtime.GOMAXPROCS(0), parsed.Round(time.Millisecond), planned.Round(time.Millisecond),
		saved.Round(time.Millisecond), total.Round(time.Millisecond))
}
