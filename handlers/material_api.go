package handlers

import (
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"net/http"
	"net/url"
	"strings"

	"github.com/go-chi/chi/v5"

	"lagwright/catalog"
	"lagwright/field"
	"lagwright/store"
)

// materialJSON is a material in the API: SI, k_points as [[mean_temp_c, k_w_mk], …].
type materialJSON struct {
	Slug           string       `json:"slug"`
	Name           string       `json:"name"`
	Category       string       `json:"category"`
	Spec           string       `json:"spec"`
	KPoints        [][2]float64 `json:"k_points"`
	MinTempC       float64      `json:"min_temp_c"`
	MaxTempC       float64      `json:"max_temp_c"`
	ThicknessesMM  []float64    `json:"thicknesses_mm"`
	MaxLayerMM     float64      `json:"max_layer_mm"`
	Compressible   bool         `json:"compressible"`
	CompressionPct float64      `json:"compression_pct"`
	Source         string       `json:"source"`
	Builtin        bool         `json:"builtin"`
	Version        int          `json:"version"`
}

func materialToJSON(m store.Material) materialJSON {
	out := materialJSON{
		Slug: m.Slug, Name: m.Name, Category: m.Category, Spec: m.Spec, MinTempC: m.MinC, MaxTempC: m.MaxC,
		ThicknessesMM: m.ThicknessesMM, MaxLayerMM: m.MaxLayerMM, Compressible: m.Compressible,
		CompressionPct: m.CompressionPct, Source: m.Source, Builtin: m.Builtin, Version: m.Version,
		KPoints: make([][2]float64, len(m.KPoints)),
	}
	if out.ThicknessesMM == nil {
		out.ThicknessesMM = []float64{}
	}
	for i, p := range m.KPoints {
		out.KPoints[i] = [2]float64{p.MeanC, p.K}
	}
	return out
}

// materialPatch is a POST or PATCH body: absent keys keep their value (PATCH) or
// stay empty (POST). builtin may be given only as false; version is required by PATCH.
type materialPatch struct {
	Slug           *string      `json:"slug"`
	Name           *string      `json:"name"`
	Category       *string      `json:"category"`
	Spec           *string      `json:"spec"`
	KPoints        *[][]float64 `json:"k_points"`
	MinTempC       *float64     `json:"min_temp_c"`
	MaxTempC       *float64     `json:"max_temp_c"`
	ThicknessesMM  *[]float64   `json:"thicknesses_mm"`
	MaxLayerMM     *float64     `json:"max_layer_mm"`
	Compressible   *bool        `json:"compressible"`
	CompressionPct *float64     `json:"compression_pct"`
	Source         *string      `json:"source"`
	Builtin        *bool        `json:"builtin"`
	Version        *int         `json:"version"`
}

// apply writes the given keys onto m and returns the problems of shape.
func (p materialPatch) apply(m *store.Material) []field.Error {
	var fe []field.Error
	setS := func(dst *string, v *string) {
		if v != nil {
			*dst = *v
		}
	}
	setF := func(dst *float64, v *float64) {
		if v != nil {
			*dst = *v
		}
	}
	setS(&m.Name, p.Name)
	setS(&m.Category, p.Category)
	setS(&m.Spec, p.Spec)
	setS(&m.Source, p.Source)
	setF(&m.MinC, p.MinTempC)
	setF(&m.MaxC, p.MaxTempC)
	setF(&m.MaxLayerMM, p.MaxLayerMM)
	setF(&m.CompressionPct, p.CompressionPct)
	if p.Compressible != nil {
		m.Compressible = *p.Compressible
	}
	if p.ThicknessesMM != nil {
		m.ThicknessesMM = *p.ThicknessesMM
	}
	if p.KPoints != nil {
		m.KPoints = nil
		for i, pt := range *p.KPoints {
			if len(pt) != 2 {
				fe = append(fe, field.Error{Field: fmt.Sprintf("k_points[%d]", i), Message: "must be [mean_temp_c, k_w_mk]"})
				continue
			}
			m.KPoints = append(m.KPoints, catalog.KPoint{MeanC: pt[0], K: pt[1]})
		}
	}
	if p.Builtin != nil && *p.Builtin {
		fe = append(fe, field.Error{Field: "builtin", Message: "only custom materials can be created or changed"})
	}
	return fe
}

// libDecode reads one JSON object into v, refusing unknown keys; problems are field errors.
func libDecode(r *http.Request, v any) error {
	dec := json.NewDecoder(r.Body)
	dec.DisallowUnknownFields()
	err := dec.Decode(v)
	if err == nil {
		if _, extra := dec.Token(); extra != io.EOF {
			return Invalid(field.Error{Message: "the body must hold one JSON object"})
		}
		return nil
	}
	var typeErr *json.UnmarshalTypeError
	var tooLarge *http.MaxBytesError
	var bodyErr *bodyReadError
	switch {
	case errors.As(err, &tooLarge), errors.As(err, &bodyErr):
		return err
	case errors.As(err, &typeErr):
		return Invalid(field.Error{Field: typeErr.Field, Message: "must be a JSON " + typeErr.Type.String()})
	case strings.HasPrefix(err.Error(), "json: unknown field "):
		// encoding/json has no typed error for an unknown key; its text is the only carrier.
		return Invalid(field.Error{Field: strings.Trim(strings.TrimPrefix(err.Error(), "json: unknown field "), `"`),
			Message: "is not a field of this resource"})
	}
	return Invalid(field.Error{Message: "the body is not valid JSON"})
}

// apiMaterialList answers GET /api/v1/materials: every material, built-in and custom.
func (s *Server) apiMaterialList(w http.ResponseWriter, r *http.Request) {
	list, err := s.store.Materials(r.Context())
	if err != nil {
		s.fail(w, r, err)
		return
	}
	out := make([]materialJSON, len(list))
	for i, m := range list {
		out[i] = materialToJSON(m)
	}
	writeJSON(w, http.StatusOK, out)
}

// apiMaterialGet answers GET /api/v1/materials/{slug}.
func (s *Server) apiMaterialGet(w http.ResponseWriter, r *http.Request) {
	m, err := s.store.Material(r.Context(), chi.URLParam(r, "slug"))
	if err != nil {
		s.fail(w, r, libraryError("material", err))
		return
	}
	writeJSON(w, http.StatusOK, materialToJSON(m))
}

// apiMaterialCreate answers POST /api/v1/materials: 201 with the material, 422 with
// field errors, 409 for a taken slug.
func (s *Server) apiMaterialCreate(w http.ResponseWriter, r *http.Request) {
	var p materialPatch
	if err := libDecode(r, &p); err != nil {
		s.fail(w, r, err)
		return
	}
	var m store.Material
	if p.Slug != nil {
		m.Slug = *p.Slug
	}
	if fe := p.apply(&m); len(fe) > 0 {
		s.fail(w, r, Invalid(fe...))
		return
	}
	saved, err := s.store.CreateMaterial(r.Context(), m)
	if err != nil {
		s.fail(w, r, libraryError("material", err))
		return
	}
	w.Header().Set("Location", "/api/v1/materials/"+url.PathEscape(saved.Slug))
	writeJSON(w, http.StatusCreated, materialToJSON(saved))
}

// apiMaterialPatch answers PATCH /api/v1/materials/{slug}: the given keys change, the
// version must be the current one (409 when stale), built-ins are refused (409).
func (s *Server) apiMaterialPatch(w http.ResponseWriter, r *http.Request) {
	slug := chi.URLParam(r, "slug")
	var p materialPatch
	if err := libDecode(r, &p); err != nil {
		s.fail(w, r, err)
		return
	}
	m, err := s.store.Material(r.Context(), slug)
	if err != nil {
		s.fail(w, r, libraryError("material", err))
		return
	}
	var fe []field.Error
	if msg := versionProblem(p.Version); msg != "" {
		fe = append(fe, field.Error{Field: "version", Message: msg})
	} else {
		m.Version = *p.Version
	}
	if p.Slug != nil && *p.Slug != slug {
		fe = append(fe, field.Error{Field: "slug", Message: "cannot be changed"})
	}
	fe = append(fe, p.apply(&m)...)
	if m.Builtin {
		s.fail(w, r, libraryError("material", store.ErrBuiltin))
		return
	}
	if len(fe) > 0 {
		s.fail(w, r, Invalid(fe...))
		return
	}
	saved, err := s.store.UpdateMaterial(r.Context(), m)
	if err != nil {
		s.fail(w, r, libraryError("material", err))
		return
	}
	writeJSON(w, http.StatusOK, materialToJSON(saved))
}

// apiMaterialDelete answers DELETE /api/v1/materials/{slug}: 204, or 409 when lines
// use it or it is built-in.
func (s *Server) apiMaterialDelete(w http.ResponseWriter, r *http.Request) {
	if err := s.store.DeleteMaterial(r.Context(), chi.URLParam(r, "slug")); err != nil {
		s.fail(w, r, libraryError("material", err))
		return
	}
	w.WriteHeader(http.StatusNoContent)
}

// pipeMaterialJSON is a pipe-wall material in the API (read-only, from the catalog).
type pipeMaterialJSON struct {
	Slug          string   `json:"slug"`
	Name          string   `json:"name"`
	WallKWmK      float64  `json:"wall_k_w_mk"`
	BareEmittance float64  `json:"bare_emittance"`
	Cautions      []string `json:"cautions"`
	Source        string   `json:"source"`
}

// apiPipeMaterialList answers GET /api/v1/pipe-materials.
func (s *Server) apiPipeMaterialList(w http.ResponseWriter, r *http.Request) {
	var out []pipeMaterialJSON
	for _, p := range catalog.PipeMaterials() {
		c := p.Cautions
		if c == nil {
			c = []string{}
		}
		out = append(out, pipeMaterialJSON{Slug: p.Slug, Name: p.Name, WallKWmK: p.WallK,
			BareEmittance: p.BareEmittance, Cautions: c, Source: p.Source})
	}
	writeJSON(w, http.StatusOK, out)
}
