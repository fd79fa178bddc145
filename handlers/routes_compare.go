package handlers

import (
	"github.com/go-chi/chi/v5"

	"lagwright/schedule"
)

// comparePages mounts, under /projects/{id}, the installed-cost table, the project
// economics and the audit (page, PDF, XLSX).
func (s *Server) comparePages(r chi.Router) {
	r.Get("/costs", s.costsEdit)
	r.Post("/costs", s.costsSave)
	r.Post("/costs/example", s.costsExample)
	r.Get("/fittings", s.fittingTablesEdit)
	r.Post("/fittings", s.fittingTablesSave)
	r.Get("/economics", s.economicsProject)
	r.Get("/audit", s.auditPage)
	r.Get("/audit.pdf", s.auditExport("pdf", "application/pdf", schedule.WriteAuditPDF))
	r.Get("/audit.xlsx", s.auditExport("xlsx", "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet", schedule.WriteAuditXLSX))
}

// compareLinePages mounts, under /projects/{id}/lines/{line}, the Compare screen and
// its "use this thickness" action.
func (s *Server) compareLinePages(r chi.Router) {
	r.Get("/compare", s.comparePage)
	r.Post("/thickness", s.compareUseThickness)
}
