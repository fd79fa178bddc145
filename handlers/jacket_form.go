package handlers

import (
	"errors"
	"net/http"
	"net/url"
	"strconv"
	"strings"

	"github.com/a-h/templ"
	"github.com/go-chi/chi/v5"

	"lagwright/catalog"
	"lagwright/store"
	"lagwright/units"
	"lagwright/web"
)

// jacketForm is a custom-jacket form as typed.
type jacketForm struct {
	values         map[string]string
	vapourRetarder bool
	errors         map[string]string
}

func readJacketForm(r *http.Request) (*jacketForm, error) {
	if err := r.ParseForm(); err != nil {
		return nil, err
	}
	f := &jacketForm{values: map[string]string{}, errors: map[string]string{}}
	for _, k := range []string{"slug", "name", "emittance", "permeance", "use", "source", "version"} {
		f.values[k] = strings.TrimSpace(r.PostForm.Get(k))
	}
	f.vapourRetarder = r.PostForm.Get("vapour_retarder") != ""
	return f, nil
}

func jacketFormOf(j store.Jacket) *jacketForm {
	f := &jacketForm{values: map[string]string{
		"slug": j.Slug, "name": j.Name, "emittance": strconv.FormatFloat(j.Emittance, 'f', -1, 64),
		"use": j.Use, "source": j.Source, "version": strconv.Itoa(j.Version),
	}, vapourRetarder: j.VapourRetarder, errors: map[string]string{}}
	if j.PermeancePerm > 0 {
		f.values["permeance"] = strconv.FormatFloat(j.PermeancePerm, 'f', -1, 64)
	}
	return f
}

// jacket reads the typed values; problems reading a number go to f.errors.
func (f *jacketForm) jacket() store.Jacket {
	j := store.Jacket{Jacket: catalog.Jacket{Slug: f.values["slug"], Name: f.values["name"], Use: f.values["use"],
		Source: f.values["source"], VapourRetarder: f.vapourRetarder}}
	j.Version, _ = parseVersion(f.values["version"])
	if s := f.values["emittance"]; s == "" {
		f.errors["emittance"] = "is required"
	} else if v, err := strconv.ParseFloat(s, 64); err != nil {
		f.errors["emittance"] = "must be a number between 0 and 1"
	} else {
		j.Emittance = v
	}
	if s := f.values["permeance"]; s != "" {
		// A bare number is in perm (the US unit); "57 ng/Pa·s·m²" is converted.
		v, err := units.Parse(units.Permeance, units.US, s)
		if err != nil {
			f.errors["permeance"] = err.Error()
		} else {
			j.PermeancePerm = units.FromSI(units.Permeance, units.US, v)
		}
	}
	return j
}

func (s *Server) renderJacketForm(w http.ResponseWriter, r *http.Request, f *jacketForm, editing bool, message string, status int) {
	v := web.JacketFormView{Assets: s.assets.urls, Editing: editing, Values: f.values,
		VapourRetarder: f.vapourRetarder, Errors: f.errors, Message: message, CancelHref: "/jackets"}
	if editing {
		v.Title = "Edit " + f.values["name"]
		v.Action = templ.SafeURL("/jackets/" + url.PathEscape(f.values["slug"]) + "/edit")
	} else {
		v.Title = "New custom jacket"
		v.Action = "/jackets/new"
	}
	w.Header().Set("Cache-Control", "no-store")
	templ.Handler(web.JacketFormPage(v), templ.WithStatus(status)).ServeHTTP(w, r)
}

// jacketNew shows GET /jackets/new.
func (s *Server) jacketNew(w http.ResponseWriter, r *http.Request) {
	s.renderJacketForm(w, r, &jacketForm{values: map[string]string{}, errors: map[string]string{}}, false, "", http.StatusOK)
}

// jacketEdit shows GET /jackets/{slug}/edit for a custom jacket.
func (s *Server) jacketEdit(w http.ResponseWriter, r *http.Request) {
	j, err := s.store.Jacket(r.Context(), chi.URLParam(r, "slug"))
	if err == nil && j.Builtin {
		err = store.ErrBuiltin
	}
	if err != nil {
		s.fail(w, r, libraryError("jacket", err))
		return
	}
	s.renderJacketForm(w, r, jacketFormOf(j), true, "", http.StatusOK)
}

// jacketCreate handles POST /jackets/new.
func (s *Server) jacketCreate(w http.ResponseWriter, r *http.Request) { s.saveJacket(w, r, false) }

// jacketUpdate handles POST /jackets/{slug}/edit.
func (s *Server) jacketUpdate(w http.ResponseWriter, r *http.Request) { s.saveJacket(w, r, true) }

func (s *Server) saveJacket(w http.ResponseWriter, r *http.Request, editing bool) {
	f, err := readJacketForm(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	if editing {
		f.values["slug"] = chi.URLParam(r, "slug")
	}
	j := f.jacket()
	if fe := j.Validate(); len(fe) > 0 || len(f.errors) > 0 {
		for _, e := range fe {
			if _, ok := f.errors[jacketFormKey(e.Field)]; !ok {
				f.errors[jacketFormKey(e.Field)] = e.Message
			}
		}
		s.renderJacketForm(w, r, f, editing, "", http.StatusUnprocessableEntity)
		return
	}
	var saved store.Jacket
	if editing {
		saved, err = s.store.UpdateJacket(r.Context(), j)
	} else {
		saved, err = s.store.CreateJacket(r.Context(), j)
	}
	if err != nil {
		appErr := classify(libraryError("jacket", err))
		if appErr.Code != CodeConflict && appErr.Code != CodeInvalid {
			s.fail(w, r, err)
			return
		}
		message := ""
		for _, fe := range appErr.Fields {
			f.errors[jacketFormKey(fe.Field)] = fe.Message
		}
		if len(appErr.Fields) == 0 {
			message = appErr.Message
		}
		if errors.Is(err, store.ErrConflict) {
			message = "Someone else saved this jacket after you opened the form. Your input is below; " +
				"open it again to see the saved values, then re-apply your changes."
		}
		s.renderJacketForm(w, r, f, editing, message, statusOf(appErr.Code))
		return
	}
	http.Redirect(w, r, "/jackets?saved="+url.QueryEscape(saved.Slug)+"#jacket-"+url.QueryEscape(saved.Slug), http.StatusSeeOther)
}

// jacketFormKey is the form field that shows a store field's problem.
func jacketFormKey(field string) string {
	if field == "permeance_perm" {
		return "permeance"
	}
	return field
}
