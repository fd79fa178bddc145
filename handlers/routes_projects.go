package handlers

import "github.com/go-chi/chi/v5"

// projectPages mounts the projects routes: the list, the project form and page, the
// line page with its live results, and the line actions. Deletes and duplicates are
// POSTs; GET never changes anything.
func (s *Server) projectPages(r chi.Router) {
	r.Get("/projects", s.projectList)
	r.Post("/projects", s.projectCreate)
	r.Get("/projects/new", s.projectNew)
	r.Post("/projects/demo", s.projectDemo)
	r.Get("/projects/{id}", s.projectShow)
	r.Get("/projects/{id}/edit", s.projectEdit)
	r.Post("/projects/{id}/edit", s.projectUpdate)
	r.Get("/projects/{id}/lines/new", s.lineNew)
	r.Post("/projects/{id}/lines", s.lineSave)
	r.Post("/projects/{id}/lines/results", s.lineResults)
	r.Get("/projects/{id}/lines/{line}", s.lineShow)
	r.Post("/projects/{id}/lines/{line}", s.lineSave)
	r.Post("/projects/{id}/lines/{line}/results", s.lineResults)
	r.Post("/projects/{id}/lines/{line}/duplicate", s.lineDuplicate)
	r.Get("/projects/{id}/lines/{line}/delete", s.lineDeleteConfirm)
	r.Post("/projects/{id}/lines/{line}/delete", s.lineDelete)
}

// projectAPI mounts the projects JSON API (SI throughout; see project_api.go and
// line_api.go for the shapes).
func (s *Server) projectAPI(r chi.Router) {
	r.Get("/projects", s.apiProjects)
	r.Post("/projects", s.apiProjectCreate)
	r.Get("/projects/{id}", s.apiProject)
	r.Patch("/projects/{id}", s.apiProjectPatch)
	r.Delete("/projects/{id}", s.apiProjectDelete)
	r.Get("/projects/{id}/lines", s.apiLines)
	r.Post("/projects/{id}/lines", s.apiLineCreate)
	r.Get("/projects/{id}/lines/{line}", s.apiLine)
	r.Patch("/projects/{id}/lines/{line}", s.apiLinePatch)
	r.Delete("/projects/{id}/lines/{line}", s.apiLineDelete)
}
