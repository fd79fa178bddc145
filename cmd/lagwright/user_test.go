package main

import (
	"bytes"
	"context"
	"errors"
	"log/slog"
	"strings"
	"testing"
	"time"

	"lagwright/store"
	"lagwright/store/storetest"
)

func TestUserCommand(t *testing.T) {
	dsn := storetest.NewDSN(t)
	getenv := env(map[string]string{"DATABASE_URL": dsn})
	user := func(stdin string, args ...string) (string, error) {
		var stdout, stderr bytes.Buffer
		err := run(context.Background(), append([]string{"user"}, args...), getenv, strings.NewReader(stdin), &stdout, &stderr)
		return stdout.String(), err
	}
	for _, tc := range []struct {
		name, stdin string
		args        []string
		out         string
		exit        int
	}{
		{"add editor", "correct horse 1\n", []string{"add", "ana"}, "added user ana (editor)\n", 0},
		{"add viewer, CRLF", "correct horse 2\r\n", []string{"add", "vic", "--role", "viewer"}, "added user vic (viewer)\n", 0},
		{"add taken", "correct horse 3\n", []string{"add", "ana"}, "", 1},
		{"short password", "short\n", []string{"add", "bo"}, "", 2},
		{"no password", "", []string{"add", "bo"}, "", 2},
		{"bad role", "correct horse 3\n", []string{"add", "bo", "--role=admin"}, "", 2},
		{"no name", "correct horse 3\n", []string{"add"}, "", 2},
		{"unknown action", "", []string{"grant", "bo"}, "", 2},
		{"passwd", "another horse 1\n", []string{"passwd", "ana", "--role", "viewer"}, "changed the password of ana; their sessions are ended\n", 0},
		{"passwd unknown", "another horse 1\n", []string{"passwd", "nobody"}, "", 1},
		{"list", "", []string{"list"}, "ana\tviewer\t", 0},
		{"remove", "", []string{"remove", "vic"}, "removed user vic\n", 0},
		{"remove again", "", []string{"remove", "vic"}, "", 1},
	} {
		t.Run(tc.name, func(t *testing.T) {
			out, err := user(tc.stdin, tc.args...)
			if code := exitCode(err, &bytes.Buffer{}); code != tc.exit {
				t.Errorf("exit %d (%v), want %d", code, err, tc.exit)
			}
			if !strings.HasPrefix(out, tc.out) || (tc.out == "" && out != "") {
				t.Errorf("stdout %q, want %q", out, tc.out)
			}
		})
	}
	st, err := store.Open(context.Background(), dsn)
	if err != nil {
		t.Fatal(err)
	}
	defer st.Close()
	if u, err := st.Authenticate(context.Background(), "ana", "another horse 1"); err != nil || u.Role != store.RoleViewer {
		t.Errorf("ana after passwd: %+v, %v", u, err)
	}
	if _, err := st.Authenticate(context.Background(), "vic", "correct horse 2"); !errors.Is(err, store.ErrBadLogin) {
		t.Errorf("vic after remove: %v", err)
	}
}

func TestAuthConfig(t *testing.T) {
	for _, tc := range []struct {
		addr, auth, secure string
		required, cookies  bool
		exit               int
	}{
		{"127.0.0.1:8080", "", "", false, false, 0},
		{"127.1.2.3:8080", "auto", "", false, false, 0},
		{"[::1]:8080", "", "", false, false, 0},
		{"localhost:8080", "", "", false, false, 0},
		{"0.0.0.0:8080", "", "", true, false, 0},
		{":8080", "", "", true, false, 0},
		{"192.168.1.5:8080", "", "1", true, true, 0},
		{"lagwright.example:80", "", "", true, false, 0},
		{"127.0.0.1:18086", "required", "", true, false, 0},
		{"127.0.0.1:8080", "off", "", false, false, 0},
		{"0.0.0.0:8080", "off", "", false, false, 2},
		{"127.0.0.1:8080", "maybe", "", false, false, 2},
		{"127.0.0.1:8080", "", "yes", false, false, 2},
	} {
		ac, err := authConfig(tc.addr, env(map[string]string{"LAGWRIGHT_AUTH": tc.auth, "LAGWRIGHT_SECURE_COOKIES": tc.secure}))
		if code := exitCode(err, &bytes.Buffer{}); code != tc.exit {
			t.Errorf("%s auth=%q: exit %d (%v), want %d", tc.addr, tc.auth, code, err, tc.exit)
			continue
		}
		if err == nil && (ac.Required != tc.required || ac.SecureCookies != tc.cookies) {
			t.Errorf("%s auth=%q secure=%q: %+v, want required=%v secure=%v", tc.addr, tc.auth, tc.secure, ac, tc.required, tc.cookies)
		}
	}
}

// The server's timeouts are set (slowloris and stuck clients cannot hold connections).
func TestHTTPServerTimeouts(t *testing.T) {
	hs := newHTTPServer(context.Background(), nil, slog.New(slog.DiscardHandler))
	for name, tc := range map[string]struct{ got, want time.Duration }{
		"ReadHeaderTimeout": {hs.ReadHeaderTimeout, 5 * time.Second},
		"ReadTimeout":       {hs.ReadTimeout, 30 * time.Second},
		"WriteTimeout":      {hs.WriteTimeout, 60 * time.Second},
		"IdleTimeout":       {hs.IdleTimeout, 120 * time.Second},
	} {
		if tc.got != tc.want {
			t.Errorf("%s = %v, want %v", name, tc.got, tc.want)
		}
	}
}
