package handlers

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"log/slog"
	"net/http"
	"net/http/httptest"
	"strings"
	"sync"
	"testing"

	"github.com/jackc/pgx/v5/pgconn"

	"lagwright/field"
	"lagwright/store"
	"lagwright/store/storetest"
)

func TestMain(m *testing.M) { storetest.Main(m) }

// logBuffer collects log output safely across goroutines.
type logBuffer struct {
	mu sync.Mutex
	b  bytes.Buffer
}

func (l *logBuffer) Write(p []byte) (int, error) {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.b.Write(p)
}

func (l *logBuffer) String() string {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.b.String()
}

func newServer(t *testing.T, st *store.Store) (*Server, *logBuffer) {
	t.Helper()
	logs := &logBuffer{}
	s, err := New(st, slog.New(slog.NewTextHandler(logs, &slog.HandlerOptions{Level: slog.LevelDebug})), Config{Version: "test"})
	if err != nil {
		t.Fatal(err)
	}
	return s, logs
}

func do(t *testing.T, h http.Handler, method, target string, body io.Reader, header map[string]string) *httptest.ResponseRecorder {
	t.Helper()
	req := httptest.NewRequest(method, target, body)
	for k, v := range header {
		req.Header.Set(k, v)
	}
	rec := httptest.NewRecorder()
	h.ServeHTTP(rec, req)
	return rec
}

func TestHealthAndReady(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()

	for _, tc := range []struct {
		path, body string
		status     int
	}{
		{"/healthz", "ok", 200},
		{"/readyz", "ok", 200},
	} {
		rec := do(t, h, "GET", tc.path, nil, nil)
		if rec.Code != tc.status || rec.Body.String() != tc.body {
			t.Errorf("GET %s = %d %q, want %d %q", tc.path, rec.Code, rec.Body, tc.status, tc.body)
		}
	}

	st.Close() // the database goes away
	if rec := do(t, h, "GET", "/readyz", nil, nil); rec.Code != http.StatusServiceUnavailable {
		t.Errorf("GET /readyz with the store closed = %d, want 503", rec.Code)
	}
	if rec := do(t, h, "GET", "/healthz", nil, nil); rec.Code != http.StatusOK {
		t.Errorf("GET /healthz with the store closed = %d, want 200 (liveness ignores the database)", rec.Code)
	}
	rec := do(t, h, "GET", "/", nil, nil)
	if rec.Code != http.StatusOK || !strings.Contains(rec.Body.String(), "not answering") {
		t.Errorf("home with the store closed = %d, want 200 saying the database is not answering", rec.Code)
	}
}

func TestHomeAndLayout(t *testing.T) {
	s, _ := newServer(t, storetest.NewDB(t))
	rec := do(t, s.Routes(), "GET", "/", nil, nil)
	if rec.Code != http.StatusOK {
		t.Fatalf("GET / = %d", rec.Code)
	}
	body := rec.Body.String()
	for _, want := range []string{
		`<title>Lagwright</title>`,
		`href="/projects"`, `href="/materials"`,
		`Estimates by published methods; adopted codes and a licensed engineer govern.`,
		`<link rel="stylesheet" href="` + s.assets.url("app.css") + `">`,
		`src="` + s.assets.url("htmx.min.js") + `"`,
		`integrity="sha384-`, ` defer`,
		`data-testid="db-status">Database: <span class="status-ok">ready`,
	} {
		if !strings.Contains(body, want) {
			t.Errorf("home page lacks %q", want)
		}
	}
	if strings.Contains(body, "<script>") || strings.Contains(body, "<style") {
		t.Error("home page has an inline script or style (forbidden by our CSP)")
	}
}

func TestSecurityHeadersAndCrossOrigin(t *testing.T) {
	s, _ := newServer(t, storetest.NewDB(t))
	h := s.Routes()

	rec := do(t, h, "GET", "/healthz", nil, nil)
	for k, want := range map[string]string{
		"Content-Security-Policy": "default-src 'self'; img-src 'self' data:; style-src 'self'; script-src 'self'; frame-ancestors 'none'; base-uri 'self'; form-action 'self'",
		"X-Content-Type-Options":  "nosniff",
		"Referrer-Policy":         "same-origin",
	} {
		if got := rec.Header().Get(k); got != want {
			t.Errorf("%s = %q, want %q", k, got, want)
		}
	}

	for _, tc := range []struct {
		name   string
		header map[string]string
		status int
	}{
		{"cross-site by Sec-Fetch-Site", map[string]string{"Origin": "http://evil.example", "Sec-Fetch-Site": "cross-site"}, http.StatusForbidden},
		{"cross-origin by Origin only", map[string]string{"Origin": "http://evil.example"}, http.StatusForbidden},
		{"same-origin passes to the router", map[string]string{"Origin": "http://example.com", "Sec-Fetch-Site": "same-origin"}, http.StatusMethodNotAllowed},
		{"no browser headers (curl) passes", nil, http.StatusMethodNotAllowed},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rec := do(t, h, "POST", "/", strings.NewReader("x=1"), tc.header)
			if rec.Code != tc.status {
				t.Errorf("POST / = %d, want %d", rec.Code, tc.status)
			}
			if rec.Header().Get("X-Content-Type-Options") != "nosniff" {
				t.Error("security headers missing on the refusal")
			}
		})
	}
	// A cross-site GET is safe and allowed.
	if rec := do(t, h, "GET", "/healthz", nil, map[string]string{"Origin": "http://evil.example", "Sec-Fetch-Site": "cross-site"}); rec.Code != 200 {
		t.Errorf("cross-site GET = %d, want 200", rec.Code)
	}
}

func TestStaticAssets(t *testing.T) {
	s, _ := newServer(t, storetest.NewDB(t))
	h := s.Routes()
	for _, tc := range []struct {
		target, contentType, cache string
		status                     int
	}{
		{s.assets.url("app.css"), "text/css; charset=utf-8", "public, max-age=31536000, immutable", 200},
		{s.assets.url("htmx.min.js"), "text/javascript; charset=utf-8", "public, max-age=31536000, immutable", 200},
		{"/static/app.css?v=old", "text/css; charset=utf-8", "no-cache", 200},
		{"/static/nothing.css", "text/html; charset=utf-8", "no-store", 404},
		{"/static/", "text/html; charset=utf-8", "no-store", 404},
		{"/static/../static.go", "text/html; charset=utf-8", "no-store", 404},
	} {
		rec := do(t, h, "GET", tc.target, nil, nil)
		if rec.Code != tc.status || rec.Header().Get("Content-Type") != tc.contentType || rec.Header().Get("Cache-Control") != tc.cache {
			t.Errorf("GET %s = %d %q %q, want %d %q %q", tc.target, rec.Code,
				rec.Header().Get("Content-Type"), rec.Header().Get("Cache-Control"), tc.status, tc.contentType, tc.cache)
		}
	}
}

func TestFailMapping(t *testing.T) {
	s, logs := newServer(t, nil)
	for _, tc := range []struct {
		name    string
		err     error
		status  int
		message string
		logged  bool
	}{
		{"not found", NotFound("project"), 404, "No such project.", false},
		{"store not found", fmt.Errorf("load: %w", store.ErrNotFound), 404, "Not found.", false},
		{"version conflict", store.ErrConflict, 409, "Someone else changed this meanwhile; reload and try again.", false},
		{"unique", fmt.Errorf("insert: %w", &pgconn.PgError{Code: "23505", Message: "duplicate key value violates unique constraint \"lines_project_id_tag_key\""}), 409, "That name or tag is already taken.", false},
		{"in use", &pgconn.PgError{Code: "23503"}, 409, "It is in use elsewhere, or refers to something missing.", false},
		{"statement timeout", &pgconn.PgError{Code: "57014"}, 503, "The database is busy or unavailable; try again shortly.", true},
		{"deadline", context.DeadlineExceeded, 503, "The database did not answer in time; try again shortly.", true},
		{"invalid", Invalid(field.Error{Field: "name", Message: "must not be empty"}), 422, "must not be empty", false},
		{"internal", errors.New("secret detail xyzzy"), 500, "Something went wrong on our side; it has been logged.", true},
	} {
		t.Run(tc.name, func(t *testing.T) {
			before := len(logs.String())
			for _, api := range []bool{true, false} {
				target := "/projects/1"
				if api {
					target = "/api/v1/projects/1"
				}
				rec := httptest.NewRecorder()
				s.fail(rec, httptest.NewRequest("GET", target, nil), tc.err)
				if rec.Code != tc.status {
					t.Errorf("api=%v: status = %d, want %d", api, rec.Code, tc.status)
				}
				body := rec.Body.String()
				if strings.Contains(body, "xyzzy") || strings.Contains(body, "lines_project_id_tag_key") {
					t.Errorf("api=%v: the response shows the error's text: %s", api, body)
				}
				if api {
					var got struct {
						Errors []field.Error `json:"errors"`
					}
					if err := json.Unmarshal(rec.Body.Bytes(), &got); err != nil || len(got.Errors) != 1 || got.Errors[0].Message != tc.message {
						t.Errorf("api: body = %s, want one error %q", body, tc.message)
					}
				} else if !strings.Contains(body, tc.message) || !strings.Contains(body, "<html") {
					t.Errorf("page: body lacks %q in an HTML page", tc.message)
				}
			}
			if logged := len(logs.String()) > before; logged != tc.logged {
				t.Errorf("logged = %v, want %v", logged, tc.logged)
			}
		})
	}
	// Accept: application/json outside /api/ also gets JSON, with the field named.
	rec := httptest.NewRecorder()
	req := httptest.NewRequest("POST", "/projects", nil)
	req.Header.Set("Accept", "application/json")
	s.fail(rec, req, Invalid(field.Error{Field: "layers[0].thickness_mm", Message: "must be greater than 0"}))
	if want := `{"errors":[{"field":"layers[0].thickness_mm","message":"must be greater than 0"}]}` + "\n"; rec.Body.String() != want {
		t.Errorf("JSON body = %s, want %s", rec.Body, want)
	}
}

func TestPanicRecovery(t *testing.T) {
	s, logs := newServer(t, nil)
	h := s.logRequests(s.recoverPanics(http.HandlerFunc(func(http.ResponseWriter, *http.Request) { panic("boom at line 7") })))
	rec := do(t, h, "GET", "/x", nil, nil)
	if rec.Code != 500 || strings.Contains(rec.Body.String(), "boom") {
		t.Errorf("panic answered %d %q, want 500 without the panic text", rec.Code, rec.Body)
	}
	if !strings.Contains(logs.String(), "boom at line 7") || !strings.Contains(logs.String(), "goroutine") {
		t.Error("panic not logged with its stack")
	}
}

func TestBodyLimit(t *testing.T) {
	s, _ := newServer(t, nil)
	s.cfg.MaxBodyBytes = 100
	h := s.limitBody(http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		if _, err := io.ReadAll(r.Body); err != nil {
			s.fail(w, r, err)
			return
		}
		w.WriteHeader(http.StatusNoContent)
	}))
	for _, tc := range []struct {
		name    string
		size    int
		chunked bool
		status  int
	}{
		{"under", 100, false, 204},
		{"over, declared", 101, false, 413},
		{"over, chunked", 101, true, 413},
	} {
		body := io.Reader(strings.NewReader(strings.Repeat("a", tc.size)))
		if tc.chunked {
			body = io.MultiReader(body) // hides the length: no Content-Length
		}
		req := httptest.NewRequest("POST", "/api/v1/x", body)
		if tc.chunked {
			req.ContentLength = -1
		}
		rec := httptest.NewRecorder()
		h.ServeHTTP(rec, req)
		if rec.Code != tc.status {
			t.Errorf("%s: status = %d, want %d", tc.name, rec.Code, tc.status)
		}
	}
}
