package handlers

import (
	"context"
	"fmt"
	"log/slog"
	"net/http"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"lagwright/store"
	"lagwright/store/localpg"
)

// With PostgreSQL stopped, pages answer 503 with a clear message and /readyz fails;
// when it returns, the app recovers by itself (the pool reconnects). The test runs its
// own cluster, so stopping it touches no other test.
func TestDatabaseOutageAndRecovery(t *testing.T) {
	dir, err := os.MkdirTemp("", "lagwright-outage-")
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { os.RemoveAll(dir) })
	if err := os.Chmod(dir, 0o755); err != nil { // the database user (when we run as root) must enter it
		t.Fatal(err)
	}
	ctx := context.Background()
	opt := localpg.Options{DataDir: filepath.Join(dir, "pg"), Fast: true, StopOnExit: true, Logger: slog.New(slog.DiscardHandler)}
	cl, err := localpg.Start(ctx, opt)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { _ = cl.Stop(context.Background()) })
	st, err := store.Open(ctx, cl.DSN("lagwright"))
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(st.Close)
	if _, err := st.Migrate(ctx, store.MigrateUp); err != nil {
		t.Fatal(err)
	}
	if err := st.SeedCatalog(ctx); err != nil {
		t.Fatal(err)
	}
	p, err := st.CreateProject(ctx, store.Project{Name: "Outage", Units: "si"})
	if err != nil {
		t.Fatal(err)
	}
	s, logs := newServer(t, st)
	h := s.Routes()
	paths := []string{"/projects", fmt.Sprintf("/projects/%d", p.ID), "/materials", fmt.Sprintf("/api/v1/projects/%d", p.ID)}
	for _, path := range append(paths, "/readyz") {
		if rec := do(t, h, "GET", path, nil, nil); rec.Code != http.StatusOK {
			t.Fatalf("GET %s before the outage = %d", path, rec.Code)
		}
	}

	if err := cl.Stop(ctx); err != nil {
		t.Fatal(err)
	}
	for _, path := range paths {
		rec := do(t, h, "GET", path, nil, nil)
		if rec.Code != http.StatusServiceUnavailable || !strings.Contains(rec.Body.String(), "database") {
			t.Errorf("GET %s with PostgreSQL stopped = %d %.200s; want 503 naming the database", path, rec.Code, rec.Body)
		}
	}
	rec := do(t, h, "POST", "/api/v1/projects", strings.NewReader(`{"name":"during"}`), map[string]string{"Content-Type": "application/json"})
	if rec.Code != http.StatusServiceUnavailable {
		t.Errorf("POST during the outage = %d, want 503", rec.Code)
	}
	if rec := do(t, h, "GET", "/readyz", nil, nil); rec.Code != http.StatusServiceUnavailable {
		t.Errorf("/readyz with PostgreSQL stopped = %d, want 503", rec.Code)
	}
	if rec := do(t, h, "GET", "/healthz", nil, nil); rec.Code != http.StatusOK {
		t.Errorf("/healthz with PostgreSQL stopped = %d, want 200", rec.Code)
	}
	if strings.Contains(logs.String(), "internal error") {
		t.Errorf("the outage was logged as an internal error:\n%s", logs)
	}

	cl2, err := localpg.Start(ctx, opt)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { _ = cl2.Stop(context.Background()) })
	deadline := time.Now().Add(15 * time.Second)
	for {
		rec := do(t, h, "GET", "/readyz", nil, nil)
		if rec.Code == http.StatusOK {
			break
		}
		if time.Now().After(deadline) {
			t.Fatalf("not ready 15 s after PostgreSQL came back: %d", rec.Code)
		}
		time.Sleep(100 * time.Millisecond)
	}
	for _, path := range paths {
		if rec := do(t, h, "GET", path, nil, nil); rec.Code != http.StatusOK {
			t.Errorf("GET %s after recovery = %d", path, rec.Code)
		}
	}
}
