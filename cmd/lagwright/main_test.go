package main

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"io"
	"net"
	"net/http"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"sync"
	"testing"
	"time"

	"lagwright/migrations"
	"lagwright/store/localpg"
	"lagwright/store/storetest"
)

func TestMain(m *testing.M) { storetest.Main(m) }

// syncBuffer is an io.Writer safe for the server goroutine and the test.
type syncBuffer struct {
	mu sync.Mutex
	b  bytes.Buffer
}

func (s *syncBuffer) Write(p []byte) (int, error) {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.Write(p)
}

func (s *syncBuffer) String() string {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.String()
}

func env(m map[string]string) func(string) string { return func(k string) string { return m[k] } }

func TestUsageAndExitCodes(t *testing.T) {
	for _, tc := range []struct {
		args   []string
		code   int
		stdout string
	}{
		{[]string{"version"}, 0, "lagwright "},
		{[]string{"help"}, 0, "Usage: lagwright"},
		{[]string{"bogus"}, 2, ""},
		{[]string{"migrate"}, 2, ""},
		{[]string{"migrate", "sideways"}, 2, ""},
		{[]string{"serve", "-nope"}, 2, ""},
		{[]string{"serve", "extra"}, 2, ""},
		{[]string{"serve", "-log-level", "loud"}, 2, ""},
	} {
		var stdout, stderr bytes.Buffer
		err := run(context.Background(), tc.args, env(nil), strings.NewReader(""), &stdout, &stderr)
		if got := exitCode(err, &stderr); got != tc.code {
			t.Errorf("%v: exit %d, want %d (err %v)", tc.args, got, tc.code, err)
		}
		if !strings.HasPrefix(stdout.String(), tc.stdout) {
			t.Errorf("%v: stdout %q, want prefix %q", tc.args, stdout.String(), tc.stdout)
		}
	}
	if got := exitCode(errors.New("database down"), io.Discard); got != 1 {
		t.Errorf("failure exit = %d, want 1", got)
	}
}

func TestConfigFlagsOverEnv(t *testing.T) {
	cfg, _, err := parseConfig("serve", []string{"-addr", "127.0.0.1:9999"}, env(map[string]string{
		"LAGWRIGHT_ADDR": "0.0.0.0:1", "LAGWRIGHT_DATA": "/srv/lw", "DATABASE_URL": "postgres://x@h/db",
	}), io.Discard)
	if err != nil {
		t.Fatal(err)
	}
	if cfg.Addr != "127.0.0.1:9999" || cfg.DataDir != "/srv/lw" || cfg.DatabaseURL != "postgres://x@h/db" {
		t.Errorf("config = %+v", cfg)
	}
	cfg, _, _ = parseConfig("serve", nil, env(nil), io.Discard)
	if cfg.Addr != "127.0.0.1:8080" || cfg.DataDir != "./data" || cfg.DatabaseURL != "" {
		t.Errorf("defaults = %+v", cfg)
	}
}

func TestMigrateCommand(t *testing.T) {
	dsn := storetest.NewDSN(t)
	latest, err := migrations.Latest()
	if err != nil {
		t.Fatal(err)
	}
	top := fmt.Sprintf("schema version: %d\n", latest)
	for _, tc := range []struct{ arg, want string }{
		{"version", top},
		{"down", "schema version: none\n"},
		{"version", "schema version: none\n"},
		{"up", top},
	} {
		var stdout, stderr bytes.Buffer
		if err := run(context.Background(), []string{"migrate", tc.arg}, env(map[string]string{"DATABASE_URL": dsn}), strings.NewReader(""), &stdout, &stderr); err != nil {
			t.Fatalf("migrate %s: %v\n%s", tc.arg, err, stderr.String())
		}
		if stdout.String() != tc.want {
			t.Errorf("migrate %s: %q, want %q", tc.arg, stdout.String(), tc.want)
		}
	}
}

var listeningRE = regexp.MustCompile(`msg=listening addr=(\S+)`)

// TestServeEndToEnd runs the real program: its own PostgreSQL in a fresh data
// folder, the server on a free port, a shutdown by context, and no postgres left.
func TestServeEndToEnd(t *testing.T) {
	data := t.TempDir()
	for d := data; d != os.TempDir() && d != "/"; d = filepath.Dir(d) {
		os.Chmod(d, 0o755) // the database user must reach it when we are root
	}
	for _, round := range []string{"cold", "warm"} {
		t.Run(round, func(t *testing.T) {
			ctx, cancel := context.WithCancel(context.Background())
			defer cancel()
			stderr := &syncBuffer{}
			done := make(chan error, 1)
			t0 := time.Now()
			go func() {
				done <- run(ctx, []string{"serve"}, env(map[string]string{
					"LAGWRIGHT_ADDR": "127.0.0.1:0", "LAGWRIGHT_DATA": data,
				}), strings.NewReader(""), io.Discard, stderr)
			}()
			var addr string
			for deadline := time.Now().Add(2 * time.Minute); addr == ""; {
				if m := listeningRE.FindStringSubmatch(stderr.String()); m != nil {
					addr = m[1]
					break
				}
				select {
				case err := <-done:
					t.Fatalf("serve ended early: %v\n%s", err, stderr.String())
				case <-time.After(20 * time.Millisecond):
				}
				if time.Now().After(deadline) {
					t.Fatalf("no 'listening' line:\n%s", stderr.String())
				}
			}
			t.Logf("%s start to listening: %v", round, time.Since(t0).Round(time.Millisecond))

			for _, path := range []string{"/readyz", "/healthz", "/"} {
				resp, err := http.Get("http://" + addr + path)
				if err != nil {
					t.Fatal(err)
				}
				resp.Body.Close()
				if resp.StatusCode != 200 {
					t.Errorf("GET %s = %d, want 200", path, resp.StatusCode)
				}
			}
			cancel()
			select {
			case err := <-done:
				if err != nil {
					t.Fatalf("serve: %v\n%s", err, stderr.String())
				}
			case <-time.After(time.Minute):
				t.Fatal("serve did not stop after cancel")
			}
			pids, err := localpg.RunningPIDs(filepath.Join(data, "pg"))
			if err != nil || len(pids) > 0 {
				t.Errorf("postgres left running on the data folder: %v %v", pids, err)
			}
			if round == "warm" && strings.Contains(stderr.String(), "created PostgreSQL cluster") {
				t.Error("second start made a new cluster instead of reusing the data")
			}
		})
	}
}

// TestServeRefusesEarly: a taken port is reported before PostgreSQL starts (no
// cluster is made), and a LAGWRIGHT_DATA that is a file is an error, not a cluster
// elsewhere.
func TestServeRefusesEarly(t *testing.T) {
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	defer ln.Close()
	data := t.TempDir()
	var stderr bytes.Buffer
	err = run(context.Background(), []string{"serve"}, env(map[string]string{
		"LAGWRIGHT_ADDR": ln.Addr().String(), "LAGWRIGHT_DATA": data,
	}), strings.NewReader(""), io.Discard, &stderr)
	if err == nil || !strings.Contains(err.Error(), "listen on "+ln.Addr().String()) {
		t.Errorf("serve on a taken port: %v; want a listen error naming the address", err)
	}
	if _, err := os.Stat(filepath.Join(data, "pg")); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("a cluster was made before the port was checked (%v)", err)
	}

	file := filepath.Join(t.TempDir(), "not-a-folder")
	if err := os.WriteFile(file, []byte("x"), 0o644); err != nil {
		t.Fatal(err)
	}
	err = run(context.Background(), []string{"serve"}, env(map[string]string{
		"LAGWRIGHT_ADDR": "127.0.0.1:0", "LAGWRIGHT_DATA": file,
	}), strings.NewReader(""), io.Discard, &stderr)
	if err == nil || !strings.Contains(err.Error(), "is a file") {
		t.Errorf("LAGWRIGHT_DATA a file: %v; want an error saying so", err)
	}
}

// TestTimeoutSettings: the database timeouts come from the environment, flags over
// it, and a bad value is a usage error naming the setting.
func TestTimeoutSettings(t *testing.T) {
	cfg, _, err := parseConfig("serve", []string{"-acquire-timeout", "3s"}, env(map[string]string{
		"LAGWRIGHT_STATEMENT_TIMEOUT": "45s", "LAGWRIGHT_ACQUIRE_TIMEOUT": "9s",
	}), io.Discard)
	if err != nil || cfg.DB.StatementTimeout != 45*time.Second || cfg.DB.AcquireTimeout != 3*time.Second {
		t.Errorf("config = %+v, %v", cfg.DB, err)
	}
	for _, bad := range []string{"30", "-1s", "soon", "50ms"} {
		_, _, err := parseConfig("serve", nil, env(map[string]string{"LAGWRIGHT_STATEMENT_TIMEOUT": bad}), io.Discard)
		if err == nil || !strings.Contains(err.Error(), "statement timeout") {
			t.Errorf("statement timeout %q: %v; want a usage error naming it", bad, err)
		}
	}
}
