package handlers

import "github.com/go-chi/chi/v5"

// comparePages mounts the Compare screen of a line, its "use this thickness" action,
// the project's installed-cost table and the project economics.
func (s *Server) comparePages(r chi.Router) {
	r.Get("/projects/{id}/lines/{line}/compare", s.comparePage)
	r.Post("/projects/{id}/lines/{line}/thickness", s.compareUseThickness)
	r.Get("/projects/{id}/costs", s.costsEdit)
	r.Post("/projects/{id}/costs", s.costsSave)
	r.Post("/projects/{id}/costs/example", s.costsExample)
	r.Get("/projects/{id}/economics", s.economicsProject)
}
