package store_test

import (
	"context"
	"errors"
	"strings"
	"testing"
	"time"

	"github.com/jackc/pgx/v5"

	"lagwright/demo"
	"lagwright/store"
	"lagwright/store/storetest"
)

func TestUsersAndSessions(t *testing.T) {
	dsn := storetest.NewDSN(t)
	ctx := context.Background()
	st, err := store.Open(ctx, dsn)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(st.Close)
	raw, err := pgx.Connect(ctx, dsn)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { raw.Close(context.Background()) })

	for _, tc := range []struct {
		name, pw, role string
		ok             bool
	}{
		{"ana", "long enough 1", store.RoleEditor, true},
		{"ana", "long enough 2", store.RoleEditor, false}, // taken
		{"bo", "short", store.RoleViewer, false},          // under 10 characters
		{"bo", strings.Repeat("x", 73), store.RoleViewer, false},
		{"bo", "long enough 3", "admin", false},
		{"b o", "long enough 3", store.RoleViewer, false},
		{"bo", "long enough 3", store.RoleViewer, true},
	} {
		_, err := st.CreateUser(ctx, tc.name, tc.pw, tc.role)
		if (err == nil) != tc.ok {
			t.Errorf("CreateUser(%q, %d chars, %q) = %v, want ok=%v", tc.name, len(tc.pw), tc.role, err, tc.ok)
		}
	}
	users, err := st.Users(ctx)
	if err != nil || len(users) != 2 || users[0].Name != "ana" || users[1].Role != store.RoleViewer {
		t.Fatalf("Users = %+v, %v", users, err)
	}
	if !strings.HasPrefix(users[0].PasswordHash, "$2a$12$") {
		t.Errorf("hash %q is not bcrypt cost 12", users[0].PasswordHash[:7])
	}

	u, err := st.Authenticate(ctx, "ana", "long enough 1")
	if err != nil || u.Name != "ana" {
		t.Fatalf("Authenticate = %+v, %v", u, err)
	}
	for _, bad := range [][2]string{{"ana", "long enough 2"}, {"nobody", "long enough 1"}, {"ANA", "long enough 1"}} {
		if _, err := st.Authenticate(ctx, bad[0], bad[1]); !errors.Is(err, store.ErrBadLogin) {
			t.Errorf("Authenticate(%q) = %v, want ErrBadLogin", bad[0], err)
		}
	}

	tok := store.NewSessionToken()
	if len(tok) != 43 || tok == store.NewSessionToken() {
		t.Fatalf("token %q", tok)
	}
	if err := st.CreateSession(ctx, u.ID, tok, time.Now().Add(time.Hour)); err != nil {
		t.Fatal(err)
	}
	expired := store.NewSessionToken()
	if err := st.CreateSession(ctx, u.ID, expired, time.Now().Add(-time.Second)); err != nil {
		t.Fatal(err)
	}
	if got, err := st.SessionUser(ctx, tok); err != nil || got.ID != u.ID {
		t.Errorf("SessionUser = %+v, %v", got, err)
	}
	for _, bad := range []string{expired, "unknown", ""} {
		if _, err := st.SessionUser(ctx, bad); !errors.Is(err, store.ErrNotFound) {
			t.Errorf("SessionUser(%q) = %v, want ErrNotFound", bad, err)
		}
	}
	// Only the SHA-256 of the token is stored.
	var plain, hashed int
	if err := raw.QueryRow(ctx, `SELECT count(*) FILTER (WHERE token_hash = convert_to($1, 'UTF8')),
		count(*) FILTER (WHERE token_hash = sha256(convert_to($1, 'UTF8'))) FROM sessions`, tok).Scan(&plain, &hashed); err != nil || plain != 0 || hashed != 1 {
		t.Errorf("sessions hold the token %d times in plain, %d as its SHA-256 (%v); want 0 and 1", plain, hashed, err)
	}

	if err := st.SetPassword(ctx, "ana", "brand new pw 1", store.RoleViewer); err != nil {
		t.Fatal(err)
	}
	if _, err := st.SessionUser(ctx, tok); !errors.Is(err, store.ErrNotFound) {
		t.Errorf("session survived a password change: %v", err)
	}
	if u, err := st.Authenticate(ctx, "ana", "brand new pw 1"); err != nil || u.Role != store.RoleViewer {
		t.Errorf("after SetPassword: %+v, %v", u, err)
	}
	if err := st.SetPassword(ctx, "nobody", "brand new pw 1", ""); !errors.Is(err, store.ErrNotFound) {
		t.Errorf("SetPassword(nobody) = %v", err)
	}
	tok2 := store.NewSessionToken()
	if err := st.CreateSession(ctx, u.ID, tok2, time.Now().Add(time.Hour)); err != nil {
		t.Fatal(err)
	}
	if err := st.DeleteUser(ctx, "ana"); err != nil {
		t.Fatal(err)
	}
	if _, err := st.SessionUser(ctx, tok2); !errors.Is(err, store.ErrNotFound) {
		t.Errorf("session survived removing the user: %v", err)
	}
	if err := st.DeleteUser(ctx, "ana"); !errors.Is(err, store.ErrNotFound) {
		t.Errorf("DeleteUser twice = %v", err)
	}
}

// A bulk insert that fails part-way leaves nothing: CreateLines is one transaction.
func TestCreateLinesAllOrNothing(t *testing.T) {
	st := storetest.NewDB(t)
	ctx := context.Background()
	p, err := st.CreateProject(ctx, demo.Project())
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name  string
		spoil func(rows []store.Line, mats store.LineMaterials)
	}{
		{"duplicate tag in the last row", func(rows []store.Line, _ store.LineMaterials) { rows[len(rows)-1].Tag = rows[0].Tag }},
		{"unknown material in the last row (second COPY)", func(_ []store.Line, mats store.LineMaterials) {
			mats[len(mats)-1] = append(mats[len(mats)-1], "no_such_material")
		}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rows, mats := demo.StoreLines(p.ID)
			tc.spoil(rows, mats)
			if _, err := st.CreateLines(ctx, p.ID, rows, mats); err == nil {
				t.Fatal("CreateLines succeeded")
			}
			if lines, err := st.Lines(ctx, p.ID); err != nil || len(lines) != 0 {
				t.Errorf("after a failed bulk insert: %d lines, %v; want none", len(lines), err)
			}
		})
	}
	rows, mats := demo.StoreLines(p.ID)
	if n, err := st.CreateLines(ctx, p.ID, rows, mats); err != nil || n != len(rows) {
		t.Fatalf("good bulk insert: %d, %v", n, err)
	}
}
