// Package storetest gives every test package that needs a database a fresh, fully
// migrated PostgreSQL database per test.
//
//	func TestMain(m *testing.M) { storetest.Main(m) }
//
//	func TestSomething(t *testing.T) {
//		st := storetest.NewDB(t) // *store.Store on its own database, dropped after the test
//		…
//	}
//
// Main starts one throwaway cluster per test binary with localpg in a temporary
// folder (or uses TEST_DATABASE_URL, a server where the user may create databases),
// migrates a template database once, and NewDB clones it with CREATE DATABASE …
// TEMPLATE. When no PostgreSQL can be had the test binary fails; it never skips.
package storetest

import (
	"context"
	"flag"
	"fmt"
	"log/slog"
	"net/url"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"sync/atomic"
	"testing"
	"time"

	"github.com/jackc/pgx/v5"
	"github.com/jackc/pgx/v5/pgxpool"

	"lagwright/store"
	"lagwright/store/localpg"
)

// env is the state of one test binary, set by Main. Test helpers are the one place
// where package state is the accepted pattern: TestMain has no other way to hand
// over what it made.
var env struct {
	mu       sync.Mutex
	ready    bool
	admin    *pgxpool.Pool // on the maintenance database, for CREATE/DROP DATABASE
	dsnFor   func(db string) string
	template string
	prefix   string
	seq      atomic.Int64
}

// Main runs the tests of a package with a database ready, then cleans up: call it
// from TestMain. It exits the process.
func Main(m *testing.M) {
	os.Exit(run(m))
}

func run(m *testing.M) int {
	if !flag.Parsed() {
		flag.Parse() // for testing.Verbose
	}
	ctx := context.Background()
	cleanup, err := setUp(ctx)
	if err != nil {
		fmt.Fprintf(os.Stderr, "storetest: no PostgreSQL for the tests: %v\n"+
			"storetest: install the Debian package `postgresql` (make test does), or set TEST_DATABASE_URL to a server where the user may create databases.\n", err)
		return 1
	}
	code := m.Run()
	if err := cleanup(); err != nil {
		fmt.Fprintf(os.Stderr, "storetest: cleanup: %v\n", err)
		if code == 0 {
			code = 1
		}
	}
	return code
}

func setUp(ctx context.Context) (cleanup func() error, err error) {
	var cleanups []func() error
	cleanup = func() error {
		var first error
		for i := len(cleanups) - 1; i >= 0; i-- {
			if err := cleanups[i](); err != nil && first == nil {
				first = err
			}
		}
		return first
	}
	defer func() {
		if err != nil {
			_ = cleanup()
		}
	}()

	var adminDSN string
	if ext := os.Getenv("TEST_DATABASE_URL"); ext != "" {
		adminDSN = ext
		env.dsnFor = func(db string) string { return withDatabase(ext, db) }
	} else {
		dir, err := os.MkdirTemp("", "lagwright-test-")
		if err != nil {
			return cleanup, err
		}
		// MkdirTemp makes 0700; the database user (when we run as root) must enter it.
		if err := os.Chmod(dir, 0o755); err != nil {
			return cleanup, err
		}
		cleanups = append(cleanups, func() error { return os.RemoveAll(dir) })
		logLevel := slog.LevelWarn
		if testing.Verbose() {
			logLevel = slog.LevelInfo
		}
		cl, err := localpg.Start(ctx, localpg.Options{
			DataDir:    filepath.Join(dir, "pg"),
			Logger:     slog.New(slog.NewTextHandler(os.Stderr, &slog.HandlerOptions{Level: logLevel})).With("pkg", "storetest"),
			Database:   "-",
			Fast:       true,
			StopOnExit: true, // no stray postgres even if the test binary panics or is killed
		})
		if err != nil {
			return cleanup, err
		}
		cleanups = append(cleanups, func() error {
			ctx, cancel := context.WithTimeout(context.Background(), time.Minute)
			defer cancel()
			return cl.Stop(ctx)
		})
		adminDSN = cl.DSN("postgres")
		env.dsnFor = cl.DSN
	}

	admin, err := pgxpool.New(ctx, adminDSN)
	if err != nil {
		return cleanup, err
	}
	cleanups = append(cleanups, func() error { admin.Close(); return nil })
	if err := admin.Ping(ctx); err != nil {
		return cleanup, err
	}
	env.admin = admin
	// Unique per test binary, so packages sharing one TEST_DATABASE_URL do not collide.
	env.prefix = fmt.Sprintf("lwt_%d_%d", os.Getpid(), time.Now().UnixNano()%1e6)
	env.template = env.prefix + "_tmpl"
	if _, err := admin.Exec(ctx, `CREATE DATABASE `+pgx.Identifier{env.template}.Sanitize()); err != nil {
		return cleanup, fmt.Errorf("create template database: %w", err)
	}
	cleanups = append(cleanups, func() error { return dropDatabase(env.template) })

	st, err := store.Open(ctx, env.dsnFor(env.template))
	if err != nil {
		return cleanup, err
	}
	_, err = st.Migrate(ctx, store.MigrateUp)
	if err == nil {
		err = st.SeedCatalog(ctx) // as the app does at start
	}
	st.Close()
	if err != nil {
		return cleanup, fmt.Errorf("migrate and seed template database: %w", err)
	}
	env.ready = true
	return cleanup, nil
}

// NewDSN creates a fresh database cloned from the migrated template and returns its
// connection string; the database is dropped when the test ends.
func NewDSN(tb testing.TB) string {
	tb.Helper()
	if !env.ready {
		tb.Fatal("storetest: no test database: call storetest.Main(m) from TestMain in this package")
	}
	name := fmt.Sprintf("%s_%d", env.prefix, env.seq.Add(1))
	ctx, cancel := context.WithTimeout(context.Background(), time.Minute)
	defer cancel()
	// CREATE DATABASE from one template must not run concurrently with a connection
	// to that template; serialise the clones (each takes ~0.1 s).
	env.mu.Lock()
	_, err := env.admin.Exec(ctx, `CREATE DATABASE `+pgx.Identifier{name}.Sanitize()+` TEMPLATE `+pgx.Identifier{env.template}.Sanitize())
	env.mu.Unlock()
	if err != nil {
		tb.Fatalf("storetest: create database %s: %v", name, err)
	}
	tb.Cleanup(func() {
		if err := dropDatabase(name); err != nil {
			tb.Errorf("storetest: %v", err)
		}
	})
	return env.dsnFor(name)
}

// NewDB returns a Store on a fresh, migrated database of its own, closed and
// dropped when the test ends.
func NewDB(tb testing.TB) *store.Store {
	tb.Helper()
	dsn := NewDSN(tb)
	ctx, cancel := context.WithTimeout(context.Background(), time.Minute)
	defer cancel()
	st, err := store.Open(ctx, dsn)
	if err != nil {
		tb.Fatalf("storetest: %v", err)
	}
	tb.Cleanup(st.Close) // runs before the drop (cleanups run last-in first-out)
	return st
}

func dropDatabase(name string) error {
	ctx, cancel := context.WithTimeout(context.Background(), time.Minute)
	defer cancel()
	if _, err := env.admin.Exec(ctx, `DROP DATABASE IF EXISTS `+pgx.Identifier{name}.Sanitize()+` WITH (FORCE)`); err != nil {
		return fmt.Errorf("drop database %s: %w", name, err)
	}
	return nil
}

// withDatabase returns dsn with its database replaced by db (URL or key=value form).
func withDatabase(dsn, db string) string {
	if u, err := url.Parse(dsn); err == nil && (u.Scheme == "postgres" || u.Scheme == "postgresql") {
		u.Path = "/" + db
		return u.String()
	}
	var kept []string
	for _, f := range strings.Fields(dsn) {
		if !strings.HasPrefix(f, "dbname=") {
			kept = append(kept, f)
		}
	}
	return strings.Join(append(kept, "dbname="+db), " ")
}
