// Package localpg runs a private PostgreSQL cluster from the machine's PostgreSQL
// binaries: the zero-configuration database of the app when no DATABASE_URL is
// given, and the database of the tests.
//
// The cluster is created with initdb on first start, listens on a unix socket only
// (listen_addresses is empty), trusts local connections (the socket lives in a directory
// only the database user can enter), is stopped with `pg_ctl stop -m fast` by
// Stop, and is reused on the next start. A cluster left running by a process that
// was killed is found through postmaster.pid and `pg_ctl status` and adopted; a
// stale postmaster.pid is removed before starting.
package localpg

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"log/slog"
	"net/url"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"syscall"
	"time"

	"github.com/jackc/pgx/v5"
)

// Options configure Start.
type Options struct {
	// DataDir is the cluster directory, e.g. $LAGWRIGHT_DATA/pg. It is created when
	// missing. When the database user cannot reach it (a folder under a private home
	// such as /root while running as root), the cluster is placed under FallbackDir
	// instead and a warning names the place.
	DataDir string
	// Logger receives what the cluster does; nil discards it.
	Logger *slog.Logger
	// Database is created when missing; default "lagwright". "-" creates none.
	Database string
	// User is the system account that runs PostgreSQL when the app runs as root;
	// default "postgres". Ignored when not root (the cluster runs as the app's user).
	User string
	// FallbackDir is where an unreachable DataDir is relocated; default /var/tmp.
	FallbackDir string
	// Fast turns off fsync and synchronous commit: for throwaway test clusters only.
	Fast bool
	// StopOnExit starts a watchdog process that stops the cluster when this process
	// exits by any means (a panic, a test timeout, SIGKILL): for throwaway clusters.
	StopOnExit bool
	// Attach lets a short-lived command (demo, migrate, user) use a cluster that a
	// running app owns: when the data folder is locked by a live process and its
	// server answers, the Cluster connects to it and Stop leaves it running.
	Attach bool
}

// Cluster is a running local PostgreSQL cluster.
type Cluster struct {
	dataDir   string
	socketDir string
	port      int
	binDir    string
	user      dbUser
	log       *slog.Logger
	adopted   bool
	attached  bool // owned by another live process: Stop leaves it running

	mu       sync.Mutex
	stopped  bool
	lock     *os.File
	watchdog *exec.Cmd
	wdPipe   *os.File
}

const (
	defaultPort = 5432
	superuser   = "postgres"
	// maxSocketPath is the longest unix socket path: sizeof(sun_path) - 1 on Linux.
	maxSocketPath = 107
	startTimeout  = 60 * time.Second
)

// Start starts (or creates, or adopts) the cluster in opt.DataDir and makes sure
// opt.Database exists.
func Start(ctx context.Context, opt Options) (_ *Cluster, err error) {
	log := opt.Logger
	if log == nil {
		log = slog.New(slog.NewTextHandler(io.Discard, nil))
	}
	if opt.DataDir == "" {
		return nil, errors.New("localpg: no data directory")
	}
	requested, err := filepath.Abs(opt.DataDir)
	if err != nil {
		return nil, fmt.Errorf("localpg: %w", err)
	}
	if strings.ContainsAny(requested, "\"$`\\\n") {
		// pg_ctl hands the path to /bin/sh inside double quotes.
		return nil, fmt.Errorf("localpg: data directory %q contains a shell metacharacter; choose another path", requested)
	}
	u, err := resolveUser(opt.User)
	if err != nil {
		return nil, fmt.Errorf("localpg: %w", err)
	}
	dataDir, err := reachableDataDir(requested, opt.FallbackDir, u, log)
	if err != nil {
		return nil, fmt.Errorf("localpg: %w", err)
	}
	cv := clusterVersion(dataDir)
	binDir, err := findBinDir(cv, debianRoot)
	if err != nil {
		return nil, fmt.Errorf("localpg: %w", err)
	}
	bv, err := binVersion(binDir)
	if err != nil {
		return nil, fmt.Errorf("localpg: %w", err)
	}
	if cv != "" && cv != bv {
		return nil, fmt.Errorf("localpg: the cluster in %s was made by PostgreSQL %s but only PostgreSQL %s binaries were found (%s): "+
			"install the Debian package postgresql-%s, or upgrade the cluster with pg_upgrade", dataDir, cv, bv, binDir, cv)
	}
	if err := os.MkdirAll(filepath.Dir(dataDir), 0o755); err != nil {
		return nil, fmt.Errorf("localpg: %w", err)
	}
	c := &Cluster{dataDir: dataDir, port: defaultPort, binDir: binDir, user: u, log: log.With("pgdata", dataDir)}
	if err := c.takeLock(); err != nil {
		if errors.Is(err, errLocked) && opt.Attach {
			return c.attach(ctx, opt.Database)
		}
		return nil, err
	}
	defer func() {
		if err != nil {
			c.releaseLock()
		}
	}()

	if cv == "" {
		t0 := time.Now()
		if err := c.initdb(ctx, opt.Fast); err != nil {
			return nil, err
		}
		c.log.Info("created PostgreSQL cluster", "version", bv, "elapsed", time.Since(t0).Round(time.Millisecond))
	}

	running, pid, err := c.running(ctx)
	if err != nil {
		return nil, err
	}
	if running {
		c.adopted = true
		info, err := readPidFile(c.dataDir)
		if err != nil {
			return nil, fmt.Errorf("localpg: %w", err)
		}
		c.socketDir, c.port = info.socketDir, info.port
		c.log.Info("reusing PostgreSQL left running by an earlier process", "pid", pid, "socket_dir", c.socketDir)
	} else {
		if err := c.start(ctx, opt.Fast); err != nil {
			return nil, err
		}
	}
	defer func() {
		if err != nil {
			sctx, cancel := context.WithTimeout(context.Background(), startTimeout)
			defer cancel()
			_ = c.Stop(sctx)
		}
	}()
	if opt.StopOnExit {
		if err := c.startWatchdog(); err != nil {
			return nil, err
		}
	}
	if err := c.waitReady(ctx); err != nil {
		return nil, err
	}
	db := opt.Database
	if db == "" {
		db = "lagwright"
	}
	if db != "-" {
		if err := c.EnsureDatabase(ctx, db); err != nil {
			return nil, err
		}
	}
	return c, nil
}

// DataDir is where the cluster lives (after any relocation).
func (c *Cluster) DataDir() string { return c.dataDir }

// SocketDir is the directory of the cluster's unix socket.
func (c *Cluster) SocketDir() string { return c.socketDir }

// Adopted reports whether Start found the cluster already running (left by a
// process that did not stop it) and took it over.
func (c *Cluster) Adopted() bool { return c.adopted }

// DSN returns a connection URL for database dbname over the unix socket.
func (c *Cluster) DSN(dbname string) string {
	q := url.Values{}
	q.Set("host", c.socketDir)
	q.Set("port", strconv.Itoa(c.port))
	q.Set("sslmode", "disable")
	u := url.URL{Scheme: "postgres", User: url.User(superuser), Host: "", Path: "/" + dbname, RawQuery: q.Encode()}
	return u.String()
}

// EnsureDatabase creates database name when it does not exist.
func (c *Cluster) EnsureDatabase(ctx context.Context, name string) error {
	conn, err := pgx.Connect(ctx, c.DSN("postgres"))
	if err != nil {
		return fmt.Errorf("localpg: connect: %w", err)
	}
	defer conn.Close(context.Background())
	var exists bool
	if err := conn.QueryRow(ctx, `SELECT EXISTS (SELECT 1 FROM pg_database WHERE datname = $1)`, name).Scan(&exists); err != nil {
		return fmt.Errorf("localpg: look up database %q: %w", name, err)
	}
	if exists {
		return nil
	}
	if _, err := conn.Exec(ctx, `CREATE DATABASE `+pgx.Identifier{name}.Sanitize()); err != nil {
		return fmt.Errorf("localpg: create database %q: %w", name, err)
	}
	c.log.Info("created database", "database", name)
	return nil
}

// Stop stops the cluster (pg_ctl stop -m fast: sessions are disconnected, and
// committed work is safe). Calling it again does nothing. An attached cluster is
// left running for the process that owns it.
func (c *Cluster) Stop(ctx context.Context) error {
	c.mu.Lock()
	defer c.mu.Unlock()
	if c.stopped || c.attached {
		c.stopped = true
		return nil
	}
	t0 := time.Now()
	info, _ := readPidFile(c.dataDir)
	out, err := c.pgctl(ctx, "stop", "-D", c.dataDir, "-m", "fast", "-w", "-t", "60", "-s")
	if err != nil {
		if running, _, serr := c.running(ctx); serr != nil || running {
			return fmt.Errorf("localpg: pg_ctl stop: %w: %s", err, out)
		}
	}
	// pg_ctl returns once postmaster.pid is gone; the process exits a moment later.
	for deadline := time.Now().Add(5 * time.Second); info.pid > 0 && isLive(info.pid) && time.Now().Before(deadline); {
		time.Sleep(10 * time.Millisecond)
	}
	c.stopped = true
	c.stopWatchdog()
	c.releaseLock()
	c.log.Info("stopped PostgreSQL", "elapsed", time.Since(t0).Round(time.Millisecond))
	return nil
}

func (c *Cluster) bin(name string) string { return filepath.Join(c.binDir, name) }

func (c *Cluster) pgctl(ctx context.Context, args ...string) (string, error) {
	cmd := c.user.command(ctx, c.bin("pg_ctl"), args...)
	out, err := cmd.CombinedOutput()
	return strings.TrimSpace(string(out)), err
}

// initdb creates the cluster in a sibling folder and renames it into place, so an
// interrupted first start never leaves a half-made cluster behind.
func (c *Cluster) initdb(ctx context.Context, fast bool) error {
	if entries, err := os.ReadDir(c.dataDir); err == nil && len(entries) > 0 {
		return fmt.Errorf("localpg: %s is not empty and holds no PostgreSQL cluster (no PG_VERSION); refusing to use it", c.dataDir)
	}
	tmp := c.dataDir + ".initdb"
	if err := os.RemoveAll(tmp); err != nil {
		return fmt.Errorf("localpg: %w", err)
	}
	if err := os.Mkdir(tmp, 0o700); err != nil {
		return fmt.Errorf("localpg: %w", err)
	}
	if err := c.user.chown(tmp); err != nil {
		return fmt.Errorf("localpg: give %s to the database user: %w", tmp, err)
	}
	args := []string{"-D", tmp, "-U", superuser, "-E", "UTF8", "--locale=C.UTF-8",
		"--auth-local=trust", "--auth-host=reject"}
	if fast {
		args = append(args, "--no-sync")
	}
	out, err := c.user.command(ctx, c.bin("initdb"), args...).CombinedOutput()
	if err != nil {
		_ = os.RemoveAll(tmp)
		return fmt.Errorf("localpg: initdb: %w: %s", err, tail(string(out), 2000))
	}
	f, err := os.OpenFile(filepath.Join(tmp, "postgresql.conf"), os.O_APPEND|os.O_WRONLY, 0)
	if err != nil {
		return fmt.Errorf("localpg: %w", err)
	}
	_, err = fmt.Fprintf(f, "\n# Settings lagwright writes at each start (socket, logging); keep this line last.\ninclude_if_exists = '%s'\n", confName)
	if cerr := f.Close(); err == nil {
		err = cerr
	}
	if err != nil {
		return fmt.Errorf("localpg: %w", err)
	}
	_ = os.Remove(c.dataDir) // an empty folder made by hand
	if err := os.Rename(tmp, c.dataDir); err != nil {
		return fmt.Errorf("localpg: %w", err)
	}
	return nil
}

const confName = "lagwright.conf"

func (c *Cluster) writeConf(fast bool) error {
	var b strings.Builder
	b.WriteString("# Written by lagwright at every start; changes here are lost. Use ALTER SYSTEM for your own settings.\n")
	fmt.Fprintf(&b, "listen_addresses = ''\n")
	fmt.Fprintf(&b, "unix_socket_directories = '%s'\n", strings.ReplaceAll(c.socketDir, "'", "''"))
	fmt.Fprintf(&b, "unix_socket_permissions = 0700\n")
	fmt.Fprintf(&b, "port = %d\n", c.port)
	b.WriteString("logging_collector = on\nlog_directory = 'log'\nlog_filename = 'postgresql-%a.log'\n")
	b.WriteString("log_rotation_age = 1d\nlog_rotation_size = 0\nlog_truncate_on_rotation = on\n")
	if fast {
		b.WriteString("fsync = off\nsynchronous_commit = off\nfull_page_writes = off\n")
	}
	path := filepath.Join(c.dataDir, confName)
	if err := os.WriteFile(path, []byte(b.String()), 0o600); err != nil {
		return err
	}
	return c.user.chown(path)
}

func (c *Cluster) start(ctx context.Context, fast bool) error {
	sock, err := socketDirFor(c.dataDir)
	if err != nil {
		return fmt.Errorf("localpg: %w", err)
	}
	c.socketDir = sock
	if sock != c.dataDir {
		if err := ensurePrivateDir(sock, c.user); err != nil {
			return fmt.Errorf("localpg: socket directory: %w", err)
		}
		c.log.Info("data path too long for a unix socket; socket placed in a short directory", "socket_dir", sock)
	}
	if err := c.writeConf(fast); err != nil {
		return fmt.Errorf("localpg: %w", err)
	}
	pidFile := filepath.Join(c.dataDir, "postmaster.pid")
	if _, err := os.Stat(pidFile); err == nil {
		c.log.Warn("removing stale postmaster.pid (its server is gone)")
		if err := os.Remove(pidFile); err != nil {
			return fmt.Errorf("localpg: remove stale postmaster.pid: %w", err)
		}
	}
	t0 := time.Now()
	logFile := filepath.Join(c.dataDir, "startup.log")
	if out, err := c.pgctl(ctx, "start", "-D", c.dataDir, "-l", logFile, "-w", "-t", strconv.Itoa(int(startTimeout/time.Second)), "-s"); err != nil {
		b, _ := os.ReadFile(logFile)
		return fmt.Errorf("localpg: pg_ctl start: %w: %s\n%s", err, out, tail(string(b), 2000))
	}
	c.log.Info("started PostgreSQL", "socket_dir", c.socketDir, "elapsed", time.Since(t0).Round(time.Millisecond))
	return nil
}

// running asks pg_ctl status whether the cluster's server is up, and checks that
// the process named in postmaster.pid really is a postgres of this data directory
// (the pid of a dead server may have been reused by another process).
func (c *Cluster) running(ctx context.Context) (bool, int, error) {
	out, err := c.pgctl(ctx, "status", "-D", c.dataDir)
	var ee *exec.ExitError
	switch {
	case err == nil:
	case errors.As(err, &ee) && ee.ExitCode() == 3:
		return false, 0, nil
	default:
		return false, 0, fmt.Errorf("localpg: pg_ctl status: %w: %s", err, out)
	}
	info, err := readPidFile(c.dataDir)
	if err != nil {
		return false, 0, nil
	}
	if !isPostmasterOf(info.pid, c.dataDir) {
		return false, 0, nil
	}
	return true, info.pid, nil
}

func (c *Cluster) waitReady(ctx context.Context) error {
	ctx, cancel := context.WithTimeout(ctx, startTimeout)
	defer cancel()
	for {
		conn, err := pgx.Connect(ctx, c.DSN("postgres"))
		if err == nil {
			err = conn.Ping(ctx)
			conn.Close(context.Background())
			if err == nil {
				return nil
			}
		}
		select {
		case <-ctx.Done():
			return fmt.Errorf("localpg: PostgreSQL in %s did not accept connections: %w", c.dataDir, err)
		case <-time.After(50 * time.Millisecond):
		}
	}
}

// errLocked: another live process holds the cluster's lock.
var errLocked = errors.New("cluster in use")

// attach connects to the cluster a live app owns, without owning it.
func (c *Cluster) attach(ctx context.Context, db string) (*Cluster, error) {
	info, err := readPidFile(c.dataDir)
	if err != nil || !isPostmasterOf(info.pid, c.dataDir) {
		return nil, fmt.Errorf("localpg: the database in %s is locked by another process but its server is not running", c.dataDir)
	}
	c.socketDir, c.port, c.attached = info.socketDir, info.port, true
	if err := c.waitReady(ctx); err != nil {
		return nil, err
	}
	if db == "" {
		db = "lagwright"
	}
	if db != "-" {
		if err := c.EnsureDatabase(ctx, db); err != nil {
			return nil, err
		}
	}
	c.log.Info("using PostgreSQL owned by the running app", "socket_dir", c.socketDir)
	return c, nil
}

// takeLock holds an exclusive flock on <DataDir>.lock for the life of the Cluster,
// so two live processes never share (and stop) one cluster. The kernel releases it
// when the holder dies, however it dies.
func (c *Cluster) takeLock() error {
	path := c.dataDir + ".lock"
	f, err := os.OpenFile(path, os.O_RDWR|os.O_CREATE, 0o600)
	if err != nil {
		return fmt.Errorf("localpg: %w", err)
	}
	if err := syscall.Flock(int(f.Fd()), syscall.LOCK_EX|syscall.LOCK_NB); err != nil {
		f.Close()
		if errors.Is(err, syscall.EWOULDBLOCK) {
			return fmt.Errorf("localpg: another running process is using the database in %s: %w", c.dataDir, errLocked)
		}
		return fmt.Errorf("localpg: lock %s: %w", path, err)
	}
	c.lock = f
	return nil
}

func (c *Cluster) releaseLock() {
	if c.lock != nil {
		c.lock.Close()
		c.lock = nil
	}
}

// startWatchdog runs, as the database user, a shell that waits for end-of-file on a
// pipe whose only writer is this process, then stops the cluster. The kernel closes
// the pipe when this process exits, so the cluster stops however the process ends.
func (c *Cluster) startWatchdog() error {
	r, w, err := os.Pipe()
	if err != nil {
		return fmt.Errorf("localpg: watchdog: %w", err)
	}
	cmd := c.user.command(context.Background(), "/bin/sh", "-c",
		`cat >/dev/null; exec "$0" stop -D "$1" -m fast -w -s >/dev/null 2>&1`, c.bin("pg_ctl"), c.dataDir)
	cmd.Cancel = nil
	cmd.Stdin = r
	if err := cmd.Start(); err != nil {
		r.Close()
		w.Close()
		return fmt.Errorf("localpg: watchdog: %w", err)
	}
	r.Close()
	c.watchdog, c.wdPipe = cmd, w
	return nil
}

func (c *Cluster) stopWatchdog() {
	if c.watchdog == nil {
		return
	}
	_ = syscall.Kill(-c.watchdog.Process.Pid, syscall.SIGKILL) // its process group: sh and cat
	c.wdPipe.Close()
	_ = c.watchdog.Wait()
	c.watchdog, c.wdPipe = nil, nil
}

// hashOf names per-data-directory places outside it (socket and fallback dirs).
func hashOf(path string) string {
	sum := sha256.Sum256([]byte(path))
	return hex.EncodeToString(sum[:8])
}

func tail(s string, n int) string {
	s = strings.TrimSpace(s)
	if len(s) > n {
		return "…" + s[len(s)-n:]
	}
	return s
}
