package handlers

import "github.com/go-chi/chi/v5"

// projectListPages mounts the project list, the new-project form and the demo.
func (s *Server) projectListPages(r chi.Router) {
	r.Get("/projects", s.projectList)
	r.Post("/projects", s.projectCreate)
	r.Get("/projects/new", s.projectNew)
	r.Post("/projects/demo", s.projectDemo)
}

// projectPages mounts, under /projects/{id}, the project page and form, the new-line
// form with its live results and the line create.
func (s *Server) projectPages(r chi.Router) {
	r.Get("/", s.projectShow)
	r.Get("/edit", s.projectEdit)
	r.Post("/edit", s.projectUpdate)
	r.Get("/delete", s.projectDeleteConfirm)
	r.Post("/delete", s.projectDelete)
	r.Get("/lines/new", s.lineNew)
	r.Post("/lines", s.lineSave)
	r.Post("/lines/results", s.lineResults)
}

// linePages mounts, under /projects/{id}/lines/{line}, the line page with its live
// results and the line actions. Deletes and duplicates are POSTs; GET never changes
// anything.
func (s *Server) linePages(r chi.Router) {
	r.Get("/", s.lineShow)
	r.Post("/", s.lineSave)
	r.Post("/results", s.lineResults)
	r.Post("/duplicate", s.lineDuplicate)
	r.Get("/delete", s.lineDeleteConfirm)
	r.Post("/delete", s.lineDelete)
}

// projectListAPI mounts the project list and create of the JSON API (SI throughout;
// see project_api.go and line_api.go for the shapes).
func (s *Server) projectListAPI(r chi.Router) {
	r.Get("/projects", s.apiProjects)
	r.Post("/projects", s.apiProjectCreate)
}

// projectAPI mounts, under /api/v1/projects/{id}, the project and its lines.
func (s *Server) projectAPI(r chi.Router) {
	r.Get("/", s.apiProject)
	r.Patch("/", s.apiProjectPatch)
	r.Delete("/", s.apiProjectDelete)
	r.Get("/lines", s.apiLines)
	r.Post("/lines", s.apiLineCreate)
}

// lineAPI mounts, under /api/v1/projects/{id}/lines/{line}, one line.
func (s *Server) lineAPI(r chi.Router) {
	r.Get("/", s.apiLine)
	r.Patch("/", s.apiLinePatch)
	r.Delete("/", s.apiLineDelete)
}
