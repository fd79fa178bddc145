package localpg

import (
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
)

// ErrNoBinaries is returned (wrapped) when no PostgreSQL server binaries can be found.
var ErrNoBinaries = errors.New("PostgreSQL server binaries (initdb, pg_ctl, postgres) not found on PATH or under /usr/lib/postgresql/*/bin: " +
	"install the Debian package `postgresql` (apt-get install -y postgresql), " +
	"or set DATABASE_URL to use an existing PostgreSQL server")

// debianRoot is where Debian and Ubuntu install each PostgreSQL major version.
const debianRoot = "/usr/lib/postgresql"

// findBinDir returns the directory holding initdb, pg_ctl and postgres. When want is
// not empty (the major version of an existing cluster), a Debian directory of that
// version is preferred, so a cluster is never opened by a newer major version.
// Otherwise: the directory of initdb on PATH, then the highest
// /usr/lib/postgresql/<version>/bin.
func findBinDir(want, root string) (string, error) {
	if want != "" {
		dir := filepath.Join(root, want, "bin")
		if hasBinaries(dir) {
			return dir, nil
		}
	}
	if p, err := exec.LookPath("initdb"); err == nil {
		// Debian puts symlinks in /usr/bin or /usr/local/bin; resolve them so pg_ctl
		// and postgres are taken from the same version directory.
		if real, err := filepath.EvalSymlinks(p); err == nil {
			p = real
		}
		if dir := filepath.Dir(p); hasBinaries(dir) {
			return dir, nil
		}
	}
	dirs, _ := filepath.Glob(filepath.Join(root, "*", "bin"))
	sort.Slice(dirs, func(i, j int) bool { return versionOf(dirs[i]) > versionOf(dirs[j]) })
	for _, dir := range dirs {
		if hasBinaries(dir) {
			return dir, nil
		}
	}
	return "", ErrNoBinaries
}

func hasBinaries(dir string) bool {
	for _, name := range []string{"initdb", "pg_ctl", "postgres"} {
		fi, err := os.Stat(filepath.Join(dir, name))
		if err != nil || fi.IsDir() || fi.Mode()&0o111 == 0 {
			return false
		}
	}
	return true
}

// versionOf turns /usr/lib/postgresql/15/bin into 15.0 and 9.6 into 9.6 for sorting.
func versionOf(binDir string) float64 {
	v := filepath.Base(filepath.Dir(binDir))
	f, err := strconv.ParseFloat(v, 64)
	if err != nil {
		return -1
	}
	return f
}

// clusterVersion reads PG_VERSION of an existing cluster ("" when there is none).
func clusterVersion(dataDir string) string {
	b, err := os.ReadFile(filepath.Join(dataDir, "PG_VERSION"))
	if err != nil {
		return ""
	}
	return strings.TrimSpace(string(b))
}

// binVersion returns the major version of the binaries in dir, e.g. "15".
func binVersion(dir string) (string, error) {
	out, err := exec.Command(filepath.Join(dir, "pg_ctl"), "--version").Output()
	if err != nil {
		return "", fmt.Errorf("pg_ctl --version: %w", err)
	}
	// "pg_ctl (PostgreSQL) 15.18 (Debian 15.18-0+deb12u1)"
	f := strings.Fields(string(out))
	if len(f) < 3 {
		return "", fmt.Errorf("pg_ctl --version: unexpected output %q", out)
	}
	return strings.SplitN(f[2], ".", 2)[0], nil
}
