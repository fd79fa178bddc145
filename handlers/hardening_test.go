package handlers

import (
	"fmt"
	"io"
	"net"
	"net/http"
	"net/http/httptest"
	"net/url"
	"strings"
	"testing"
	"time"

	"lagwright/store/storetest"
)

// TestVersionsOutOfRange: versions and revision numbers are 32-bit integers in the
// database (PostgreSQL "integer", −2147483648 to +2147483647: PostgreSQL manual,
// Numeric Types); null, text, 0 or 2147483648 are refused with 422 naming the field (or
// answered 404/409), never a 500 or a panic.
func TestVersionsOutOfRange(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	p := createTestProject(t, st, "si")
	base := fmt.Sprintf("/api/v1/projects/%d", p.ID)
	code, m := getJSON(t, h, "POST", base+"/lines", steamLine)
	if code != 201 {
		t.Fatalf("create line = %d %v", code, m)
	}
	line := fmt.Sprintf("%s/lines/%v", base, m["id"])
	for _, target := range []string{base, line, "/api/v1/materials/x_custom", "/api/v1/jackets/x_jacket"} {
		for _, v := range []string{`null`, `"1"`, `0`, `-1`, `1.5`, `2147483648`, `99999999999999999999`} {
			rec := do(t, h, "PATCH", target, strings.NewReader(`{"version": `+v+`}`), map[string]string{"Content-Type": "application/json"})
			body := rec.Body.String()
			switch {
			case rec.Code >= 500:
				t.Errorf("PATCH %s version %s = %d %s", target, v, rec.Code, body)
			case rec.Code == 422 && !strings.Contains(body, `"field":"version"`):
				t.Errorf("PATCH %s version %s = 422 without naming version: %s", target, v, body)
			case rec.Code != 422 && rec.Code != 404:
				t.Errorf("PATCH %s version %s = %d, want 422 (or 404)", target, v, rec.Code)
			}
		}
	}
	pages := fmt.Sprintf("/projects/%d", p.ID)
	for _, target := range []string{pages + "/schedule", pages + "/schedule.csv", pages + "/schedule.xlsx", pages + "/schedule.pdf"} {
		for _, rev := range []string{"2147483648", "0", "+1", "01", "x"} {
			rec := do(t, h, "GET", target+"?rev="+rev, nil, nil)
			if rec.Code != 422 || !strings.Contains(rec.Body.String(), "rev") {
				t.Errorf("GET %s?rev=%s = %d, want 422 naming rev", target, rev, rec.Code)
			}
		}
	}
	// Forms that carry a version: a huge one is a stale or bad form, not a 500.
	for _, target := range []string{pages + "/edit", pages + "/costs", pages + "/lines/" + fmt.Sprint(m["id"])} {
		form := url.Values{"version": {"2147483648"}, "name": {"x"}}
		rec := do(t, h, "POST", target, strings.NewReader(form.Encode()), map[string]string{"Content-Type": "application/x-www-form-urlencoded"})
		if rec.Code >= 500 {
			t.Errorf("POST %s with version 2147483648 = %d", target, rec.Code)
		}
	}
}

// TestIDsCanonical: an id has one spelling; 0002, +1, 1.0 or " 1" is no address.
func TestIDsCanonical(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	p := createTestProject(t, st, "si")
	id := fmt.Sprint(p.ID)
	for _, path := range []string{"/projects/%s", "/projects/%s/edit", "/projects/%s/schedule", "/projects/%s/import", "/api/v1/projects/%s", "/projects/%s/costs"} {
		if rec := do(t, h, "GET", fmt.Sprintf(path, id), nil, nil); rec.Code != 200 {
			t.Fatalf("GET %s = %d", fmt.Sprintf(path, id), rec.Code)
		}
		for _, bad := range []string{"000" + id, "+" + id, id + ".0", "%20" + id, "9223372036854775808"} {
			target := fmt.Sprintf(path, bad)
			if rec := do(t, h, "GET", target, nil, nil); rec.Code != 404 {
				t.Errorf("GET %s = %d, want 404", target, rec.Code)
			}
		}
	}
}

// TestHead: HEAD answers like GET without a body, on health checks and pages
// (RFC 9110 §9.3.2: the same header fields as GET, no content).
func TestHead(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	srv := httptest.NewServer(s.Routes())
	t.Cleanup(srv.Close)
	p := createTestProject(t, st, "si")
	for _, path := range []string{"/healthz", "/readyz", "/", "/projects", fmt.Sprintf("/projects/%d", p.ID), "/materials", "/api/v1/projects"} {
		res, err := http.Head(srv.URL + path)
		if err != nil {
			t.Fatal(err)
		}
		body, _ := io.ReadAll(res.Body)
		res.Body.Close()
		if res.StatusCode != 200 || len(body) != 0 || res.Header.Get("Content-Type") == "" {
			t.Errorf("HEAD %s = %d, %d body bytes, type %q; want 200, empty, typed", path, res.StatusCode, len(body), res.Header.Get("Content-Type"))
		}
	}
}

// TestSlowBody: a body that arrives too slowly for the server's read timeout is the
// client's fault (408 Request Timeout, RFC 9110 §15.5.9: the server did not receive a
// complete request in time), not "the database is not answering"; one that breaks off
// is 400.
func TestSlowBody(t *testing.T) {
	st := storetest.NewDB(t)
	s, logs := newServer(t, st)
	srv := httptest.NewUnstartedServer(s.Routes())
	srv.Config.ReadTimeout = 500 * time.Millisecond
	srv.Start()
	t.Cleanup(srv.Close)
	send := func(path, ctype string, half string, total int) string {
		t.Helper()
		c, err := net.Dial("tcp", srv.Listener.Addr().String())
		if err != nil {
			t.Fatal(err)
		}
		defer c.Close()
		fmt.Fprintf(c, "POST %s HTTP/1.1\r\nHost: x\r\nContent-Type: %s\r\nContent-Length: %d\r\n\r\n%s", path, ctype, total, half)
		_ = c.SetReadDeadline(time.Now().Add(30 * time.Second))
		b, _ := io.ReadAll(c) // the server answers, then closes
		return string(b)
	}
	for _, tc := range []struct{ path, ctype, half string }{
		{"/api/v1/projects", "application/json", `{"name": "slo`},
		{"/api/v1/calc", "application/json", `{"geometry": "pi`},
		{"/projects", "application/x-www-form-urlencoded", `name=slo`},
	} {
		got := send(tc.path, tc.ctype, tc.half, 500)
		if !strings.HasPrefix(got, "HTTP/1.1 408") || !strings.Contains(got, "too slowly") {
			t.Errorf("slow body to %s: %.900q; want 408 saying it came too slowly", tc.path, got)
		}
	}
	if strings.Contains(logs.String(), "internal error") || strings.Contains(logs.String(), "unavailable") {
		t.Errorf("a slow client was logged as our fault:\n%s", logs)
	}
}
