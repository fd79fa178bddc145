package handlers

import (
	"fmt"
	"net/http"
	"strings"

	"github.com/a-h/templ"

	"lagwright/schedule"
	"lagwright/web"
)

// schedulePage shows the printable schedule: the draft from the current lines with the
// changes since the last issued revision and a form to issue the next, or (?rev=N) an
// issued revision as it was issued.
func (s *Server) schedulePage(w http.ResponseWriter, r *http.Request) {
	id, sc, err := s.requestedSchedule(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	ctx := r.Context()
	revs, err := s.store.Revisions(ctx, id)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	base := fmt.Sprintf("/projects/%d", id)
	q := ""
	if sc.Header.Revision > 0 {
		q = fmt.Sprintf("?rev=%d", sc.Header.Revision)
	}
	v := schedule.NewView(sc)
	pv := web.ScheduleView{
		Assets: s.assets.urls, ProjectName: sc.Header.Project, ProjectURL: base,
		Revision: sc.Header.RevisionText(), IsDraft: sc.Header.Revision == 0, Date: sc.Header.Date.Format("2006-01-02"),
		Conditions: v.Conditions, Methods: sc.Header.Methods, Cautions: sc.Header.Cautions,
		Rows: webTable(v.Rows), ByMaterial: webTable(v.ByMaterial), Items: webTable(v.Items), ByJacket: webTable(v.ByJacket), Grand: webTable(v.Grand),
		CSVURL: base + "/schedule.csv" + q, XLSXURL: base + "/schedule.xlsx" + q, PDFURL: base + "/schedule.pdf" + q,
		IssueURL: base + "/schedule/revisions",
	}
	pv.Rows.Links = make([]string, len(sc.Rows))
	for i, row := range sc.Rows {
		pv.Rows.Links[i] = fmt.Sprintf("%s/lines/%d/sheet", base, row.LineID)
	}
	for _, rv := range revs {
		pv.Revisions = append(pv.Revisions, web.ScheduleRevisionLink{Number: rv.Number, Date: rv.IssuedAt.UTC().Format("2006-01-02 15:04 UTC"),
			Note: rv.Note, URL: fmt.Sprintf("%s/schedule?rev=%d", base, rv.Number), Current: rv.Number == sc.Header.Revision})
	}
	if pv.IsDraft && len(revs) > 0 {
		last, err := s.store.Revision(ctx, id, revs[0].Number)
		if err != nil {
			s.fail(w, r, err)
			return
		}
		prev, err := revisionSchedule(last)
		if err != nil {
			s.fail(w, r, err)
			return
		}
		changes := schedule.Diff(prev.Rows, sc.Rows)
		pv.ChangesBase = fmt.Sprintf("Rev %d", last.Number)
		pv.ChangesNote = schedule.Summary(changes)
		for _, c := range changes {
			pv.Changes = append(pv.Changes, web.ScheduleChange{Tag: c.Tag, Kind: c.Kind, Fields: strings.Join(c.Fields, ", ")})
		}
	}
	w.Header().Set("Cache-Control", "no-store")
	templ.Handler(web.SchedulePage(pv)).ServeHTTP(w, r)
}

// webTable writes a schedule table as text for the page.
func webTable(t schedule.Table) web.ScheduleTable {
	out := web.ScheduleTable{Headings: make([]string, len(t.Columns)), Numeric: make([]bool, len(t.Columns)),
		NoWrap: make([]bool, len(t.Columns)), Rows: make([][]string, len(t.Rows))}
	for i, c := range t.Columns {
		out.Headings[i], out.Numeric[i] = c.Heading(), c.Numeric
		switch c.Key {
		case "tag", "size", "build_up", "location", "exposure", "vapour_retarder", "energy_code":
			out.NoWrap[i] = true // "NPS 2-1/2" must not break at its hyphen
		}
	}
	for r, row := range t.Rows {
		cells := make([]string, len(row))
		for i, c := range row {
			cells[i] = c.Display(t.Columns[i].Decimals)
		}
		out.Rows[r] = cells
	}
	return out
}
