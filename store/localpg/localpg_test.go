package localpg

import (
	"bufio"
	"context"
	"errors"
	"fmt"
	"log/slog"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"

	"github.com/jackc/pgx/v5"
)

// testDir returns a fresh folder that the database user can reach (t.TempDir makes
// its parents 0700, which an unprivileged postgres cannot enter when we are root).
func testDir(t *testing.T) string {
	t.Helper()
	dir := t.TempDir()
	for d := dir; d != os.TempDir() && d != "/"; d = filepath.Dir(d) {
		if err := os.Chmod(d, 0o755); err != nil {
			t.Fatal(err)
		}
	}
	return dir
}

func testLogger(t *testing.T) *slog.Logger {
	return slog.New(slog.NewTextHandler(tWriter{t}, &slog.HandlerOptions{Level: slog.LevelDebug}))
}

type tWriter struct{ t *testing.T }

func (w tWriter) Write(p []byte) (int, error) {
	w.t.Log(strings.TrimSpace(string(p)))
	return len(p), nil
}

func mustStart(t *testing.T, opt Options) *Cluster {
	t.Helper()
	if opt.Logger == nil {
		opt.Logger = testLogger(t)
	}
	ctx, cancel := context.WithTimeout(context.Background(), 2*time.Minute)
	defer cancel()
	t0 := time.Now()
	c, err := Start(ctx, opt)
	if err != nil {
		t.Fatalf("Start: %v", err)
	}
	t.Logf("Start took %v (adopted=%v)", time.Since(t0).Round(time.Millisecond), c.Adopted())
	t.Cleanup(func() { _ = c.Stop(context.Background()) })
	return c
}

func mustStop(t *testing.T, c *Cluster) {
	t.Helper()
	if err := c.Stop(context.Background()); err != nil {
		t.Fatalf("Stop: %v", err)
	}
	assertNoServer(t, c.DataDir())
}

func assertNoServer(t *testing.T, dataDir string) {
	t.Helper()
	pids, err := RunningPIDs(dataDir)
	if err != nil {
		t.Fatal(err)
	}
	if len(pids) > 0 {
		t.Fatalf("postgres still running on %s: pids %v", dataDir, pids)
	}
}

func exec1(t *testing.T, c *Cluster, sql string) {
	t.Helper()
	ctx := context.Background()
	conn, err := pgx.Connect(ctx, c.DSN("lagwright"))
	if err != nil {
		t.Fatalf("connect: %v", err)
	}
	defer conn.Close(ctx)
	if _, err := conn.Exec(ctx, sql); err != nil {
		t.Fatalf("%s: %v", sql, err)
	}
}

func count(t *testing.T, c *Cluster, table string) int {
	t.Helper()
	ctx := context.Background()
	conn, err := pgx.Connect(ctx, c.DSN("lagwright"))
	if err != nil {
		t.Fatalf("connect: %v", err)
	}
	defer conn.Close(ctx)
	var n int
	if err := conn.QueryRow(ctx, `SELECT count(*) FROM `+table).Scan(&n); err != nil {
		t.Fatalf("count %s: %v", table, err)
	}
	return n
}

func TestStartStopReuse(t *testing.T) {
	dir := filepath.Join(testDir(t), "data", "pg")
	c := mustStart(t, Options{DataDir: dir, Fast: true})
	if c.Adopted() {
		t.Error("a new cluster reported as adopted")
	}
	if c.SocketDir() != dir {
		t.Errorf("socket dir = %s, want the data dir %s (short path)", c.SocketDir(), dir)
	}
	exec1(t, c, `CREATE TABLE kept (x int); INSERT INTO kept VALUES (1), (2)`)
	mustStop(t, c)
	if err := c.Stop(context.Background()); err != nil {
		t.Errorf("second Stop: %v", err)
	}

	c2 := mustStart(t, Options{DataDir: dir, Fast: true})
	if c2.Adopted() {
		t.Error("a stopped cluster reported as adopted")
	}
	if n := count(t, c2, "kept"); n != 2 {
		t.Errorf("rows after restart = %d, want 2", n)
	}
	mustStop(t, c2)
}

func TestSecondLiveProcessRefused(t *testing.T) {
	dir := filepath.Join(testDir(t), "pg")
	c := mustStart(t, Options{DataDir: dir, Fast: true})
	_, err := Start(context.Background(), Options{DataDir: dir})
	if err == nil || !strings.Contains(err.Error(), "another running process") {
		t.Fatalf("second Start on a live cluster: err = %v, want 'another running process'", err)
	}
	exec1(t, c, `SELECT 1`) // the first is unharmed
	mustStop(t, c)
}

// A short-lived command attaches to the cluster a running app owns, and its Stop
// leaves the cluster running for the owner.
func TestAttachToOwnedCluster(t *testing.T) {
	dir := filepath.Join(testDir(t), "pg")
	owner := mustStart(t, Options{DataDir: dir, Fast: true})
	exec1(t, owner, `CREATE TABLE shared (x int)`)
	guest, err := Start(context.Background(), Options{DataDir: dir, Attach: true})
	if err != nil {
		t.Fatalf("attach: %v", err)
	}
	exec1(t, guest, `INSERT INTO shared VALUES (1)`)
	if err := guest.Stop(context.Background()); err != nil {
		t.Fatalf("guest Stop: %v", err)
	}
	if n := count(t, owner, "shared"); n != 1 {
		t.Errorf("rows seen by the owner after the guest stopped = %d, want 1 (cluster must keep running)", n)
	}
	mustStop(t, owner)
	assertNoServer(t, dir)
}

// TestHelperProcess is not a test: the tests below run the test binary again with
// LOCALPG_HELPER_DIR set, to own a cluster in another process they can SIGKILL.
func TestHelperProcess(t *testing.T) {
	dir := os.Getenv("LOCALPG_HELPER_DIR")
	if dir == "" {
		return
	}
	_, err := Start(context.Background(), Options{DataDir: dir, Fast: true,
		StopOnExit: os.Getenv("LOCALPG_HELPER_STOP_ON_EXIT") != ""})
	if err != nil {
		fmt.Println("error:", err)
		os.Exit(1)
	}
	fmt.Println("ready")
	time.Sleep(5 * time.Minute)
	os.Exit(0)
}

// startAndKill runs a cluster in a helper process and kills that process with
// SIGKILL, so it never stops its cluster.
func startAndKill(t *testing.T, dir string, stopOnExit bool) {
	t.Helper()
	cmd := exec.Command(os.Args[0], "-test.run=^TestHelperProcess$", "-test.v=false")
	cmd.Env = append(os.Environ(), "LOCALPG_HELPER_DIR="+dir)
	if stopOnExit {
		cmd.Env = append(cmd.Env, "LOCALPG_HELPER_STOP_ON_EXIT=1")
	}
	out, err := cmd.StdoutPipe()
	if err != nil {
		t.Fatal(err)
	}
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	line, _ := bufio.NewReader(out).ReadString('\n')
	if strings.TrimSpace(line) != "ready" {
		_ = cmd.Process.Kill()
		_ = cmd.Wait()
		t.Fatalf("helper: %q", line)
	}
	if err := cmd.Process.Signal(syscall.SIGKILL); err != nil {
		t.Fatal(err)
	}
	_ = cmd.Wait()
}

func TestAdoptAfterOwnerKilled(t *testing.T) {
	dir := filepath.Join(testDir(t), "pg")
	startAndKill(t, dir, false)
	pids, _ := RunningPIDs(dir)
	if len(pids) != 1 {
		t.Fatalf("after SIGKILL of its owner, running postmasters = %v, want one left running", pids)
	}
	c := mustStart(t, Options{DataDir: dir, Fast: true})
	if !c.Adopted() {
		t.Error("Adopted() = false, want the running cluster taken over")
	}
	exec1(t, c, `CREATE TABLE after_kill (x int)`)
	mustStop(t, c)
}

func TestStopOnExitWatchdog(t *testing.T) {
	dir := filepath.Join(testDir(t), "pg")
	startAndKill(t, dir, true)
	deadline := time.Now().Add(30 * time.Second)
	for {
		pids, _ := RunningPIDs(dir)
		if len(pids) == 0 {
			return
		}
		if time.Now().After(deadline) {
			t.Fatalf("watchdog did not stop the cluster of a killed process: pids %v", pids)
		}
		time.Sleep(50 * time.Millisecond)
	}
}

func TestStalePidFile(t *testing.T) {
	dir := filepath.Join(testDir(t), "pg")
	c := mustStart(t, Options{DataDir: dir, Fast: true})
	exec1(t, c, `CREATE TABLE stale (x int)`)
	mustStop(t, c)

	dead := exec.Command("true")
	if err := dead.Run(); err != nil {
		t.Fatal(err)
	}
	// A postmaster.pid as a server that died in a crash leaves it: the pid of a
	// process that no longer exists, then the pid of a live process that is not
	// postgres (a pid reused since).
	for _, tc := range []struct {
		name string
		pid  int
	}{
		{"dead pid", dead.Process.Pid},
		{"pid reused by a live process", os.Getpid()},
	} {
		t.Run(tc.name, func(t *testing.T) {
			pidFile := filepath.Join(dir, "postmaster.pid")
			content := fmt.Sprintf("%d\n%s\n%d\n5432\n%s\n\n  5432001    0\nready   \n", tc.pid, dir, time.Now().Unix(), dir)
			if err := os.WriteFile(pidFile, []byte(content), 0o600); err != nil {
				t.Fatal(err)
			}
			if err := c.user.chown(pidFile); err != nil { // as the server left it
				t.Fatal(err)
			}
			c := mustStart(t, Options{DataDir: dir, Fast: true})
			if c.Adopted() {
				t.Error("a stale postmaster.pid was taken for a running server")
			}
			if n := count(t, c, "stale"); n != 0 {
				t.Errorf("count = %d, want 0", n)
			}
			mustStop(t, c)
		})
	}
}

func TestLongDataPathUsesShortSocketDir(t *testing.T) {
	dir := testDir(t)
	for len(dir) < 120 {
		dir = filepath.Join(dir, "a-rather-long-folder-name")
	}
	dir = filepath.Join(dir, "pg")
	c := mustStart(t, Options{DataDir: dir, Fast: true})
	sock := filepath.Join(c.SocketDir(), ".s.PGSQL.5432")
	if len(sock) > maxSocketPath {
		t.Errorf("socket path %s is %d bytes, over the %d limit", sock, len(sock), maxSocketPath)
	}
	if !strings.HasPrefix(c.SocketDir(), "/tmp/lagwright-") {
		t.Errorf("socket dir = %s, want /tmp/lagwright-<hash>", c.SocketDir())
	}
	fi, err := os.Stat(c.SocketDir())
	if err != nil {
		t.Fatal(err)
	}
	if fi.Mode().Perm() != 0o700 {
		t.Errorf("socket dir mode = %v, want 0700 (local connections are trusted)", fi.Mode().Perm())
	}
	exec1(t, c, `SELECT 1`)
	mustStop(t, c)
	os.RemoveAll(c.SocketDir())
}

func TestUnreachableDataDirIsRelocated(t *testing.T) {
	if os.Geteuid() != 0 {
		t.Skip("only root hands the cluster to another user; as any other user the folder is reachable by definition")
	}
	private := filepath.Join(testDir(t), "home")
	if err := os.Mkdir(private, 0o700); err != nil { // like /root
		t.Fatal(err)
	}
	fallback := testDir(t)
	want := filepath.Join(private, "lagwright", "data", "pg")
	c := mustStart(t, Options{DataDir: want, FallbackDir: fallback, Fast: true})
	if !strings.HasPrefix(c.DataDir(), filepath.Join(fallback, "lagwright-")) || filepath.Base(c.DataDir()) != "pg" {
		t.Errorf("DataDir = %s, want %s/lagwright-<hash>/pg", c.DataDir(), fallback)
	}
	exec1(t, c, `CREATE TABLE relocated (x int)`)
	mustStop(t, c)
	c2 := mustStart(t, Options{DataDir: want, FallbackDir: fallback, Fast: true})
	if c2.DataDir() != c.DataDir() {
		t.Errorf("second start went to %s, first to %s", c2.DataDir(), c.DataDir())
	}
	if n := count(t, c2, "relocated"); n != 0 {
		t.Errorf("count = %d", n)
	}
	mustStop(t, c2)
}

func TestCanTraverse(t *testing.T) {
	if os.Geteuid() != 0 {
		t.Skip("needs root to make folders owned by others")
	}
	u, err := resolveUser("postgres")
	if err != nil {
		t.Fatal(err)
	}
	base := testDir(t)
	for _, tc := range []struct {
		mode os.FileMode
		own  bool
		want bool
	}{
		{0o755, false, true},
		{0o711, false, true},  // search without read is enough
		{0o700, false, false}, // like /root
		{0o750, false, false}, // group of root, not ours
		{0o700, true, true},   // our own private folder
	} {
		d := filepath.Join(base, fmt.Sprintf("m%o-%v", tc.mode, tc.own))
		if err := os.Mkdir(d, tc.mode); err != nil {
			t.Fatal(err)
		}
		os.Chmod(d, tc.mode)
		if tc.own {
			os.Chown(d, u.uid, u.gid)
		}
		if got := u.canTraverse(filepath.Join(d, "data", "pg")); got != tc.want {
			t.Errorf("mode %o own=%v: canTraverse = %v, want %v", tc.mode, tc.own, got, tc.want)
		}
	}
}

func TestNoBinaries(t *testing.T) {
	t.Setenv("PATH", t.TempDir())
	_, err := findBinDir("", t.TempDir())
	if !errors.Is(err, ErrNoBinaries) {
		t.Fatalf("err = %v, want ErrNoBinaries", err)
	}
	for _, want := range []string{"`postgresql`", "DATABASE_URL"} {
		if !strings.Contains(err.Error(), want) {
			t.Errorf("message %q does not name %s", err, want)
		}
	}
}

func TestFindBinDirPrefersClusterVersionThenHighest(t *testing.T) {
	root := t.TempDir()
	for _, v := range []string{"9.6", "13", "16"} {
		bin := filepath.Join(root, v, "bin")
		if err := os.MkdirAll(bin, 0o755); err != nil {
			t.Fatal(err)
		}
		for _, n := range []string{"initdb", "pg_ctl", "postgres"} {
			if err := os.WriteFile(filepath.Join(bin, n), []byte("#!/bin/sh\n"), 0o755); err != nil {
				t.Fatal(err)
			}
		}
	}
	t.Setenv("PATH", t.TempDir())
	for _, tc := range []struct{ want, dir string }{
		{"", "16"},   // highest version
		{"13", "13"}, // the existing cluster's version
		{"12", "16"}, // not installed: the highest (Start then refuses with a clear message)
	} {
		got, err := findBinDir(tc.want, root)
		if err != nil {
			t.Fatal(err)
		}
		if want := filepath.Join(root, tc.dir, "bin"); got != want {
			t.Errorf("findBinDir(%q) = %s, want %s", tc.want, got, want)
		}
	}
}

func TestReadPidFile(t *testing.T) {
	dir := t.TempDir()
	content := "4242\n/data/pg\n1700000000\n5433\n/tmp/sock\n\n  5433001    0\nready   \n"
	os.WriteFile(filepath.Join(dir, "postmaster.pid"), []byte(content), 0o600)
	info, err := readPidFile(dir)
	if err != nil {
		t.Fatal(err)
	}
	if info.pid != 4242 || info.port != 5433 || info.socketDir != "/tmp/sock" {
		t.Errorf("readPidFile = %+v", info)
	}
}
