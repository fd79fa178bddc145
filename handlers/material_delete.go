package handlers

import (
	"errors"
	"net/http"
	"net/url"

	"github.com/a-h/templ"
	"github.com/go-chi/chi/v5"

	"lagwright/store"
	"lagwright/web"
)

// materialDeleteConfirm shows GET /materials/{slug}/delete: the confirmation.
func (s *Server) materialDeleteConfirm(w http.ResponseWriter, r *http.Request) {
	m, err := s.store.Material(r.Context(), chi.URLParam(r, "slug"))
	if err == nil && m.Builtin {
		err = store.ErrBuiltin
	}
	if err != nil {
		s.fail(w, r, libraryError("material", err))
		return
	}
	s.renderLibraryDelete(w, r, "material", m.Name, m.Slug, "", http.StatusOK)
}

// materialDelete handles POST /materials/{slug}/delete. A material in use is refused
// on the confirmation page (409), naming the lines.
func (s *Server) materialDelete(w http.ResponseWriter, r *http.Request) {
	slug := chi.URLParam(r, "slug")
	err := s.store.DeleteMaterial(r.Context(), slug)
	if errors.Is(err, store.ErrInUse) {
		name := slug
		if m, err := s.store.Material(r.Context(), slug); err == nil {
			name = m.Name
		}
		e := classify(libraryError("material", err))
		s.renderLibraryDelete(w, r, "material", name, slug, e.Message, statusOf(e.Code))
		return
	}
	if err != nil {
		s.fail(w, r, libraryError("material", err))
		return
	}
	http.Redirect(w, r, "/materials?deleted="+url.QueryEscape(slug), http.StatusSeeOther)
}

func (s *Server) renderLibraryDelete(w http.ResponseWriter, r *http.Request, what, name, slug, problem string, status int) {
	base := "/materials/" + url.PathEscape(slug)
	cancel := base
	if what == "jacket" {
		base = "/jackets/" + url.PathEscape(slug)
		cancel = "/jackets"
	}
	v := web.LibraryDeleteView{Assets: s.assets.urls, What: what, Name: name, Slug: slug,
		Action: templ.SafeURL(base + "/delete"), CancelHref: templ.SafeURL(cancel), Problem: problem}
	w.Header().Set("Cache-Control", "no-store")
	templ.Handler(web.LibraryDeletePage(v), templ.WithStatus(status)).ServeHTTP(w, r)
}
