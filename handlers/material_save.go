package handlers

import (
	"errors"
	"net/http"
	"net/url"

	"github.com/a-h/templ"
	"github.com/go-chi/chi/v5"

	"lagwright/store"
	"lagwright/units"
	"lagwright/web"
)

// materialNew shows GET /materials/new: a blank form, or with ?from=slug a copy of
// another material to adjust (how a built-in class becomes a custom one).
func (s *Server) materialNew(w http.ResponseWriter, r *http.Request) {
	f := &materialForm{values: map[string]string{"units": "si"}, errors: map[string]string{}}
	if from := r.URL.Query().Get("from"); from != "" {
		m, err := s.store.Material(r.Context(), from)
		if err != nil {
			s.fail(w, r, libraryError("material", err))
			return
		}
		f = materialFormOf(m, units.SI)
		f.values["slug"] = copySlug(m.Slug)
		f.values["name"] = m.Name + " (custom)"
		f.values["source"] = "adjusted from the built-in " + m.Slug + ": " + m.Source
		if !m.Builtin {
			f.values["name"] = m.Name + " (copy)"
			f.values["source"] = m.Source
		}
		delete(f.values, "version")
	}
	s.renderMaterialForm(w, r, f, false, "", http.StatusOK)
}

func copySlug(slug string) string {
	if len(slug) > 52 {
		slug = slug[:52]
	}
	return slug + "_custom"
}

// materialCreate handles POST /materials/new.
func (s *Server) materialCreate(w http.ResponseWriter, r *http.Request) {
	s.saveMaterial(w, r, false)
}

// materialEdit shows GET /materials/{slug}/edit for a custom material; built-ins are read-only.
func (s *Server) materialEdit(w http.ResponseWriter, r *http.Request) {
	m, err := s.store.Material(r.Context(), chi.URLParam(r, "slug"))
	if err == nil && m.Builtin {
		err = store.ErrBuiltin
	}
	if err != nil {
		s.fail(w, r, libraryError("material", err))
		return
	}
	sys := units.SI
	if r.URL.Query().Get("units") == "us" {
		sys = units.US
	}
	s.renderMaterialForm(w, r, materialFormOf(m, sys), true, "", http.StatusOK)
}

// materialUpdate handles POST /materials/{slug}/edit with the version the form was read at.
func (s *Server) materialUpdate(w http.ResponseWriter, r *http.Request) {
	s.saveMaterial(w, r, true)
}

// saveMaterial reads, checks and saves the form: on a problem it re-renders the form
// with the input and the messages beside the fields (422, or 409 for a taken slug or a
// stale version); on success it redirects to the material (303).
func (s *Server) saveMaterial(w http.ResponseWriter, r *http.Request, editing bool) {
	f, err := readMaterialForm(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	if editing {
		f.values["slug"] = chi.URLParam(r, "slug")
	}
	m, origins := f.material()
	if fe := m.Validate(); len(fe) > 0 || f.hasErrors() {
		f.addStoreErrors(fe, origins)
		s.renderMaterialForm(w, r, f, editing, "", http.StatusUnprocessableEntity)
		return
	}
	var saved store.Material
	if editing {
		saved, err = s.store.UpdateMaterial(r.Context(), m)
	} else {
		saved, err = s.store.CreateMaterial(r.Context(), m)
	}
	if err != nil {
		appErr := classify(libraryError("material", err))
		if appErr.Code != CodeConflict && appErr.Code != CodeInvalid {
			s.fail(w, r, err)
			return
		}
		message := ""
		for _, fe := range appErr.Fields {
			f.errors[fe.Field] = fe.Message
		}
		if len(appErr.Fields) == 0 {
			message = appErr.Message
		}
		if errors.Is(err, store.ErrConflict) {
			message = "Someone else saved this material after you opened the form. Your input is below; " +
				"open the material again to see the saved values, then re-apply your changes."
		}
		s.renderMaterialForm(w, r, f, editing, message, statusOf(appErr.Code))
		return
	}
	next := "?created=1"
	if editing {
		next = "?saved=1"
	}
	http.Redirect(w, r, "/materials/"+url.PathEscape(saved.Slug)+next, http.StatusSeeOther)
}

func (s *Server) renderMaterialForm(w http.ResponseWriter, r *http.Request, f *materialForm, editing bool, message string, status int) {
	w.Header().Set("Cache-Control", "no-store")
	templ.Handler(web.MaterialFormPage(s.materialFormView(f, editing, message)), templ.WithStatus(status)).ServeHTTP(w, r)
}
