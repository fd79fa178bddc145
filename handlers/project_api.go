package handlers

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"lagwright/catalog"
	"net/http"
	"slices"
	"strings"
	"time"

	"lagwright/analysis"
	"lagwright/field"
	"lagwright/results"
	"lagwright/store"
)

// The projects JSON API, SI throughout:
//
//	GET|POST /api/v1/projects
//	GET|PATCH|DELETE /api/v1/projects/{id}
//
// A project is {id, name, client, site, units ("si"|"us"), settings (analysis.ProjectSettings),
// version, created_at, updated_at}. POST takes name, client, site, units and settings
// (missing settings keys take the defaults) and answers 201 with the project. PATCH is
// a JSON merge patch (RFC 7386) of the same keys and must carry the version it read: a
// stale one gets 409. Unknown keys and bad values get 422 with every field named.
// Read-only keys (id, created_at, updated_at, line_count) are ignored on input, so what
// GET returns can be sent back.

type projectJSON struct {
	ID        int64                    `json:"id"`
	Name      string                   `json:"name"`
	Client    string                   `json:"client"`
	Site      string                   `json:"site"`
	Units     string                   `json:"units"`
	Settings  analysis.ProjectSettings `json:"settings"`
	Version   int                      `json:"version"`
	LineCount *int                     `json:"line_count,omitempty"`
	CreatedAt time.Time                `json:"created_at"`
	UpdatedAt time.Time                `json:"updated_at"`
}

func projectOut(p store.Project) (projectJSON, error) {
	set, err := results.Settings(p)
	return projectJSON{ID: p.ID, Name: p.Name, Client: p.Client, Site: p.Site, Units: p.Units, Settings: set,
		Version: p.Version, CreatedAt: p.CreatedAt, UpdatedAt: p.UpdatedAt}, err
}

var projectReadOnly = []string{"id", "created_at", "updated_at", "line_count"}

// readJSONObject reads a request body as one JSON object (numbers kept exact).
func readJSONObject(r *http.Request) (map[string]any, error) {
	body, err := io.ReadAll(io.LimitReader(r.Body, analysis.MaxInputBytes+1))
	if err != nil {
		return nil, err
	}
	if len(body) > analysis.MaxInputBytes {
		return nil, Invalid(field.Error{Message: fmt.Sprintf("request is larger than %d KiB", analysis.MaxInputBytes>>10)})
	}
	dec := json.NewDecoder(bytes.NewReader(body))
	dec.UseNumber()
	var m map[string]any
	if err := dec.Decode(&m); err != nil || m == nil || dec.More() {
		return nil, Invalid(field.Error{Message: "the body must be one JSON object"})
	}
	return m, nil
}

// readPatch reads a PATCH body: one JSON object that carries the version the client
// read (optimistic concurrency).
func readPatch(r *http.Request) (map[string]any, error) {
	m, err := readJSONObject(r)
	if err != nil {
		return nil, err
	}
	var v *int
	if n, ok := m["version"].(json.Number); ok {
		if x, err := parseVersion(string(n)); err == nil {
			v = &x
		} else {
			v = new(int) // present but not a version
		}
	} else if _, present := m["version"]; present { // null, a string, …
		v = new(int)
	}
	if msg := versionProblem(v); msg != "" {
		return nil, Invalid(field.Error{Field: "version", Message: msg})
	}
	return m, nil
}

// mergePatch applies an RFC 7386 JSON merge patch to target.
func mergePatch(target, patch map[string]any) map[string]any {
	for k, v := range patch {
		if v == nil {
			delete(target, k)
			continue
		}
		if pm, ok := v.(map[string]any); ok {
			tm, _ := target[k].(map[string]any)
			if tm == nil {
				tm = map[string]any{}
			}
			target[k] = mergePatch(tm, pm)
			continue
		}
		target[k] = v
	}
	return target
}

// decodeProject decodes a project body strictly over the defaults and validates it.
func decodeProject(m map[string]any, codeTable func(id string) (catalog.CodeTable, bool)) (projectInput, error) {
	for _, k := range projectReadOnly {
		delete(m, k)
	}
	in := projectInput{Units: "si", Settings: analysis.DefaultSettings()}
	js, _ := json.Marshal(m)
	var fe field.Errors
	if err := analysis.DecodeStrict(js, &in); err != nil {
		fe = asFieldErrors(err)
		if fe == nil {
			return in, err
		}
	}
	for _, e := range in.validate(codeTable) {
		if !slices.ContainsFunc(fe, func(d field.Error) bool { return d.Field == e.Field }) {
			fe = append(fe, e)
		}
	}
	if len(fe) > 0 {
		slices.SortStableFunc(fe, func(a, b field.Error) int { return strings.Compare(a.Field, b.Field) })
		return in, fe
	}
	return in, nil
}

func (s *Server) apiProjects(w http.ResponseWriter, r *http.Request) {
	list, err := s.store.Projects(r.Context())
	if err != nil {
		s.fail(w, r, err)
		return
	}
	out := make([]projectJSON, 0, len(list))
	for _, p := range list {
		pj, err := projectOut(p.Project)
		if err != nil {
			s.fail(w, r, err)
			return
		}
		n := p.LineCount
		pj.LineCount = &n
		out = append(out, pj)
	}
	writeJSON(w, http.StatusOK, out)
}

func (s *Server) apiProjectCreate(w http.ResponseWriter, r *http.Request) {
	m, err := readJSONObject(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	delete(m, "version")
	in, err := decodeProject(m, s.codeTables(r))
	if err != nil {
		s.fail(w, r, err)
		return
	}
	p, err := s.store.CreateProject(r.Context(), in.project())
	if err != nil {
		s.fail(w, r, err)
		return
	}
	s.writeProject(w, r, http.StatusCreated, p)
}

func (s *Server) writeProject(w http.ResponseWriter, r *http.Request, status int, p store.Project) {
	pj, err := projectOut(p)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	w.Header().Set("Location", fmt.Sprintf("/api/v1/projects/%d", p.ID))
	writeJSON(w, status, pj)
}

func (s *Server) apiProject(w http.ResponseWriter, r *http.Request) {
	p, _ := projectOf(r)
	s.writeProject(w, r, http.StatusOK, p)
}

func (s *Server) apiProjectPatch(w http.ResponseWriter, r *http.Request) {
	p, _ := projectOf(r)
	patch, err := readPatch(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	cur, err := projectOut(p)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	m := mergePatch(jsonMap(cur), patch)
	in, err := decodeProject(m, s.codeTables(r))
	if err != nil {
		s.fail(w, r, err)
		return
	}
	if msg := versionProblem(in.Version); msg != "" {
		s.fail(w, r, Invalid(field.Error{Field: "version", Message: msg}))
		return
	}
	row := in.project()
	row.ID, row.Version = p.ID, *in.Version
	saved, err := s.store.UpdateProject(r.Context(), row)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	s.writeProject(w, r, http.StatusOK, saved)
}

func (s *Server) apiProjectDelete(w http.ResponseWriter, r *http.Request) {
	p, _ := projectOf(r)
	if err := s.store.DeleteProject(r.Context(), p.ID); err != nil {
		if errors.Is(err, store.ErrNotFound) {
			err = NotFound("project")
		}
		s.fail(w, r, err)
		return
	}
	w.WriteHeader(http.StatusNoContent)
}
