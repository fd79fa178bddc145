package handlers

import (
	"context"
	"encoding/json"
	"fmt"
	"net/http"
	"slices"
	"strings"

	"lagwright/analysis"
	"lagwright/field"
	"lagwright/results"
	"lagwright/store"
)

// The lines JSON API, SI throughout:
//
//	GET|POST /api/v1/projects/{id}/lines
//	GET|PATCH|DELETE /api/v1/projects/{id}/lines/{line}
//
// A line is {id, project_id, position, tag, service, location, exposure, notes, fittings,
// version, input, result, status, created_at, updated_at} plus the keys of its own
// calculation input (docs/calc-json.md) flattened at the top level for reading:
// geometry, pipe_size or pipe_od_mm, length_m, operating_temp_c, layers, jacket, ….
// result is the analysis output at the project's conditions, or {"errors": […]}.
//
// To write, send the input's keys at the top level with tag, service, location,
// exposure, notes and fittings; PATCH is a JSON merge patch and carries version (a
// stale one gets 409). A line is validated by analysing it at the project's conditions:
// bad input gets 422 with every field named, and is not saved. Read-only keys (id,
// project_id, position, input, result, status, created_at, updated_at) are ignored.

var lineMetaKeys = []string{"tag", "service", "location", "exposure", "notes", "fittings", "version"}

var lineReadOnly = []string{"id", "project_id", "position", "input", "result", "status", "created_at", "updated_at"}

type lineMeta struct {
	Tag      string            `json:"tag"`
	Service  string            `json:"service"`
	Location string            `json:"location"`
	Exposure string            `json:"exposure"`
	Notes    string            `json:"notes"`
	Fittings analysis.Fittings `json:"fittings"`
	Version  *int              `json:"version"`
}

// lineOut is the JSON of a line with its fresh answer.
func lineOut(lv results.Line) map[string]any {
	m := jsonMap(lv.Own)
	var result any = lv.Result.Output
	if len(lv.Result.Errors) > 0 || lv.Result.Output == nil {
		result = map[string]any{"errors": lv.Result.Errors}
	}
	l := lv.Line
	for k, v := range map[string]any{"id": l.ID, "project_id": l.ProjectID, "position": l.Position, "tag": l.Tag,
		"service": l.Service, "location": l.Location, "exposure": l.Exposure, "notes": l.Notes, "fittings": lv.Fittings,
		"version": l.Version, "input": lv.Own, "result": result, "status": lineStatus(lv.Effective, lv.Result),
		"created_at": l.CreatedAt, "updated_at": l.UpdatedAt} {
		m[k] = v
	}
	return m
}

// writable is the part of a line's JSON that a client may send back.
func writable(lv results.Line) map[string]any {
	m := jsonMap(lineOut(lv))
	for _, k := range lineReadOnly {
		delete(m, k)
	}
	return m
}

// decodeLineBody splits a body into the line's columns and its input, decodes both
// strictly, and validates them, the input by analysing it at the project's conditions.
func (s *Server) decodeLineBody(ctx context.Context, set analysis.ProjectSettings, projectID int64,
	m map[string]any) (lineFields, store.Line, error) {
	for _, k := range lineReadOnly {
		delete(m, k)
	}
	meta, input := map[string]any{}, map[string]any{}
	for k, v := range m {
		if slices.Contains(lineMetaKeys, k) {
			meta[k] = v
		} else {
			input[k] = v
		}
	}
	if _, ok := input["layers"]; !ok {
		input["layers"] = []any{}
	}
	var lm lineMeta
	var fe field.Errors
	js, _ := json.Marshal(meta)
	if err := analysis.DecodeStrict(js, &lm); err != nil {
		fe = append(fe, asFieldErrors(err)...)
	}
	lf := lineFields{Tag: lm.Tag, Service: lm.Service, Location: lm.Location, Exposure: lm.Exposure, Notes: lm.Notes,
		Fittings: lm.Fittings, Version: lm.Version}
	js, _ = json.Marshal(input)
	if err := analysis.DecodeStrict(js, &lf.Input); err != nil {
		fe = append(fe, asFieldErrors(err)...)
	}
	fe = addMissing(fe, lf.validateMeta())
	row := lf.line(projectID)
	lib, err := s.library(ctx)
	if err != nil {
		return lf, row, err
	}
	stored, hash, err := s.results.Compute(lib, set, row, lf.Input, lf.Fittings)
	if err != nil {
		return lf, row, err
	}
	fe = addMissing(fe, stored.Errors)
	if len(fe) > 0 {
		slices.SortStableFunc(fe, func(a, b field.Error) int { return strings.Compare(a.Field, b.Field) })
		return lf, row, fe
	}
	row.Result, row.ResultHash = stored.Marshal(), hash
	return lf, row, nil
}

// addMissing appends the errors of more whose field has none yet.
func addMissing(fe, more field.Errors) field.Errors {
	for _, e := range more {
		if !slices.ContainsFunc(fe, func(d field.Error) bool {
			return d.Field == e.Field || strings.HasPrefix(e.Field, d.Field+".") || strings.HasPrefix(e.Field, d.Field+"[")
		}) {
			fe = append(fe, e)
		}
	}
	return fe
}

// freshLine is one stored line with a fresh answer (recomputed and saved only if stale).
func (s *Server) freshLine(ctx context.Context, set analysis.ProjectSettings, l store.Line) (results.Line, error) {
	lib, err := s.library(ctx)
	if err != nil {
		return results.Line{}, err
	}
	return s.results.One(ctx, set, lib, l)
}

func (s *Server) apiLines(w http.ResponseWriter, r *http.Request) {
	views, err := s.projectLines(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	out := make([]map[string]any, len(views))
	for i, lv := range views {
		out[i] = lineOut(lv)
	}
	writeJSON(w, http.StatusOK, out)
}

func (s *Server) apiLineCreate(w http.ResponseWriter, r *http.Request) {
	p, set := projectOf(r)
	m, err := readJSONObject(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	delete(m, "version")
	lf, row, err := s.decodeLineBody(r.Context(), set, p.ID, m)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	mats, _ := lf.Input.Slugs()
	saved, err := s.store.CreateLine(r.Context(), row, mats)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	s.writeLine(w, r, http.StatusCreated, set, saved)
}

func (s *Server) writeLine(w http.ResponseWriter, r *http.Request, status int, set analysis.ProjectSettings, l store.Line) {
	lv, err := s.freshLine(r.Context(), set, l)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	w.Header().Set("Location", fmt.Sprintf("/api/v1/projects/%d/lines/%d", l.ProjectID, l.ID))
	writeJSON(w, status, lineOut(lv))
}

func (s *Server) apiLine(w http.ResponseWriter, r *http.Request) {
	_, set := projectOf(r)
	l := lineOf(r)
	s.writeLine(w, r, http.StatusOK, set, l)
}

func (s *Server) apiLinePatch(w http.ResponseWriter, r *http.Request) {
	_, set := projectOf(r)
	l := lineOf(r)
	patch, err := readPatch(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	own, fit, err := results.Decode(l)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	cur := writable(results.Line{Line: l, Own: own, Fittings: fit})
	lf, row, err := s.decodeLineBody(r.Context(), set, l.ProjectID, mergePatch(cur, patch))
	if err != nil {
		s.fail(w, r, err)
		return
	}
	if msg := versionProblem(lf.Version); msg != "" {
		s.fail(w, r, Invalid(field.Error{Field: "version", Message: msg}))
		return
	}
	row.ID, row.Version = l.ID, *lf.Version
	mats, _ := lf.Input.Slugs()
	saved, err := s.store.UpdateLine(r.Context(), row, mats)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	s.writeLine(w, r, http.StatusOK, set, saved)
}

func (s *Server) apiLineDelete(w http.ResponseWriter, r *http.Request) {
	l := lineOf(r)
	if err := s.store.DeleteLine(r.Context(), l.ProjectID, l.ID); err != nil {
		s.fail(w, r, err)
		return
	}
	w.WriteHeader(http.StatusNoContent)
}
