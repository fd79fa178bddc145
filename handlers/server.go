// Package handlers holds the HTTP side of Lagwright: chi routes for pages, htmx
// fragments, the JSON API and exports. Handlers parse and validate input, call
// store, schedule and calc, and render web components. No SQL, no physics.
package handlers

import (
	"fmt"
	"log/slog"
	"net/http"

	"github.com/go-chi/chi/v5"

	"lagwright/results"
	"lagwright/store"
)

// Config holds the settings of the HTTP side.
type Config struct {
	// Version is shown on the home page.
	Version string
	// MaxBodyBytes limits request bodies; 0 means DefaultMaxBodyBytes.
	MaxBodyBytes int64
	// TrustedOrigins are origins (scheme://host[:port]) allowed to make unsafe
	// cross-origin requests, e.g. the public origin behind a reverse proxy that
	// rewrites Host.
	TrustedOrigins []string
	// Auth: accounts, sessions and roles (auth.go).
	Auth AuthConfig
}

// DefaultMaxBodyBytes is the request body limit unless Config says otherwise.
const DefaultMaxBodyBytes = 10 << 20

// Server holds what every handler needs. Build it with New.
type Server struct {
	store *store.Store
	// results reads every line's answer, recomputing only stale ones (package results).
	results *results.Results
	log     *slog.Logger
	cfg     Config
	assets  *assets
	cop     *http.CrossOriginProtection
	// runner runs background jobs (imports) from the database's queue (import_job.go).
	runner *jobRunner
	// tableCache keeps rendered project line tables under keys read from the
	// database, so repeated views of an unchanged project skip decoding and rendering.
	tableCache *tableCache
}

// New builds a Server.
func New(st *store.Store, log *slog.Logger, cfg Config) (*Server, error) {
	if cfg.MaxBodyBytes <= 0 {
		cfg.MaxBodyBytes = DefaultMaxBodyBytes
	}
	a, err := loadAssets()
	if err != nil {
		return nil, fmt.Errorf("handlers: %w", err)
	}
	cop := http.NewCrossOriginProtection()
	for _, o := range cfg.TrustedOrigins {
		if err := cop.AddTrustedOrigin(o); err != nil {
			return nil, fmt.Errorf("handlers: trusted origin: %w", err)
		}
	}
	s := &Server{store: st, results: results.New(st), log: log, cfg: cfg, assets: a, cop: cop, tableCache: newTableCache(tableCacheBytes)}
	s.runner = newJobRunner(s)
	cop.SetDenyHandler(http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		s.fail(w, r, &Error{Code: CodeForbidden, Message: "Cross-origin request refused."})
	}))
	return s, nil
}

// Routes returns the application's handler with every route and safety layer:
// request logging, panic recovery, security headers, cross-origin protection for
// unsafe methods (403), and the request body limit.
func (s *Server) Routes() http.Handler {
	return s.logRequests(s.recoverPanics(securityHeaders(s.cop.Handler(s.router()))))
}

// router is the chi router of every route, without the outer safety layers.
func (s *Server) router() *chi.Mux {
	r := chi.NewRouter()
	r.Use(headAsGet)
	r.Use(s.limitBody)
	r.Use(s.authenticate)
	r.Use(s.readForm)
	r.Use(s.oneLibrary)
	r.NotFound(func(w http.ResponseWriter, r *http.Request) { s.fail(w, r, NotFound("page")) })
	r.MethodNotAllowed(func(w http.ResponseWriter, r *http.Request) {
		s.fail(w, r, &Error{Code: CodeMethodNotAllowed, Message: "This address does not accept " + r.Method + " requests."})
	})

	r.Get("/healthz", s.healthz)
	r.Get("/readyz", s.readyz)
	r.Get("/static/*", s.static)
	r.Get("/login", s.loginPage)
	r.Post("/login", s.login)
	r.Post("/logout", s.logout)
	r.Get("/", s.home)
	s.mountPages(r)
	r.Route("/api/v1", s.mountAPI)
	return r
}

// mountPages mounts the screens as a tree. A route under /projects/{id} finds its
// project (with settings) in the request context, loaded once by withProject (404
// early); one under /projects/{id}/lines/{line} its line too (withLine). Each area
// adds its routes relative to the node they hang on, in routes_<area>.go.
func (s *Server) mountPages(r chi.Router) {
	s.projectListPages(r)
	s.materialPages(r)
	r.Route("/projects/{id}", func(r chi.Router) {
		r.Use(s.withProject)
		s.projectPages(r)
		s.schedulePages(r)
		s.importPages(r)
		s.comparePages(r)
		r.Route("/lines/{line}", func(r chi.Router) {
			r.Use(s.withLine)
			s.linePages(r)
			s.scheduleLinePages(r)
			s.compareLinePages(r)
		})
	})
}

// mountAPI mounts the JSON API under /api/v1, with the same tree as the pages.
// Errors from API routes are answered as JSON by s.fail.
func (s *Server) mountAPI(r chi.Router) {
	r.Post("/calc", s.apiCalc)
	s.projectListAPI(r)
	s.materialAPI(r)
	s.codeTableAPI(r)
	s.importAPI(r)
	r.Route("/projects/{id}", func(r chi.Router) {
		r.Use(s.withProject)
		s.projectAPI(r)
		s.importProjectAPI(r)
		r.Route("/lines/{line}", func(r chi.Router) {
			r.Use(s.withLine)
			s.lineAPI(r)
		})
	})
}
