package handlers

import (
	"context"
	"crypto/tls"
	"log/slog"
	"net/http"
	"net/http/httptest"
	"net/url"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"lagwright/store"
	"lagwright/store/storetest"
)

// authServer is a Server with login required and two users: ana (editor) and vic (viewer).
func authServer(t *testing.T) (*Server, http.Handler, *store.Store) {
	t.Helper()
	st := storetest.NewDB(t)
	logs := &logBuffer{}
	s, err := New(st, slog.New(slog.NewTextHandler(logs, nil)), Config{Version: "test", Auth: AuthConfig{Required: true}})
	if err != nil {
		t.Fatal(err)
	}
	ctx := context.Background()
	if _, err := st.CreateUser(ctx, "ana", "correct horse 1", store.RoleEditor); err != nil {
		t.Fatal(err)
	}
	if _, err := st.CreateUser(ctx, "vic", "correct horse 2", store.RoleViewer); err != nil {
		t.Fatal(err)
	}
	return s, s.Routes(), st
}

// loginAs posts the login form from remote and returns the answer.
func loginAs(t *testing.T, h http.Handler, remote, name, password, next string, cookie *http.Cookie) *httptest.ResponseRecorder {
	t.Helper()
	form := url.Values{"name": {name}, "password": {password}, "next": {next}}
	req := httptest.NewRequest("POST", "/login", strings.NewReader(form.Encode()))
	req.Header.Set("Content-Type", "application/x-www-form-urlencoded")
	req.RemoteAddr = remote
	if cookie != nil {
		req.AddCookie(cookie)
	}
	rec := httptest.NewRecorder()
	h.ServeHTTP(rec, req)
	return rec
}

func sessionOf(t *testing.T, rec *httptest.ResponseRecorder) *http.Cookie {
	t.Helper()
	for _, c := range rec.Result().Cookies() {
		if c.Name == SessionCookie {
			return c
		}
	}
	t.Fatalf("no %s cookie in %d answer", SessionCookie, rec.Code)
	return nil
}

func doWith(h http.Handler, method, target, body string, c *http.Cookie, header map[string]string) *httptest.ResponseRecorder {
	req := httptest.NewRequest(method, target, strings.NewReader(body))
	for k, v := range header {
		req.Header.Set(k, v)
	}
	if c != nil {
		req.AddCookie(c)
	}
	rec := httptest.NewRecorder()
	h.ServeHTTP(rec, req)
	return rec
}

func TestLoginRequired(t *testing.T) {
	_, h, _ := authServer(t)
	for _, tc := range []struct {
		method, path string
		header       map[string]string
		status       int
		location     string
	}{
		{"GET", "/projects", nil, http.StatusSeeOther, "/login?next=%2Fprojects"},
		{"GET", "/", nil, http.StatusSeeOther, "/login?next=%2F"},
		{"GET", "/no/such/page", nil, http.StatusSeeOther, "/login?next=%2Fno%2Fsuch%2Fpage"}, // no route enumeration
		{"GET", "/api/v1/projects", nil, http.StatusUnauthorized, ""},
		{"POST", "/projects", nil, http.StatusUnauthorized, ""},
		{"POST", "/api/v1/calc", map[string]string{"Content-Type": "application/json"}, http.StatusUnauthorized, ""},
		{"GET", "/healthz", nil, http.StatusOK, ""},
		{"GET", "/readyz", nil, http.StatusOK, ""},
		{"GET", "/login", nil, http.StatusOK, ""},
		{"GET", "/static/app.css", nil, http.StatusOK, ""},
	} {
		rec := doWith(h, tc.method, tc.path, "{}", nil, tc.header)
		if rec.Code != tc.status || rec.Header().Get("Location") != tc.location {
			t.Errorf("%s %s without a session = %d %q, want %d %q", tc.method, tc.path, rec.Code, rec.Header().Get("Location"), tc.status, tc.location)
		}
	}
	// A forged or expired cookie is no session.
	rec := doWith(h, "GET", "/api/v1/projects", "", &http.Cookie{Name: SessionCookie, Value: "forged"}, nil)
	if rec.Code != http.StatusUnauthorized {
		t.Errorf("forged cookie = %d, want 401", rec.Code)
	}
}

func TestLoginLogoutFlow(t *testing.T) {
	_, h, st := authServer(t)

	rec := doWith(h, "GET", "/login?next=/projects", "", nil, nil)
	body := rec.Body.String()
	for _, want := range []string{`<form method="post" action="/login"`, `name="password" type="password"`, `autocomplete="current-password"`, `value="/projects"`} {
		if !strings.Contains(body, want) {
			t.Errorf("login page lacks %q", want)
		}
	}

	old := &http.Cookie{Name: SessionCookie, Value: "left-from-before"}
	rec = loginAs(t, h, "192.0.2.1:1000", "ana", "correct horse 1", "/projects", old)
	if rec.Code != http.StatusSeeOther || rec.Header().Get("Location") != "/projects" {
		t.Fatalf("login = %d → %q, want 303 → /projects", rec.Code, rec.Header().Get("Location"))
	}
	c := sessionOf(t, rec)
	if !c.HttpOnly || c.SameSite != http.SameSiteLaxMode || c.Secure || c.Path != "/" || c.MaxAge != int(DefaultSessionTTL/time.Second) {
		t.Errorf("cookie = %+v, want HttpOnly, SameSite=Lax, not Secure over plain HTTP, Path=/, MaxAge 7 days", c)
	}
	if len(c.Value) != 43 || c.Value == old.Value {
		t.Errorf("token %q: want a fresh 32-byte token (43 base64url characters)", c.Value)
	}

	rec = doWith(h, "GET", "/projects", "", c, nil)
	if rec.Code != http.StatusOK || !strings.Contains(rec.Body.String(), `action="/logout"`) || !strings.Contains(rec.Body.String(), ">ana<") {
		t.Errorf("projects with a session = %d; want 200 with the account and a sign-out form", rec.Code)
	}
	rec = doWith(h, "POST", "/api/v1/projects", `{"name":"by ana"}`, c, map[string]string{"Content-Type": "application/json"})
	if rec.Code != http.StatusCreated {
		t.Errorf("editor creates a project = %d, want 201", rec.Code)
	}

	// A second login gives a new token; both are separate sessions.
	c2 := sessionOf(t, loginAs(t, h, "192.0.2.1:1000", "ana", "correct horse 1", "", nil))
	if c2.Value == c.Value {
		t.Error("second login reused the token")
	}

	rec = doWith(h, "POST", "/logout", "", c, nil)
	if rec.Code != http.StatusSeeOther || rec.Header().Get("Location") != "/login?out=1" || sessionOf(t, rec).MaxAge >= 0 {
		t.Errorf("logout = %d → %q; want 303 → /login?out=1 clearing the cookie", rec.Code, rec.Header().Get("Location"))
	}
	if rec := doWith(h, "GET", "/api/v1/projects", "", c, nil); rec.Code != http.StatusUnauthorized {
		t.Errorf("the logged-out token still works: %d", rec.Code)
	}
	if rec := doWith(h, "GET", "/api/v1/projects", "", c2, nil); rec.Code != http.StatusOK {
		t.Errorf("the other session ended with the first: %d", rec.Code)
	}

	// A new password ends every session of the user.
	if err := st.SetPassword(context.Background(), "ana", "another horse 1", ""); err != nil {
		t.Fatal(err)
	}
	if rec := doWith(h, "GET", "/api/v1/projects", "", c2, nil); rec.Code != http.StatusUnauthorized {
		t.Errorf("session survived a password change: %d", rec.Code)
	}
}

func TestLoginSecureCookie(t *testing.T) {
	st := storetest.NewDB(t)
	if _, err := st.CreateUser(context.Background(), "ana", "correct horse 1", store.RoleEditor); err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name          string
		secureCookies bool
		tls           bool
	}{
		{"over TLS", false, true},
		{"LAGWRIGHT_SECURE_COOKIES", true, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			s, err := New(st, slog.New(slog.DiscardHandler), Config{Auth: AuthConfig{Required: true, SecureCookies: tc.secureCookies}})
			if err != nil {
				t.Fatal(err)
			}
			form := url.Values{"name": {"ana"}, "password": {"correct horse 1"}}
			req := httptest.NewRequest("POST", "/login", strings.NewReader(form.Encode()))
			req.Header.Set("Content-Type", "application/x-www-form-urlencoded")
			if tc.tls {
				req.TLS = &tls.ConnectionState{}
			}
			rec := httptest.NewRecorder()
			s.Routes().ServeHTTP(rec, req)
			if c := sessionOf(t, rec); !c.Secure {
				t.Errorf("cookie not Secure: %+v", c)
			}
		})
	}
}

func TestLoginNoEnumeration(t *testing.T) {
	_, h, _ := authServer(t)
	unknown := loginAs(t, h, "192.0.2.2:1", "nobody", "correct horse 1", "", nil)
	wrong := loginAs(t, h, "192.0.2.3:1", "ana", "wrong password", "", nil)
	if unknown.Code != http.StatusUnauthorized || wrong.Code != http.StatusUnauthorized {
		t.Fatalf("unknown name = %d, wrong password = %d; want 401 both", unknown.Code, wrong.Code)
	}
	msg := func(b string) string {
		i := strings.Index(b, `data-testid="login-message">`)
		if i < 0 {
			return ""
		}
		b = b[i:]
		return b[:strings.Index(b, "<")]
	}
	if m := msg(unknown.Body.String()); m == "" || m != msg(wrong.Body.String()) || !strings.Contains(m, "Wrong name or password.") {
		t.Errorf("messages differ or are missing: %q vs %q", m, msg(wrong.Body.String()))
	}
	if len(unknown.Result().Cookies()) != 0 || len(wrong.Result().Cookies()) != 0 {
		t.Error("a failed login set a cookie")
	}
}

func TestLoginRateLimit(t *testing.T) {
	t.Run("per IP", func(t *testing.T) {
		_, h, _ := authServer(t)
		for i := range loginMaxFailures {
			if rec := loginAs(t, h, "192.0.2.9:1", "user"+strconv.Itoa(i), "wrong password", "", nil); rec.Code != http.StatusUnauthorized {
				t.Fatalf("failure %d = %d, want 401", i+1, rec.Code)
			}
		}
		rec := loginAs(t, h, "192.0.2.9:2", "ana", "correct horse 1", "", nil)
		ra, _ := strconv.Atoi(rec.Header().Get("Retry-After"))
		if rec.Code != http.StatusTooManyRequests || ra < 60 || ra > int(loginWindow/time.Second) {
			t.Errorf("6th attempt from the IP = %d, Retry-After %q; want 429 with 60…900 s", rec.Code, rec.Header().Get("Retry-After"))
		}
		if !strings.Contains(rec.Body.String(), "Too many failed sign-ins") {
			t.Error("429 page lacks its message")
		}
		// Another IP may still sign in as ana.
		if rec := loginAs(t, h, "192.0.2.10:1", "ana", "correct horse 1", "", nil); rec.Code != http.StatusSeeOther {
			t.Errorf("login from another IP = %d, want 303", rec.Code)
		}
	})
	t.Run("per name", func(t *testing.T) {
		_, h, _ := authServer(t)
		for i := range loginMaxFailures {
			if rec := loginAs(t, h, "192.0.2."+strconv.Itoa(20+i)+":1", "vic", "wrong password", "", nil); rec.Code != http.StatusUnauthorized {
				t.Fatalf("failure %d = %d, want 401", i+1, rec.Code)
			}
		}
		if rec := loginAs(t, h, "192.0.2.99:1", "vic", "correct horse 2", "", nil); rec.Code != http.StatusTooManyRequests || rec.Header().Get("Retry-After") == "" {
			t.Errorf("6th attempt on the name from a new IP = %d, want 429 with Retry-After", rec.Code)
		}
		if rec := loginAs(t, h, "192.0.2.99:1", "ana", "correct horse 1", "", nil); rec.Code != http.StatusSeeOther {
			t.Errorf("another name from that IP = %d, want 303", rec.Code)
		}
	})
}

// TestLoginLimitParallelGuesses: a burst of simultaneous wrong passwords must not
// all pass the limit (each attempt is reserved before the slow password check), and a
// right password sent in the burst's wake is refused too.
func TestLoginLimitParallelGuesses(t *testing.T) {
	_, h, _ := authServer(t)
	const guesses = 40
	codes := make(chan int, guesses)
	var wg sync.WaitGroup
	for range guesses {
		wg.Go(func() { codes <- loginAs(t, h, "192.0.2.40:1", "ana", "wrong password", "", nil).Code })
	}
	wg.Wait()
	close(codes)
	count := map[int]int{}
	for c := range codes {
		count[c]++
	}
	if count[http.StatusUnauthorized] > loginMaxFailures || count[http.StatusTooManyRequests] < guesses-loginMaxFailures {
		t.Errorf("%d parallel wrong passwords: %v; want at most %d × 401, the rest 429", guesses, count, loginMaxFailures)
	}
	if rec := loginAs(t, h, "192.0.2.40:1", "ana", "correct horse 1", "", nil); rec.Code != http.StatusTooManyRequests {
		t.Errorf("right password after the burst = %d, want 429", rec.Code)
	}
}

func TestViewerCannotChange(t *testing.T) {
	s, h, st := authServer(t)
	p, err := st.CreateProject(context.Background(), store.Project{Name: "P", Units: "si"})
	if err != nil {
		t.Fatal(err)
	}
	c := sessionOf(t, loginAs(t, h, "192.0.2.1:1", "vic", "correct horse 2", "", nil))
	if rec := doWith(h, "GET", "/projects/"+strconv.FormatInt(p.ID, 10), "", c, nil); rec.Code != http.StatusOK || !strings.Contains(rec.Body.String(), "(view only)") {
		t.Errorf("viewer reads a project = %d, want 200 marked view only", rec.Code)
	} else if strings.Contains(rec.Body.String(), `data-testid="delete-project"`) {
		t.Errorf("a viewer is offered to delete the project")
	}
	if rec := doWith(h, "GET", "/projects/"+strconv.FormatInt(p.ID, 10)+"/delete", "", c, nil); rec.Code != http.StatusOK ||
		strings.Contains(rec.Body.String(), "confirm-delete-project") || !strings.Contains(rec.Body.String(), "view-only") {
		t.Errorf("viewer's delete page = %d, want 200 without the delete button", rec.Code)
	}
	// Every unsafe route of the router is refused with 403 for a viewer, before any handler runs.
	n := 0
	for _, rt := range walkRoutes(t, s) {
		if safeMethod(rt.method) || rt.path == "/logout" || rt.path == "/login" {
			continue
		}
		target := fillRoute(rt.path, routeIDs{project: p.ID, line: 1, slug: "x", job: "x"})
		rec := doWith(h, rt.method, target, `{}`, c, map[string]string{"Content-Type": "application/json"})
		if rec.Code != http.StatusForbidden {
			t.Errorf("viewer %s %s = %d, want 403", rt.method, target, rec.Code)
		}
		n++
	}
	if n < 20 {
		t.Errorf("only %d unsafe routes checked", n)
	}
	if got, _ := st.Project(context.Background(), p.ID); got.Version != 1 {
		t.Errorf("the project changed under a viewer: version %d", got.Version)
	}
	if rec := doWith(h, "POST", "/logout", "", c, nil); rec.Code != http.StatusSeeOther {
		t.Errorf("viewer logout = %d, want 303", rec.Code)
	}
}

func TestLocalModeNeedsNoLogin(t *testing.T) {
	s, _ := newServer(t, storetest.NewDB(t)) // Auth.Required false: loopback default
	h := s.Routes()
	if rec := do(t, h, "GET", "/projects", nil, nil); rec.Code != http.StatusOK || strings.Contains(rec.Body.String(), `action="/logout"`) {
		t.Errorf("local mode /projects = %d; want 200 without an account", rec.Code)
	}
	if rec := do(t, h, "GET", "/login", nil, nil); rec.Code != http.StatusSeeOther {
		t.Errorf("local mode /login = %d, want 303 to /", rec.Code)
	}
}

func TestLocalPath(t *testing.T) {
	for _, tc := range []struct{ in, want string }{
		{"/projects/1", "/projects/1"},
		{"/projects?x=1", "/projects?x=1"},
		{"", ""},
		{"https://evil.example/", ""},
		{"//evil.example/", ""},
		{"/\\evil.example/", ""},
		{"/login?next=/x", ""},
		{"/a\r\nSet-Cookie: x", ""},
		{"javascript:alert(1)", ""},
	} {
		if got := localPath(tc.in); got != tc.want {
			t.Errorf("localPath(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
}
