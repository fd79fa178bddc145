package handlers

import (
	"context"
	"net/http"
	"time"
)

// healthz: the process is up (liveness). It does not touch the database.
func (s *Server) healthz(w http.ResponseWriter, r *http.Request) {
	w.Header().Set("Content-Type", "text/plain; charset=utf-8")
	w.Header().Set("Cache-Control", "no-store")
	_, _ = w.Write([]byte("ok"))
}

// readyTimeout bounds the database check of /readyz.
const readyTimeout = 2 * time.Second

// readyz: the database answers within readyTimeout (readiness), else 503.
func (s *Server) readyz(w http.ResponseWriter, r *http.Request) {
	w.Header().Set("Content-Type", "text/plain; charset=utf-8")
	w.Header().Set("Cache-Control", "no-store")
	if err := s.dbReady(r.Context()); err != nil {
		s.log.WarnContext(r.Context(), "not ready", "err", err)
		w.WriteHeader(http.StatusServiceUnavailable)
		_, _ = w.Write([]byte("database unavailable"))
		return
	}
	_, _ = w.Write([]byte("ok"))
}

func (s *Server) dbReady(ctx context.Context) error {
	ctx, cancel := context.WithTimeout(ctx, readyTimeout)
	defer cancel()
	return s.store.Ping(ctx)
}
