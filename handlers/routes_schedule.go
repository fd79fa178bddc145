package handlers

import "github.com/go-chi/chi/v5"

// schedulePages mounts the schedule routes: the printable schedule page (a draft from
// the current lines, or an issued revision with ?rev=N), its CSV, XLSX and PDF exports
// (also with ?rev=N), issuing a revision, and the calculation sheet of one line.
func (s *Server) schedulePages(r chi.Router) {
	r.Get("/projects/{id}/schedule", s.schedulePage)
	r.Get("/projects/{id}/schedule.csv", s.scheduleExport(exportCSV))
	r.Get("/projects/{id}/schedule.xlsx", s.scheduleExport(exportXLSX))
	r.Get("/projects/{id}/schedule.pdf", s.scheduleExport(exportPDF))
	r.Post("/projects/{id}/schedule/revisions", s.scheduleIssue)
	r.Get("/projects/{id}/lines/{line}/sheet", s.sheetPage)
	r.Get("/projects/{id}/lines/{line}/sheet.pdf", s.sheetPDF)
}
