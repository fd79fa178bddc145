package handlers

import (
	"context"
	"errors"
	"fmt"
	"net"
	"net/http"
	"net/url"
	"strconv"
	"strings"
	"time"
	"unicode/utf8"

	"github.com/a-h/templ"

	"lagwright/field"
	"lagwright/store"
	"lagwright/web"
)

// Accounts and sessions.
//
// With AuthConfig.Required false (the default on a loopback address) the app is one
// local user with no login, as before. With it true every route but the public ones
// (/healthz, /readyz, /static/…, /login, /logout) needs a session: a random 32-byte
// token in an HttpOnly, SameSite=Lax cookie (Secure over TLS or when
// AuthConfig.SecureCookies is set), kept in PostgreSQL only as its SHA-256 and renewed
// at every login. Viewers may look but every unsafe method (anything but GET, HEAD and
// OPTIONS, save POST /logout) is refused with 403. Failed logins are limited per client
// IP and per user name, in PostgreSQL (store/logins.go), shared by every instance.

// AuthConfig is the account side of Config.
type AuthConfig struct {
	// Required: every non-public route needs a signed-in user.
	Required bool
	// SecureCookies marks the session cookie Secure even when the request did not
	// come over TLS (behind a reverse proxy that terminates TLS).
	SecureCookies bool
	// SessionTTL is how long a session lasts from login; 0 means DefaultSessionTTL.
	SessionTTL time.Duration
}

// DefaultSessionTTL is a session's lifetime unless AuthConfig says otherwise.
const DefaultSessionTTL = 7 * 24 * time.Hour

// SessionCookie is the name of the session cookie.
const SessionCookie = "lagwright_session"

// Login limits: after loginMaxFailures attempts within loginWindow, from one IP or for
// one name, further attempts get 429 with Retry-After until the oldest ages out. Each
// attempt is reserved in PostgreSQL before the password is checked (so parallel
// guesses cannot pass together, and every instance on the database counts the same
// attempts); a successful sign-in takes its own attempt back.
const (
	loginMaxFailures = 5
	loginWindow      = 15 * time.Minute
)

var loginLimit = store.LoginLimit{Max: loginMaxFailures, Window: loginWindow}

type userKey struct{}

// currentUser returns the signed-in user of the request (none in local mode).
func currentUser(ctx context.Context) (store.User, bool) {
	u, ok := ctx.Value(userKey{}).(store.User)
	return u, ok
}

// publicPath: reachable without a session.
func publicPath(p string) bool {
	switch p {
	case "/healthz", "/readyz", "/login", "/logout":
		return true
	}
	return strings.HasPrefix(p, "/static/")
}

func safeMethod(m string) bool {
	return m == http.MethodGet || m == http.MethodHead || m == http.MethodOptions
}

// authenticate is the router's account middleware (see the comment at the top).
func (s *Server) authenticate(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		if !s.cfg.Auth.Required || publicPath(r.URL.Path) {
			next.ServeHTTP(w, r)
			return
		}
		u, err := s.sessionUser(r)
		switch {
		case errors.Is(err, store.ErrNotFound):
			if safeMethod(r.Method) && !wantsJSON(r) {
				http.Redirect(w, r, "/login?next="+url.QueryEscape(r.URL.RequestURI()), http.StatusSeeOther)
				return
			}
			s.fail(w, r, &Error{Code: CodeUnauthorized, Message: "Please sign in first."})
			return
		case err != nil:
			s.fail(w, r, err) // the database is away: 503
			return
		}
		if u.Role != store.RoleEditor && !safeMethod(r.Method) {
			s.fail(w, r, &Error{Code: CodeForbidden, Message: "Your account may view but not change anything."})
			return
		}
		ctx := context.WithValue(r.Context(), userKey{}, u)
		ctx = web.WithAccount(ctx, web.Account{Name: u.Name, Role: u.Role})
		next.ServeHTTP(w, r.WithContext(ctx))
	})
}

// sessionUser is the user of the request's session cookie, or store.ErrNotFound.
func (s *Server) sessionUser(r *http.Request) (store.User, error) {
	c, err := r.Cookie(SessionCookie)
	if err != nil || c.Value == "" || len(c.Value) > 100 {
		return store.User{}, store.ErrNotFound
	}
	return s.store.SessionUser(r.Context(), c.Value)
}

func (s *Server) sessionCookie(r *http.Request, value string, maxAge int) *http.Cookie {
	return &http.Cookie{Name: SessionCookie, Value: value, Path: "/", MaxAge: maxAge, HttpOnly: true,
		SameSite: http.SameSiteLaxMode, Secure: r.TLS != nil || s.cfg.Auth.SecureCookies}
}

// loginPage shows the sign-in form (GET /login).
func (s *Server) loginPage(w http.ResponseWriter, r *http.Request) {
	if !s.cfg.Auth.Required {
		http.Redirect(w, r, "/", http.StatusSeeOther)
		return
	}
	v := web.LoginView{Assets: s.assets.urls, Next: localPath(r.URL.Query().Get("next"))}
	if r.URL.Query().Has("out") {
		v.Info = "You are signed out."
	}
	s.renderLogin(w, r, v, http.StatusOK)
}

func (s *Server) renderLogin(w http.ResponseWriter, r *http.Request, v web.LoginView, status int) {
	w.Header().Set("Cache-Control", "no-store")
	templ.Handler(web.Login(v), templ.WithStatus(status)).ServeHTTP(w, r)
}

// login checks a name and password (POST /login), starts a new session and goes to
// the page asked for. A failure says the same for an unknown name and a wrong password.
func (s *Server) login(w http.ResponseWriter, r *http.Request) {
	if !s.cfg.Auth.Required {
		http.Redirect(w, r, "/", http.StatusSeeOther)
		return
	}
	if err := r.ParseForm(); err != nil {
		s.fail(w, r, badForm(err))
		return
	}
	name, password := strings.TrimSpace(r.PostForm.Get("name")), r.PostForm.Get("password")
	v := web.LoginView{Assets: s.assets.urls, Name: name, Next: localPath(r.PostForm.Get("next"))}
	keys := loginKeys(r, name)
	now := time.Now()
	attempt, wait, err := s.store.ReserveLogin(r.Context(), loginLimit, keys...)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	if wait > 0 {
		mins := max(int(wait.Round(time.Minute)/time.Minute), 1)
		w.Header().Set("Retry-After", strconv.Itoa(int(wait.Seconds()+0.999)))
		v.Message = fmt.Sprintf("Too many failed sign-ins. Try again in %d minute%s.", mins, map[bool]string{true: "", false: "s"}[mins == 1])
		s.renderLogin(w, r, v, http.StatusTooManyRequests)
		return
	}
	var u store.User
	err = store.ErrBadLogin
	if name != "" && password != "" && len(name) <= 256 && len(password) <= 1024 {
		u, err = s.store.Authenticate(r.Context(), name, password)
	}
	if errors.Is(err, store.ErrBadLogin) {
		v.Message = "Wrong name or password."
		s.renderLogin(w, r, v, http.StatusUnauthorized)
		return
	}
	if err != nil {
		s.fail(w, r, err)
		return
	}
	// The attempt was no failure; the name's count restarts, the IP's stays.
	if err := s.store.LoginSucceeded(r.Context(), attempt, keys[1]); err != nil {
		s.fail(w, r, err)
		return
	}
	// A new token at every login (no session fixation); the old one, if any, ends.
	if c, err := r.Cookie(SessionCookie); err == nil && c.Value != "" {
		_ = s.store.DeleteSession(r.Context(), c.Value)
	}
	ttl := s.cfg.Auth.SessionTTL
	if ttl <= 0 {
		ttl = DefaultSessionTTL
	}
	token := store.NewSessionToken()
	if err := s.store.CreateSession(r.Context(), u.ID, token, now.Add(ttl)); err != nil {
		s.fail(w, r, err)
		return
	}
	http.SetCookie(w, s.sessionCookie(r, token, int(ttl/time.Second)))
	w.Header().Set("Cache-Control", "no-store")
	next := v.Next
	if next == "" {
		next = "/"
	}
	http.Redirect(w, r, next, http.StatusSeeOther)
}

// logout ends the session (POST /logout) and clears the cookie.
func (s *Server) logout(w http.ResponseWriter, r *http.Request) {
	if c, err := r.Cookie(SessionCookie); err == nil && c.Value != "" && len(c.Value) <= 100 {
		if err := s.store.DeleteSession(r.Context(), c.Value); err != nil {
			s.fail(w, r, err)
			return
		}
	}
	http.SetCookie(w, s.sessionCookie(r, "", -1))
	w.Header().Set("Cache-Control", "no-store")
	if !s.cfg.Auth.Required {
		http.Redirect(w, r, "/", http.StatusSeeOther)
		return
	}
	http.Redirect(w, r, "/login?out=1", http.StatusSeeOther)
}

// badForm maps a form that cannot be parsed: too large (413), a body that did not
// arrive (408/400, the client's side), or malformed (422).
func badForm(err error) error {
	var tooLarge *http.MaxBytesError
	var bodyErr *bodyReadError
	if errors.As(err, &tooLarge) || errors.As(err, &bodyErr) {
		return err
	}
	return Invalid(field.Error{Message: "the form could not be read"})
}

// localPath keeps next only when it is a path on this site ("/…", not "//host" or
// "/\host", which browsers treat as another origin).
func localPath(next string) string {
	if !strings.HasPrefix(next, "/") || strings.HasPrefix(next, "//") || strings.HasPrefix(next, "/\\") ||
		strings.ContainsAny(next, "\r\n\t") || len(next) > 2000 || strings.HasPrefix(next, "/login") {
		return ""
	}
	return next
}

// loginKeys are the limiter's keys of an attempt: the client IP, then the name.
// The IP is the connection's peer: behind a reverse proxy all clients share the
// proxy's address (X-Forwarded-For is not trusted; it is easy to forge).
func loginKeys(r *http.Request, name string) []string {
	ip, _, err := net.SplitHostPort(r.RemoteAddr)
	if err != nil {
		ip = r.RemoteAddr
	}
	if len(name) > 64 {
		name = name[:64]
	}
	return []string{"ip:" + ip, "user:" + name}
}

// formMemory is how much of a multipart form is held in memory; the rest of an upload
// (within the body limit) goes to a temporary file.
const formMemory = 1 << 20

// readForm parses the form of every page POST up front, so a body that is not a form
// (bad escapes, a missing multipart boundary, a truncated upload, over 10 000 fields)
// or a form with invalid UTF-8 or NUL characters (which PostgreSQL text cannot hold) is
// answered 422 (413 when too large) here, whatever the handler would make of the
// error. Handlers' own ParseForm calls then find the form parsed. The JSON API (which
// reads its bodies itself) is left alone.
func (s *Server) readForm(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		if safeMethod(r.Method) || strings.HasPrefix(r.URL.Path, "/api/") {
			next.ServeHTTP(w, r)
			return
		}
		var err error
		if ct := r.Header.Get("Content-Type"); strings.HasPrefix(strings.ToLower(strings.TrimSpace(ct)), "multipart/") {
			err = r.ParseMultipartForm(formMemory)
		} else {
			err = r.ParseForm()
		}
		if err != nil {
			s.fail(w, r, badForm(err))
			return
		}
		if !cleanValues(r.PostForm) || (r.MultipartForm != nil && !cleanValues(r.MultipartForm.Value)) {
			s.fail(w, r, Invalid(field.Error{Message: "the form holds invalid characters (not UTF-8, or NUL)"}))
			return
		}
		next.ServeHTTP(w, r)
	})
}

func cleanValues(v url.Values) bool {
	for k, vs := range v {
		if !utf8.ValidString(k) || strings.ContainsRune(k, 0) {
			return false
		}
		for _, x := range vs {
			if !utf8.ValidString(x) || strings.ContainsRune(x, 0) {
				return false
			}
		}
	}
	return true
}
