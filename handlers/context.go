package handlers

import (
	"context"
	"net/http"
	"sync"

	"lagwright/analysis"
	"lagwright/results"
	"lagwright/store"
)

// ctxKey keys what the middleware puts in a request's context.
type ctxKey int

const libraryKey ctxKey = iota

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

// projectLines loads a project's lines with fresh answers (results.Project), with the
// project's settings and the request's library.
func (s *Server) projectLines(ctx context.Context, p store.Project) (analysis.ProjectSettings, []results.Line, error) {
	set, err := results.Settings(p)
	if err != nil {
		return set, nil, err
	}
	lib, err := s.library(ctx)
	if err != nil {
		return set, nil, err
	}
	lines, err := s.results.Project(ctx, p, set, lib)
	return set, lines, err
}
