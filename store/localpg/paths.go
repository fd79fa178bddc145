package localpg

import (
	"errors"
	"fmt"
	"log/slog"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"syscall"
)

func parentDir(p string) string { return filepath.Dir(p) }

// reachableDataDir returns requested when the database user can reach it, else a
// place under fallback (default /var/tmp, then /tmp) keyed by a hash of requested,
// so the same app folder always maps to the same cluster.
func reachableDataDir(requested, fallback string, u dbUser, log *slog.Logger) (string, error) {
	if u.canTraverse(parentDir(requested)) {
		return requested, nil
	}
	bases := []string{fallback}
	if fallback == "" {
		bases = []string{"/var/tmp", os.TempDir()}
	}
	for _, base := range bases {
		if !u.canTraverse(base) {
			continue
		}
		home := filepath.Join(base, "lagwright-"+hashOf(requested))
		if err := ensureDir(home, 0o755); err != nil {
			return "", err
		}
		dir := filepath.Join(home, "pg")
		log.Warn("the database user cannot reach the data folder; the PostgreSQL cluster lives elsewhere",
			"requested", requested, "db_user", u.name, "pgdata", dir)
		return dir, nil
	}
	return "", fmt.Errorf("the database user %q cannot reach %s nor any fallback (%s); set LAGWRIGHT_DATA to a folder it can reach, or DATABASE_URL",
		u.name, requested, strings.Join(bases, ", "))
}

// socketDirFor returns the data directory itself when its socket path fits the
// unix socket limit, else a short per-cluster directory under /tmp.
func socketDirFor(dataDir string) (string, error) {
	if len(filepath.Join(dataDir, ".s.PGSQL."+strconv.Itoa(defaultPort))) <= maxSocketPath {
		return dataDir, nil
	}
	return filepath.Join("/tmp", "lagwright-"+hashOf(dataDir)), nil
}

// ensureDir makes dir (mode perm) or accepts an existing one that is a real
// directory owned by us, so a planted symlink in a shared folder is refused.
func ensureDir(dir string, perm os.FileMode) error {
	fi, err := os.Lstat(dir)
	if errors.Is(err, os.ErrNotExist) {
		if err := os.Mkdir(dir, perm); err != nil && !errors.Is(err, os.ErrExist) {
			return err
		}
		return nil
	}
	if err != nil {
		return err
	}
	if !fi.IsDir() {
		return fmt.Errorf("%s exists and is not a directory", dir)
	}
	if st, ok := fi.Sys().(*syscall.Stat_t); ok && int(st.Uid) != os.Geteuid() {
		return fmt.Errorf("%s is owned by uid %d, not by us; remove it", dir, st.Uid)
	}
	return nil
}

// ensurePrivateDir makes dir 0700 and owned by the database user, or checks that
// an existing one is.
func ensurePrivateDir(dir string, u dbUser) error {
	fi, err := os.Lstat(dir)
	if errors.Is(err, os.ErrNotExist) {
		if err := os.Mkdir(dir, 0o700); err != nil {
			return err
		}
		return u.chown(dir)
	}
	if err != nil {
		return err
	}
	st, ok := fi.Sys().(*syscall.Stat_t)
	if !fi.IsDir() || !ok || int(st.Uid) != u.uid {
		return fmt.Errorf("%s exists but is not a directory owned by uid %d; remove it", dir, u.uid)
	}
	return nil
}

type pidInfo struct {
	pid       int
	port      int
	socketDir string
}

// readPidFile parses postmaster.pid: pid, data dir, start time, port, socket dir, …
func readPidFile(dataDir string) (pidInfo, error) {
	b, err := os.ReadFile(filepath.Join(dataDir, "postmaster.pid"))
	if err != nil {
		return pidInfo{}, err
	}
	lines := strings.Split(string(b), "\n")
	if len(lines) < 5 {
		return pidInfo{}, fmt.Errorf("postmaster.pid: too short")
	}
	pid, err := strconv.Atoi(strings.TrimSpace(lines[0]))
	if err != nil {
		return pidInfo{}, fmt.Errorf("postmaster.pid: pid: %w", err)
	}
	port, err := strconv.Atoi(strings.TrimSpace(lines[3]))
	if err != nil {
		return pidInfo{}, fmt.Errorf("postmaster.pid: port: %w", err)
	}
	return pidInfo{pid: pid, port: port, socketDir: strings.TrimSpace(lines[4])}, nil
}

// isPostmasterOf reports whether process pid is a postgres started on dataDir.
// Where /proc cannot tell, it trusts pg_ctl's answer.
func isPostmasterOf(pid int, dataDir string) bool {
	b, err := os.ReadFile(fmt.Sprintf("/proc/%d/cmdline", pid))
	if err != nil {
		return !errors.Is(err, os.ErrNotExist)
	}
	args := strings.Split(strings.TrimRight(string(b), "\x00"), "\x00")
	if len(args) == 0 || !strings.HasPrefix(filepath.Base(args[0]), "postgres") {
		return false
	}
	for _, a := range args[1:] {
		if a == dataDir {
			return true
		}
	}
	return false
}

// RunningPIDs lists the live postgres server processes started on dataDir (the
// postmasters, found through /proc), for diagnostics and tests.
func RunningPIDs(dataDir string) ([]int, error) {
	abs, err := filepath.Abs(dataDir)
	if err != nil {
		return nil, err
	}
	entries, err := os.ReadDir("/proc")
	if err != nil {
		return nil, err
	}
	var pids []int
	for _, e := range entries {
		pid, err := strconv.Atoi(e.Name())
		if err != nil {
			continue
		}
		if !isLive(pid) {
			continue
		}
		if b, err := os.ReadFile(filepath.Join("/proc", e.Name(), "cmdline")); err == nil && len(b) > 0 && isPostmasterOf(pid, abs) {
			pids = append(pids, pid)
		}
	}
	return pids, nil
}

// isLive reports whether process pid exists and has not exited: a zombie ("Z" in
// /proc/<pid>/stat) has exited and only waits for its parent to reap it.
func isLive(pid int) bool {
	stat, err := os.ReadFile(fmt.Sprintf("/proc/%d/stat", pid))
	if err != nil {
		return false
	}
	i := strings.LastIndexByte(string(stat), ')')
	return i > 0 && i+2 < len(stat) && stat[i+2] != 'Z' && stat[i+2] != 'X'
}
