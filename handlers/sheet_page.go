package handlers

import (
	"bytes"
	"fmt"
	"net/http"
	"time"

	"github.com/a-h/templ"

	"lagwright/results"
	"lagwright/schedule"
	"lagwright/web"
)

// lineSheet builds the calculation sheet of the route's line from its fresh answer.
func (s *Server) lineSheet(r *http.Request) (projectID int64, sh schedule.Sheet, err error) {
	p, set := projectOf(r)
	lib, err := s.library(r.Context())
	if err != nil {
		return 0, sh, err
	}
	lv, err := s.results.One(r.Context(), set, lib, lineOf(r))
	if err != nil {
		return 0, sh, err
	}
	sp := scheduleHead(p, set)
	sh = schedule.BuildSheet(sp, results.ScheduleLine(lv), lib, time.Now())
	// The analysis writes in SI; a US project's sheet adds the US values.
	sh.Assumptions = withUSValuesAll(sp.Units, sh.Assumptions)
	sh.Warnings = withUSValuesAll(sp.Units, sh.Warnings)
	return p.ID, sh, nil
}

// sheetPage shows a line's printable calculation sheet.
func (s *Server) sheetPage(w http.ResponseWriter, r *http.Request) {
	id, sh, err := s.lineSheet(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	base := fmt.Sprintf("/projects/%d", id)
	v := web.SheetView{
		Assets: s.assets.urls, Title: sh.Title, ProjectName: sh.Project, ProjectURL: base, ScheduleURL: base + "/schedule",
		PDFURL: r.URL.Path + ".pdf", Client: sh.Client, Site: sh.Site, Date: sh.Date.Format("2006-01-02"),
		MethodVersion: sh.MethodVersion, Errors: sh.Errors, Layers: webTable(sh.Layers),
		Assumptions: sh.Assumptions, Warnings: sh.Warnings, Methods: sh.Methods, Cautions: sh.Cautions,
	}
	for _, sec := range sh.Sections {
		v.Sections = append(v.Sections, web.SheetSection{Title: sec.Title, Rows: sec.Rows})
	}
	w.Header().Set("Cache-Control", "no-store")
	templ.Handler(web.SheetPage(v)).ServeHTTP(w, r)
}

// sheetPDF downloads a line's calculation sheet as PDF.
func (s *Server) sheetPDF(w http.ResponseWriter, r *http.Request) {
	_, sh, err := s.lineSheet(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	var buf bytes.Buffer
	if err := schedule.WriteSheetPDF(&buf, sh); err != nil {
		s.fail(w, r, err)
		return
	}
	setDownload(w, "application/pdf", "calc-sheet-"+safeSlug(sh.Project)+"-"+safeSlug(sh.Tag)+".pdf")
	_, _ = buf.WriteTo(w)
}
