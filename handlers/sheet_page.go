package handlers

import (
	"bytes"
	"fmt"
	"net/http"
	"time"

	"github.com/a-h/templ"

	"lagwright/schedule"
	"lagwright/web"
)

// lineSheet builds the calculation sheet of the line named in the path, from its fresh
// answer.
func (s *Server) lineSheet(r *http.Request) (projectID int64, sh schedule.Sheet, err error) {
	projectID, err = pathID(r, "id", "project")
	if err != nil {
		return 0, sh, err
	}
	lineID, err := pathID(r, "line", "line")
	if err != nil {
		return 0, sh, err
	}
	p, lines, lib, err := s.scheduleInput(r.Context(), projectID)
	if err != nil {
		return 0, sh, err
	}
	for _, l := range lines {
		if l.ID == lineID {
			sh := schedule.BuildSheet(p, l, lib, time.Now())
			// The analysis writes in SI; a US project's sheet adds the US values.
			sh.Assumptions = withUSValuesAll(p.Units, sh.Assumptions)
			sh.Warnings = withUSValuesAll(p.Units, sh.Warnings)
			return projectID, sh, nil
		}
	}
	return 0, sh, NotFound("line")
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
