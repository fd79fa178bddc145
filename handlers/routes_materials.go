package handlers

import "github.com/go-chi/chi/v5"

// materialPages mounts the library's screens: insulation materials (with the pipe
// materials) and jackets. Built-in rows are read-only; custom ones have forms. Every
// action is a plain form POST, so the pages work without JavaScript. "new" is not a
// valid slug, so /materials/new never shadows a material.
func (s *Server) materialPages(r chi.Router) {
	r.Get("/materials", s.materialList)
	r.Get("/materials/new", s.materialNew)
	r.Post("/materials/new", s.materialCreate)
	r.Get("/materials/{slug}", s.materialShow)
	r.Get("/materials/{slug}/edit", s.materialEdit)
	r.Post("/materials/{slug}/edit", s.materialUpdate)
	r.Get("/materials/{slug}/delete", s.materialDeleteConfirm)
	r.Post("/materials/{slug}/delete", s.materialDelete)

	r.Get("/jackets", s.jacketList)
	r.Get("/jackets/new", s.jacketNew)
	r.Post("/jackets/new", s.jacketCreate)
	r.Get("/jackets/{slug}/edit", s.jacketEdit)
	r.Post("/jackets/{slug}/edit", s.jacketUpdate)
	r.Get("/jackets/{slug}/delete", s.jacketDeleteConfirm)
	r.Post("/jackets/{slug}/delete", s.jacketDelete)
}

// materialAPI mounts the library's JSON API (docs/library-api.md).
func (s *Server) materialAPI(r chi.Router) {
	r.Get("/materials", s.apiMaterialList)
	r.Post("/materials", s.apiMaterialCreate)
	r.Get("/materials/{slug}", s.apiMaterialGet)
	r.Patch("/materials/{slug}", s.apiMaterialPatch)
	r.Delete("/materials/{slug}", s.apiMaterialDelete)

	r.Get("/jackets", s.apiJacketList)
	r.Post("/jackets", s.apiJacketCreate)
	r.Get("/jackets/{slug}", s.apiJacketGet)
	r.Patch("/jackets/{slug}", s.apiJacketPatch)
	r.Delete("/jackets/{slug}", s.apiJacketDelete)

	r.Get("/pipe-materials", s.apiPipeMaterialList)
}
