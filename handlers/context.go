package handlers

import (
	"context"
	"errors"
	"net/http"
	"sync"

	"github.com/go-chi/chi/v5"

	"lagwright/analysis"
	"lagwright/results"
	"lagwright/store"
	"lagwright/units"
)

// What the middleware loads once per request and puts in its context, so handlers
// receive it ready: the library (lazily), the project of /projects/{id}/… and the
// line of …/lines/{line}/… (both 404 before any handler runs).

// ctxKey keys the request context's values.
type ctxKey int

const (
	libraryKey ctxKey = iota
	projectKey
	lineKey
)

// oneLibrary lets a request read the materials and jackets at most once, when it
// first needs them (s.library), however many steps of it resolve a slug.
func (s *Server) oneLibrary(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		load := sync.OnceValues(func() (*store.Library, error) { return s.store.Library(r.Context()) })
		next.ServeHTTP(w, r.WithContext(context.WithValue(r.Context(), libraryKey, load)))
	})
}

// library is the request's library, read once (oneLibrary); outside a request (a
// background import) it is read from the store.
func (s *Server) library(ctx context.Context) (*store.Library, error) {
	if load, ok := ctx.Value(libraryKey).(func() (*store.Library, error)); ok {
		return load()
	}
	return s.store.Library(ctx)
}

// projectScope is the project of the route with its decoded settings.
type projectScope struct {
	p   store.Project
	set analysis.ProjectSettings
}

// withProject loads the project named by {id} with its settings (404 when there is
// no such project).
func (s *Server) withProject(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		id, err := parseID(chi.URLParam(r, "id"))
		if err != nil || id <= 0 {
			s.fail(w, r, NotFound("project"))
			return
		}
		p, err := s.store.Project(r.Context(), id)
		if errors.Is(err, store.ErrNotFound) {
			err = NotFound("project")
		}
		if err != nil {
			s.fail(w, r, err)
			return
		}
		set, err := results.Settings(p)
		if err != nil {
			s.fail(w, r, err)
			return
		}
		next.ServeHTTP(w, r.WithContext(context.WithValue(r.Context(), projectKey, &projectScope{p: p, set: set})))
	})
}

// withLine loads the line named by {line} in the route's project (404 when the
// project has no such line). It hangs below withProject.
func (s *Server) withLine(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		p, _ := projectOf(r)
		id, err := parseID(chi.URLParam(r, "line"))
		if err != nil || id <= 0 {
			s.fail(w, r, NotFound("line"))
			return
		}
		l, err := s.store.Line(r.Context(), p.ID, id)
		if errors.Is(err, store.ErrNotFound) {
			err = NotFound("line")
		}
		if err != nil {
			s.fail(w, r, err)
			return
		}
		next.ServeHTTP(w, r.WithContext(context.WithValue(r.Context(), lineKey, l)))
	})
}

// projectOf is the project of the route and its settings (withProject).
func projectOf(r *http.Request) (store.Project, analysis.ProjectSettings) {
	ps, ok := r.Context().Value(projectKey).(*projectScope)
	if !ok {
		panic("handlers: projectOf outside a /projects/{id} route")
	}
	return ps.p, ps.set
}

// systemOf is the unit system of the route's project.
func systemOf(r *http.Request) units.System {
	p, _ := projectOf(r)
	return units.System(p.Units)
}

// lineOf is the stored line of the route (withLine); the zero Line on a route
// without {line}.
func lineOf(r *http.Request) store.Line {
	l, _ := r.Context().Value(lineKey).(store.Line)
	return l
}

// projectLines loads the route's project's lines with fresh answers (results.Project).
func (s *Server) projectLines(r *http.Request) ([]results.Line, error) {
	p, set := projectOf(r)
	lib, err := s.library(r.Context())
	if err != nil {
		return nil, err
	}
	return s.results.Project(r.Context(), p, set, lib)
}
