package handlers

import "github.com/go-chi/chi/v5"

// importPages mounts, under /projects/{id}, the import screens: the form and its
// preview, the commit, and the progress of a commit running in the background.
func (s *Server) importPages(r chi.Router) {
	r.Get("/import", s.importForm)
	r.Post("/import", s.importPreview)
	r.Post("/import/commit", s.importCommit)
	r.Get("/import/jobs/{job}", s.importProgress)
}

// importAPI mounts the import template of the JSON API.
func (s *Server) importAPI(r chi.Router) {
	r.Get("/import/template.csv", s.importTemplate)
}

// importProjectAPI mounts, under /api/v1/projects/{id}, an all-or-nothing import of
// a CSV body.
func (s *Server) importProjectAPI(r chi.Router) {
	r.Post("/import", s.apiImport)
}
