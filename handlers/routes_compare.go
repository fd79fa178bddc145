package handlers

import "github.com/go-chi/chi/v5"

// comparePages mounts, under /projects/{id}, the installed-cost table and the
// project economics.
func (s *Server) comparePages(r chi.Router) {
	r.Get("/costs", s.costsEdit)
	r.Post("/costs", s.costsSave)
	r.Post("/costs/example", s.costsExample)
	r.Get("/economics", s.economicsProject)
}

// compareLinePages mounts, under /projects/{id}/lines/{line}, the Compare screen and
// its "use this thickness" action.
func (s *Server) compareLinePages(r chi.Router) {
	r.Get("/compare", s.comparePage)
	r.Post("/thickness", s.compareUseThickness)
}
