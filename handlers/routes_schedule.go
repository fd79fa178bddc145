package handlers

import "github.com/go-chi/chi/v5"

// schedulePages mounts, under /projects/{id}, the printable schedule page (a draft
// from the current lines, or an issued revision with ?rev=N), its CSV, XLSX and PDF
// exports (also with ?rev=N) and issuing a revision.
func (s *Server) schedulePages(r chi.Router) {
	r.Get("/schedule", s.schedulePage)
	r.Get("/schedule.csv", s.scheduleExport(exportCSV))
	r.Get("/schedule.xlsx", s.scheduleExport(exportXLSX))
	r.Get("/schedule.pdf", s.scheduleExport(exportPDF))
	r.Post("/schedule/revisions", s.scheduleIssue)
}

// scheduleLinePages mounts, under /projects/{id}/lines/{line}, the line's
// calculation sheet and its PDF.
func (s *Server) scheduleLinePages(r chi.Router) {
	r.Get("/sheet", s.sheetPage)
	r.Get("/sheet.pdf", s.sheetPDF)
}
