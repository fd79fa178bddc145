package handlers

import (
	"errors"
	"fmt"
	"io"
	"net"
	"net/http"
	"os"
	"runtime/debug"
	"time"
)

// contentSecurityPolicy allows our own scripts and styles only: no inline script.
const contentSecurityPolicy = "default-src 'self'; img-src 'self' data:; style-src 'self'; script-src 'self'; " +
	"frame-ancestors 'none'; base-uri 'self'; form-action 'self'"

func securityHeaders(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		h := w.Header()
		h.Set("Content-Security-Policy", contentSecurityPolicy)
		h.Set("X-Content-Type-Options", "nosniff")
		h.Set("Referrer-Policy", "same-origin")
		h.Set("X-Frame-Options", "DENY")
		next.ServeHTTP(w, r)
	})
}

// headAsGet answers HEAD with the GET route (status and headers; the server sends no
// body for a HEAD request, whatever the handler writes), so monitors and link
// checkers may HEAD /healthz, /readyz and every page.
func headAsGet(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		if r.Method == http.MethodHead {
			r = r.WithContext(r.Context()) // a copy: the server keeps its own request
			r.Method = http.MethodGet
		}
		next.ServeHTTP(w, r)
	})
}

// limitBody refuses bodies over the limit: at once when Content-Length says so,
// else when the handler reads past it (the read fails with *http.MaxBytesError,
// which fail answers with 413).
func (s *Server) limitBody(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		if r.ContentLength > s.cfg.MaxBodyBytes {
			s.fail(w, r, &http.MaxBytesError{Limit: s.cfg.MaxBodyBytes})
			return
		}
		r.Body = bodyErrors{http.MaxBytesReader(w, r.Body, s.cfg.MaxBodyBytes)}
		next.ServeHTTP(w, r)
	})
}

// bodyReadError is a failure to read the request body: the client's side (a body
// sent too slowly for the server's read timeout, or a connection that broke off),
// never the database's; fail answers it 408 or 400.
type bodyReadError struct{ err error }

func (e *bodyReadError) Error() string { return "read request body: " + e.err.Error() }
func (e *bodyReadError) Unwrap() error { return e.err }

func (e *bodyReadError) timeout() bool {
	var ne net.Error
	return errors.Is(e.err, os.ErrDeadlineExceeded) || (errors.As(e.err, &ne) && ne.Timeout())
}

// bodyErrors marks the body's read errors as bodyReadError (the size limit's
// *http.MaxBytesError and io.EOF pass as they are).
type bodyErrors struct{ io.ReadCloser }

func (b bodyErrors) Read(p []byte) (int, error) {
	n, err := b.ReadCloser.Read(p)
	var tooLarge *http.MaxBytesError
	if err != nil && err != io.EOF && !errors.As(err, &tooLarge) {
		err = &bodyReadError{err}
	}
	return n, err
}

// recoverPanics turns a panic into a logged internal error (500), like chi's
// Recoverer, but through our one error exit.
func (s *Server) recoverPanics(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		defer func() {
			rec := recover()
			if rec == nil {
				return
			}
			if rec == http.ErrAbortHandler {
				panic(rec) // the server's own signal to drop the connection
			}
			s.log.ErrorContext(r.Context(), "panic", "method", r.Method, "path", r.URL.Path, "panic", rec, "stack", string(debug.Stack()))
			if sw, ok := w.(*statusWriter); !ok || sw.status == 0 {
				s.fail(w, r, fmt.Errorf("panic: %v", rec))
			}
		}()
		next.ServeHTTP(w, r)
	})
}

// statusWriter records the status for the request log.
type statusWriter struct {
	http.ResponseWriter
	status int
	bytes  int
}

func (w *statusWriter) WriteHeader(code int) {
	if w.status == 0 {
		w.status = code
	}
	w.ResponseWriter.WriteHeader(code)
}

func (w *statusWriter) Write(b []byte) (int, error) {
	if w.status == 0 {
		w.status = http.StatusOK
	}
	n, err := w.ResponseWriter.Write(b)
	w.bytes += n
	return n, err
}

// Unwrap lets http.ResponseController reach the real writer (Flush, deadlines).
func (w *statusWriter) Unwrap() http.ResponseWriter { return w.ResponseWriter }

func (s *Server) logRequests(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		t0 := time.Now()
		sw := &statusWriter{ResponseWriter: w}
		next.ServeHTTP(sw, r)
		s.log.DebugContext(r.Context(), "request", "method", r.Method, "path", r.URL.Path,
			"status", sw.status, "bytes", sw.bytes, "elapsed", time.Since(t0))
	})
}
