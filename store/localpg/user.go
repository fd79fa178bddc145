package localpg

import (
	"context"
	"fmt"
	"os"
	"os/exec"
	"os/user"
	"strconv"
	"strings"
	"syscall"
)

// dbUser is the operating-system account that owns the cluster and runs its
// processes. PostgreSQL refuses to run as root, so when the app runs as root the
// cluster runs as an unprivileged account (by default "postgres", which the Debian
// package creates); otherwise it runs as the app's own user.
type dbUser struct {
	name   string
	uid    int
	gid    int
	groups []int
	self   bool // the app's own user: no credential switch, no chown
}

func resolveUser(name string) (dbUser, error) {
	if os.Geteuid() != 0 {
		return dbUser{uid: os.Geteuid(), gid: os.Getegid(), groups: selfGroups(), self: true}, nil
	}
	if name == "" {
		name = "postgres"
	}
	u, err := user.Lookup(name)
	if err != nil {
		return dbUser{}, fmt.Errorf("running as root, and PostgreSQL refuses to run as root: "+
			"need the unprivileged system user %q to run the database (installed with the Debian package `postgresql`), "+
			"or set DATABASE_URL: %w", name, err)
	}
	uid, _ := strconv.Atoi(u.Uid)
	gid, _ := strconv.Atoi(u.Gid)
	if uid == 0 {
		return dbUser{}, fmt.Errorf("database user %q is root; PostgreSQL refuses to run as root", name)
	}
	d := dbUser{name: name, uid: uid, gid: gid, groups: []int{gid}}
	if ids, err := u.GroupIds(); err == nil {
		for _, s := range ids {
			if g, err := strconv.Atoi(s); err == nil && g != gid {
				d.groups = append(d.groups, g)
			}
		}
	}
	return d, nil
}

func selfGroups() []int {
	gs, _ := os.Getgroups()
	return append(gs, os.Getegid())
}

// command builds a command run as the database user, in its own process group (so a
// Ctrl-C at the terminal reaches the app, which then stops the database in order),
// with PG* variables removed from the environment so they cannot redirect it.
func (u dbUser) command(ctx context.Context, name string, args ...string) *exec.Cmd {
	cmd := exec.CommandContext(ctx, name, args...)
	cmd.Dir = "/" // the app's working directory may be unreadable to the database user
	cmd.Env = cleanEnv()
	cmd.SysProcAttr = &syscall.SysProcAttr{Setpgid: true}
	if !u.self {
		groups := make([]uint32, len(u.groups))
		for i, g := range u.groups {
			groups[i] = uint32(g)
		}
		cmd.SysProcAttr.Credential = &syscall.Credential{Uid: uint32(u.uid), Gid: uint32(u.gid), Groups: groups}
		cmd.Env = append(cmd.Env, "HOME=/", "USER="+u.name, "LOGNAME="+u.name)
	}
	// On cancellation ask politely first: initdb and pg_ctl clean up after SIGTERM.
	cmd.Cancel = func() error { return cmd.Process.Signal(syscall.SIGTERM) }
	return cmd
}

func cleanEnv() []string {
	var env []string
	for _, kv := range os.Environ() {
		k, _, _ := strings.Cut(kv, "=")
		switch {
		case strings.HasPrefix(k, "PG"), k == "HOME", k == "USER", k == "LOGNAME":
			continue
		}
		env = append(env, kv)
	}
	return append(env, "LC_ALL=C.UTF-8", "TZ=UTC")
}

// chown gives path to the database user (a no-op when the cluster runs as the app's
// own user).
func (u dbUser) chown(path string) error {
	if u.self {
		return nil
	}
	return os.Lchown(path, u.uid, u.gid)
}

// canTraverse reports whether the user may search every existing directory from the
// root down to dir (the permission needed to reach a cluster placed inside it).
// It judges by the mode bits and owners; ACLs are not consulted.
func (u dbUser) canTraverse(dir string) bool {
	if u.self {
		return true
	}
	p := dir
	var chain []string
	for {
		chain = append(chain, p)
		parent := parentDir(p)
		if parent == p {
			break
		}
		p = parent
	}
	for _, d := range chain {
		fi, err := os.Stat(d)
		if err != nil {
			continue // not created yet: we create it 0755
		}
		st, ok := fi.Sys().(*syscall.Stat_t)
		if !ok {
			continue
		}
		mode := fi.Mode().Perm()
		switch {
		case int(st.Uid) == u.uid:
			if mode&0o100 == 0 {
				return false
			}
		case u.inGroup(int(st.Gid)):
			if mode&0o010 == 0 {
				return false
			}
		default:
			if mode&0o001 == 0 {
				return false
			}
		}
	}
	return true
}

func (u dbUser) inGroup(gid int) bool {
	for _, g := range u.groups {
		if g == gid {
			return true
		}
	}
	return false
}
