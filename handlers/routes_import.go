package handlers

import "github.com/go-chi/chi/v5"

// importPages mounts the import screens: the form and its preview, the commit, and
// the progress of a commit running in the background.
func (s *Server) importPages(r chi.Router) {
	r.Get("/projects/{id}/import", s.importForm)
	r.Post("/projects/{id}/import", s.importPreview)
	r.Post("/projects/{id}/import/commit", s.importCommit)
	r.Get("/projects/{id}/import/jobs/{job}", s.importProgress)
}

// importAPI mounts the import API: the template and an all-or-nothing import of a
// CSV body.
func (s *Server) importAPI(r chi.Router) {
	r.Get("/import/template.csv", s.importTemplate)
	r.Post("/projects/{id}/import", s.apiImport)
}
