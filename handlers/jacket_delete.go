package handlers

import (
	"errors"
	"net/http"
	"net/url"

	"github.com/go-chi/chi/v5"

	"lagwright/store"
)

// jacketDeleteConfirm shows GET /jackets/{slug}/delete.
func (s *Server) jacketDeleteConfirm(w http.ResponseWriter, r *http.Request) {
	j, err := s.store.Jacket(r.Context(), chi.URLParam(r, "slug"))
	if err == nil && j.Builtin {
		err = store.ErrBuiltin
	}
	if err != nil {
		s.fail(w, r, libraryError("jacket", err))
		return
	}
	s.renderLibraryDelete(w, r, "jacket", j.Name, j.Slug, "", http.StatusOK)
}

// jacketDelete handles POST /jackets/{slug}/delete; a jacket that lines name is refused (409).
func (s *Server) jacketDelete(w http.ResponseWriter, r *http.Request) {
	slug := chi.URLParam(r, "slug")
	err := s.store.DeleteJacket(r.Context(), slug)
	if errors.Is(err, store.ErrInUse) {
		name := slug
		if j, err := s.store.Jacket(r.Context(), slug); err == nil {
			name = j.Name
		}
		e := classify(libraryError("jacket", err))
		s.renderLibraryDelete(w, r, "jacket", name, slug, e.Message, statusOf(e.Code))
		return
	}
	if err != nil {
		s.fail(w, r, libraryError("jacket", err))
		return
	}
	http.Redirect(w, r, "/jackets?deleted="+url.QueryEscape(slug), http.StatusSeeOther)
}
