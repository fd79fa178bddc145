package e2e

import (
	"context"
	"net/http"
	"strings"
	"testing"
	"time"

	"lagwright/handlers"
	"lagwright/store"
)

// TestLoginLogout runs a server that requires a login: a page asked for without a
// session goes to the sign-in form, a wrong password is refused, the right one lands
// on the page asked for with the account in the header, and signing out ends the
// session (the projects page sends to the sign-in form again).
func TestLoginLogout(t *testing.T) {
	a := startApp(t, handlers.Config{Auth: handlers.AuthConfig{Required: true}})
	ctx, cancel := context.WithTimeout(context.Background(), 30*time.Second)
	defer cancel()
	if _, err := a.Store.CreateUser(ctx, "estimator", "brass-valve-lagging-42", store.RoleEditor); err != nil {
		t.Fatalf("create user: %v", err)
	}
	p := openBrowser(t, a)

	p.open("/projects")
	if got := p.path(); got != "/login" {
		t.Fatalf("/projects without a session showed %s, want /login", got)
	}
	if next := p.value(`.login-form [name="next"]`); next != "/projects" {
		t.Errorf("login form next = %q, want /projects", next)
	}

	p.typeInto(`#login-name`, "estimator")
	p.typeInto(`#login-password`, "not-the-password")
	if path, status := p.submitStatus("sign in with a wrong password", `.login-form button[type="submit"]`); path != "/login" || status != http.StatusUnauthorized {
		t.Fatalf("wrong password: %s %d, want /login 401", path, status)
	}
	if msg := p.text(`[data-testid="login-message"]`); msg != "Wrong name or password." {
		t.Errorf("wrong password message = %q", msg)
	}
	if v := p.value(`#login-name`); v != "estimator" {
		t.Errorf("name after a failed sign-in = %q, want it kept", v)
	}

	p.typeInto(`#login-password`, "brass-valve-lagging-42")
	if got := p.submit("sign in", `.login-form button[type="submit"]`); got != "/projects" {
		t.Fatalf("sign in went to %s, want /projects", got)
	}
	if h := p.text(`main h1`); h != "Projects" {
		t.Errorf("after sign-in the heading is %q", h)
	}
	if acct := p.text(`[data-testid="account"]`); !strings.Contains(acct, "estimator") {
		t.Errorf("header account = %q, want the user's name", acct)
	}
	p.snapshot("signed-in")

	if got := p.submit("sign out", `[data-testid="account"] button[type="submit"]`); got != "/login" {
		t.Fatalf("sign out went to %s, want /login", got)
	}
	if info := p.text(`[data-testid="login-info"]`); info != "You are signed out." {
		t.Errorf("after sign-out the page says %q", info)
	}
	if n := p.count(`[data-testid="account"]`); n != 0 {
		t.Error("the header still shows an account after signing out")
	}
	p.open("/projects")
	if got := p.path(); got != "/login" {
		t.Errorf("/projects after signing out showed %s, want /login", got)
	}
}
