package handlers

import (
	"bytes"
	"context"
	"fmt"
	"io"
	"mime/multipart"
	"net/http"
	"net/http/httptest"
	"sort"
	"strconv"
	"strings"
	"testing"

	"github.com/go-chi/chi/v5"

	"lagwright/demo"
	"lagwright/store"
	"lagwright/store/storetest"
)

// A route of the router, as chi.Walk gives it.
type route struct{ method, path string }

// walkRoutes lists every registered route, sorted.
func walkRoutes(t *testing.T, s *Server) []route {
	t.Helper()
	var out []route
	err := chi.Walk(s.router(), func(method, path string, _ http.Handler, _ ...func(http.Handler) http.Handler) error {
		out = append(out, route{method, strings.ReplaceAll(path, "/*/", "/")})
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	sort.Slice(out, func(i, j int) bool {
		if out[i].path != out[j].path {
			return out[i].path < out[j].path
		}
		return out[i].method < out[j].method
	})
	return out
}

// routeIDs are the values put in a route's parameters.
type routeIDs struct {
	project, line int64
	slug, jacket  string
	job           string
}

// fillRoute puts real values into a route pattern's parameters.
func fillRoute(pattern string, ids routeIDs) string {
	jacket := ids.jacket
	if jacket == "" {
		jacket = ids.slug
	}
	r := strings.NewReplacer("{id}", strconv.FormatInt(ids.project, 10), "{line}", strconv.FormatInt(ids.line, 10),
		"{job}", ids.job, "/*", "/app.css")
	out := r.Replace(pattern)
	if strings.HasPrefix(pattern, "/jackets/") || strings.Contains(pattern, "/jackets/") {
		return strings.ReplaceAll(out, "{slug}", jacket)
	}
	return strings.ReplaceAll(out, "{slug}", ids.slug)
}

// fixture is a database with the demo project, a custom material and a custom jacket.
func fixture(t *testing.T, st *store.Store, h http.Handler) routeIDs {
	t.Helper()
	ctx := context.Background()
	p, err := demo.Create(ctx, st)
	if err != nil {
		t.Fatal(err)
	}
	lines, err := st.Lines(ctx, p.ID)
	if err != nil || len(lines) == 0 {
		t.Fatal(err)
	}
	hdr := map[string]string{"Content-Type": "application/json"}
	if rec := do(t, h, "POST", "/api/v1/materials", strings.NewReader(`{"slug":"walk_foam","name":"Walk foam","category":"foam",
		"k_points":[[0,0.03],[100,0.04]],"min_temp_c":-40,"max_temp_c":120,"thicknesses_mm":[25,50],"max_layer_mm":100,"source":"test data sheet"}`), hdr); rec.Code != http.StatusCreated {
		t.Fatalf("create material: %d %s", rec.Code, rec.Body)
	}
	if rec := do(t, h, "POST", "/api/v1/jackets", strings.NewReader(`{"slug":"walk_jacket","name":"Walk jacket","emittance":0.8,"source":"test data sheet"}`), hdr); rec.Code != http.StatusCreated {
		t.Fatalf("create jacket: %d %s", rec.Code, rec.Body)
	}
	return routeIDs{project: p.ID, line: lines[0].ID, slug: "walk_foam", jacket: "walk_jacket", job: "import:" + strconv.FormatInt(p.ID, 10)}
}

func isExport(path string) bool {
	return strings.HasSuffix(path, ".csv") || strings.HasSuffix(path, ".xlsx") || strings.HasSuffix(path, ".pdf")
}

// Every GET route answers with the security headers (pages and exports alike), and no
// GET route fails with a 5xx on good ids.
func TestEveryGETRouteHasSecurityHeaders(t *testing.T) {
	st := storetest.NewDB(t)
	s, logs := newServer(t, st)
	h := s.Routes()
	ids := fixture(t, st, h)
	want := map[string]string{
		"Content-Security-Policy": contentSecurityPolicy,
		"X-Content-Type-Options":  "nosniff",
		"Referrer-Policy":         "same-origin",
		"X-Frame-Options":         "DENY",
	}
	n, pages, exports := 0, 0, 0
	for _, rt := range walkRoutes(t, s) {
		if rt.method != http.MethodGet {
			continue
		}
		n++
		target := fillRoute(rt.path, ids)
		rec := do(t, h, "GET", target, nil, nil)
		if rec.Code >= 500 {
			t.Errorf("GET %s = %d\n%s", target, rec.Code, logs)
		}
		for k, v := range want {
			if got := rec.Header().Get(k); got != v {
				t.Errorf("GET %s: %s = %q, want %q", target, k, got, v)
			}
		}
		if rec.Code == http.StatusOK {
			ct := rec.Header().Get("Content-Type")
			switch {
			case strings.HasPrefix(ct, "text/html"):
				pages++
			case isExport(rt.path):
				exports++
			}
		}
	}
	if n < 30 || pages < 20 {
		t.Errorf("walked %d GET routes, %d HTML pages: the walk missed the router", n, pages)
	}
	t.Logf("%d GET routes: %d HTML pages with 200, %d exports with 200", n, pages, exports)
}

// Every unsafe route refuses a cross-origin request (403) and changes nothing; a
// same-origin request passes the check (any answer but that 403).
func TestEveryUnsafeRouteRefusesCrossOrigin(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	ids := fixture(t, st, h)
	before, _ := st.Lines(context.Background(), ids.project)

	n := 0
	for _, rt := range walkRoutes(t, s) {
		if safeMethod(rt.method) {
			continue
		}
		n++
		target := fillRoute(rt.path, ids)
		for _, hdr := range []map[string]string{
			{"Origin": "http://evil.example", "Sec-Fetch-Site": "cross-site", "Content-Type": "application/x-www-form-urlencoded"},
			{"Origin": "http://evil.example", "Content-Type": "application/json"},
			{"Sec-Fetch-Site": "cross-site", "Content-Type": "multipart/form-data; boundary=x"},
		} {
			rec := do(t, h, rt.method, target, strings.NewReader("name=x&tag=x"), hdr)
			if rec.Code != http.StatusForbidden || !strings.Contains(rec.Body.String(), "Cross-origin request refused.") {
				t.Errorf("%s %s cross-origin %v = %d, want 403", rt.method, target, hdr, rec.Code)
			}
		}
	}
	if n < 25 {
		t.Errorf("walked only %d unsafe routes", n)
	}
	after, _ := st.Lines(context.Background(), ids.project)
	if len(after) != len(before) {
		t.Errorf("cross-origin requests changed the line list: %d → %d lines", len(before), len(after))
	}
	// The same request from the same origin gets past the check.
	rec := do(t, h, "POST", fmt.Sprintf("/projects/%d/lines/%d/duplicate", ids.project, ids.line), nil,
		map[string]string{"Origin": "http://example.com", "Sec-Fetch-Site": "same-origin"})
	if rec.Code == http.StatusForbidden {
		t.Errorf("same-origin POST refused: %d", rec.Code)
	}
}

// Uploads over the body limit get 413 whether the length is declared or not, and every
// unsafe route gets 413 for a declared length over the limit.
func TestBodyLimitOnUploads(t *testing.T) {
	st := storetest.NewDB(t)
	s, logs := newServer(t, st)
	h := s.Routes()
	ids := fixture(t, st, h)
	s.cfg.MaxBodyBytes = 4 << 10
	before, _ := st.Lines(context.Background(), ids.project)
	nLines := len(before)

	big := strings.Repeat("TAG,service\n", 1000) // 12 000 bytes
	var mp bytes.Buffer
	mw := multipart.NewWriter(&mp)
	fw, _ := mw.CreateFormFile("file", "lines.csv")
	_, _ = io.WriteString(fw, big)
	_ = mw.Close()

	uploads := []struct {
		name, path, ctype string
		body              []byte
	}{
		{"import page, multipart file", fmt.Sprintf("/projects/%d/import", ids.project), mw.FormDataContentType(), mp.Bytes()},
		{"import commit, form", fmt.Sprintf("/projects/%d/import/commit", ids.project), "application/x-www-form-urlencoded", []byte("text=" + big)},
		{"import API, CSV", fmt.Sprintf("/api/v1/projects/%d/import", ids.project), "text/csv", []byte(big)},
		{"calc API, JSON", "/api/v1/calc", "application/json", []byte(`{"x":"` + big + `"}`)},
	}
	for _, u := range uploads {
		for _, chunked := range []bool{false, true} {
			t.Run(fmt.Sprintf("%s chunked=%v", u.name, chunked), func(t *testing.T) {
				req := httptest.NewRequest("POST", u.path, io.MultiReader(bytes.NewReader(u.body)))
				req.Header.Set("Content-Type", u.ctype)
				req.ContentLength = int64(len(u.body))
				if chunked {
					req.ContentLength = -1 // unknown length: the limit trips while reading
				}
				rec := httptest.NewRecorder()
				h.ServeHTTP(rec, req)
				if rec.Code != http.StatusRequestEntityTooLarge {
					t.Errorf("status %d, want 413\n%s", rec.Code, logs)
				}
				if lines, _ := st.Lines(context.Background(), ids.project); len(lines) != nLines {
					t.Errorf("an oversized upload changed the lines: %d → %d", nLines, len(lines))
				}
			})
		}
	}
	for _, rt := range walkRoutes(t, s) {
		if safeMethod(rt.method) {
			continue
		}
		target := fillRoute(rt.path, ids)
		req := httptest.NewRequest(rt.method, target, strings.NewReader(big))
		req.Header.Set("Content-Type", "application/x-www-form-urlencoded")
		rec := httptest.NewRecorder()
		h.ServeHTTP(rec, req)
		if rec.Code != http.StatusRequestEntityTooLarge {
			t.Errorf("%s %s with %d declared bytes = %d, want 413", rt.method, target, len(big), rec.Code)
		}
	}
}
