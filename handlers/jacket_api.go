package handlers

import (
	"net/http"
	"net/url"

	"github.com/go-chi/chi/v5"

	"lagwright/field"
	"lagwright/store"
)

// jacketJSON is a jacket in the API; permeance_perm is null when unknown.
type jacketJSON struct {
	Slug           string   `json:"slug"`
	Name           string   `json:"name"`
	Emittance      float64  `json:"emittance"`
	VapourRetarder bool     `json:"vapour_retarder"`
	PermeancePerm  *float64 `json:"permeance_perm"`
	Use            string   `json:"use"`
	Source         string   `json:"source"`
	Builtin        bool     `json:"builtin"`
	Version        int      `json:"version"`
}

func jacketToJSON(j store.Jacket) jacketJSON {
	out := jacketJSON{Slug: j.Slug, Name: j.Name, Emittance: j.Emittance, VapourRetarder: j.VapourRetarder,
		Use: j.Use, Source: j.Source, Builtin: j.Builtin, Version: j.Version}
	if j.PermeancePerm > 0 {
		p := j.PermeancePerm
		out.PermeancePerm = &p
	}
	return out
}

// jacketPatch is a POST or PATCH body (see materialPatch). A null or 0
// permeance_perm means unknown.
type jacketPatch struct {
	Slug           *string  `json:"slug"`
	Name           *string  `json:"name"`
	Emittance      *float64 `json:"emittance"`
	VapourRetarder *bool    `json:"vapour_retarder"`
	PermeancePerm  *float64 `json:"permeance_perm"`
	Use            *string  `json:"use"`
	Source         *string  `json:"source"`
	Builtin        *bool    `json:"builtin"`
	Version        *int     `json:"version"`
}

func (p jacketPatch) apply(j *store.Jacket) []field.Error {
	if p.Name != nil {
		j.Name = *p.Name
	}
	if p.Emittance != nil {
		j.Emittance = *p.Emittance
	}
	if p.VapourRetarder != nil {
		j.VapourRetarder = *p.VapourRetarder
	}
	if p.PermeancePerm != nil {
		j.PermeancePerm = *p.PermeancePerm
	}
	if p.Use != nil {
		j.Use = *p.Use
	}
	if p.Source != nil {
		j.Source = *p.Source
	}
	if p.Builtin != nil && *p.Builtin {
		return []field.Error{{Field: "builtin", Message: "only custom jackets can be created or changed"}}
	}
	return nil
}

// apiJacketList answers GET /api/v1/jackets.
func (s *Server) apiJacketList(w http.ResponseWriter, r *http.Request) {
	list, err := s.store.Jackets(r.Context())
	if err != nil {
		s.fail(w, r, err)
		return
	}
	out := make([]jacketJSON, len(list))
	for i, j := range list {
		out[i] = jacketToJSON(j)
	}
	writeJSON(w, http.StatusOK, out)
}

// apiJacketGet answers GET /api/v1/jackets/{slug}.
func (s *Server) apiJacketGet(w http.ResponseWriter, r *http.Request) {
	j, err := s.store.Jacket(r.Context(), chi.URLParam(r, "slug"))
	if err != nil {
		s.fail(w, r, libraryError("jacket", err))
		return
	}
	writeJSON(w, http.StatusOK, jacketToJSON(j))
}

// apiJacketCreate answers POST /api/v1/jackets: 201, 422 or 409.
func (s *Server) apiJacketCreate(w http.ResponseWriter, r *http.Request) {
	var p jacketPatch
	if err := libDecode(r, &p); err != nil {
		s.fail(w, r, err)
		return
	}
	var j store.Jacket
	if p.Slug != nil {
		j.Slug = *p.Slug
	}
	if p.Emittance == nil {
		s.fail(w, r, Invalid(field.Error{Field: "emittance", Message: "is required"}))
		return
	}
	if fe := p.apply(&j); len(fe) > 0 {
		s.fail(w, r, Invalid(fe...))
		return
	}
	saved, err := s.store.CreateJacket(r.Context(), j)
	if err != nil {
		s.fail(w, r, libraryError("jacket", err))
		return
	}
	w.Header().Set("Location", "/api/v1/jackets/"+url.PathEscape(saved.Slug))
	writeJSON(w, http.StatusCreated, jacketToJSON(saved))
}

// apiJacketPatch answers PATCH /api/v1/jackets/{slug} with the version read (409 when stale).
func (s *Server) apiJacketPatch(w http.ResponseWriter, r *http.Request) {
	slug := chi.URLParam(r, "slug")
	var p jacketPatch
	if err := libDecode(r, &p); err != nil {
		s.fail(w, r, err)
		return
	}
	j, err := s.store.Jacket(r.Context(), slug)
	if err != nil {
		s.fail(w, r, libraryError("jacket", err))
		return
	}
	if j.Builtin {
		s.fail(w, r, libraryError("jacket", store.ErrBuiltin))
		return
	}
	var fe []field.Error
	if msg := versionProblem(p.Version); msg != "" {
		fe = append(fe, field.Error{Field: "version", Message: msg})
	} else {
		j.Version = *p.Version
	}
	if p.Slug != nil && *p.Slug != slug {
		fe = append(fe, field.Error{Field: "slug", Message: "cannot be changed"})
	}
	fe = append(fe, p.apply(&j)...)
	if len(fe) > 0 {
		s.fail(w, r, Invalid(fe...))
		return
	}
	saved, err := s.store.UpdateJacket(r.Context(), j)
	if err != nil {
		s.fail(w, r, libraryError("jacket", err))
		return
	}
	writeJSON(w, http.StatusOK, jacketToJSON(saved))
}

// apiJacketDelete answers DELETE /api/v1/jackets/{slug}: 204, or 409 in use / built-in.
func (s *Server) apiJacketDelete(w http.ResponseWriter, r *http.Request) {
	if err := s.store.DeleteJacket(r.Context(), chi.URLParam(r, "slug")); err != nil {
		s.fail(w, r, libraryError("jacket", err))
		return
	}
	w.WriteHeader(http.StatusNoContent)
}
