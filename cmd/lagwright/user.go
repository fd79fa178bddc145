package main

import (
	"bufio"
	"context"
	"errors"
	"fmt"
	"io"
	"strings"

	"lagwright/store"
)

// userCmd manages the accounts of the web app:
//
//	lagwright [flags] user add <name> [--role editor|viewer]   (password on stdin)
//	lagwright [flags] user passwd <name> [--role editor|viewer] (password on stdin)
//	lagwright [flags] user remove <name>
//	lagwright [flags] user list
//
// The password is the first line of standard input, with no prompt, so a script can
// pipe it (`printf '%s\n' "$PW" | lagwright user add ana`). At least 10 characters.
// Changing a password or removing a user ends the user's sessions.
func userCmd(ctx context.Context, args []string, getenv func(string) string, stdin io.Reader, stdout, stderr io.Writer) (err error) {
	cfg, rest, err := parseConfig("user", args, getenv, stderr)
	if err != nil {
		return err
	}
	if len(rest) == 0 {
		return usageError{"user: want add, passwd, remove or list"}
	}
	action, rest := rest[0], rest[1:]
	var name, role string
	for i := 0; i < len(rest); i++ {
		a := rest[i]
		switch {
		case a == "--role" || a == "-role":
			if i+1 == len(rest) {
				return usageError{"user: --role needs a value (editor or viewer)"}
			}
			i++
			role = rest[i]
		case strings.HasPrefix(a, "--role=") || strings.HasPrefix(a, "-role="):
			_, role, _ = strings.Cut(a, "=")
		case strings.HasPrefix(a, "-"):
			return usageError{fmt.Sprintf("user: unknown flag %q", a)}
		case name == "":
			name = a
		default:
			return usageError{fmt.Sprintf("user: unexpected argument %q", a)}
		}
	}
	switch action {
	case "add", "passwd", "remove":
		if err := store.ValidUserName(name); err != nil {
			return usageError{"user: " + err.Error()}
		}
	case "list":
		if name != "" {
			return usageError{"user list takes no name"}
		}
	default:
		return usageError{fmt.Sprintf("user: unknown action %q: want add, passwd, remove or list", action)}
	}
	if role != "" && action != "add" && action != "passwd" {
		return usageError{"user: --role goes with add or passwd"}
	}
	if role != "" {
		if err := store.ValidRole(role); err != nil {
			return usageError{"user: " + err.Error()}
		}
	}
	var password string
	if action == "add" || action == "passwd" {
		password, err = readPassword(stdin)
		if err != nil {
			return err
		}
		if err := store.ValidPassword(password); err != nil {
			return usageError{"user: " + err.Error()}
		}
	}

	log := newLogger(stderr, cfg.LogLevel)
	st, closeStore, err := openStore(ctx, cfg, log, attachCluster)
	if err != nil {
		return err
	}
	defer func() { err = errors.Join(err, closeStore()) }()
	if _, err := st.Migrate(ctx, store.MigrateUp); err != nil {
		return err
	}
	switch action {
	case "add":
		if role == "" {
			role = store.RoleEditor
		}
		u, err := st.CreateUser(ctx, name, password, role)
		if errors.Is(err, store.ErrUserExists) {
			return fmt.Errorf("user %q already exists (use `lagwright user passwd`)", name)
		}
		if err != nil {
			return err
		}
		fmt.Fprintf(stdout, "added user %s (%s)\n", u.Name, u.Role)
	case "passwd":
		if err := st.SetPassword(ctx, name, password, role); err != nil {
			if errors.Is(err, store.ErrNotFound) {
				return fmt.Errorf("no user %q", name)
			}
			return err
		}
		fmt.Fprintf(stdout, "changed the password of %s; their sessions are ended\n", name)
	case "remove":
		if err := st.DeleteUser(ctx, name); err != nil {
			if errors.Is(err, store.ErrNotFound) {
				return fmt.Errorf("no user %q", name)
			}
			return err
		}
		fmt.Fprintf(stdout, "removed user %s\n", name)
	case "list":
		users, err := st.Users(ctx)
		if err != nil {
			return err
		}
		for _, u := range users {
			fmt.Fprintf(stdout, "%s\t%s\t%s\n", u.Name, u.Role, u.CreatedAt.Format("2006-01-02"))
		}
	}
	return nil
}

// readPassword reads the first line of r (without its line ending).
func readPassword(r io.Reader) (string, error) {
	line, err := bufio.NewReader(io.LimitReader(r, 4096)).ReadString('\n')
	if err != nil && !errors.Is(err, io.EOF) {
		return "", fmt.Errorf("read password: %w", err)
	}
	line = strings.TrimRight(line, "\r\n")
	if line == "" {
		return "", usageError{"user: give the password as the first line of standard input"}
	}
	return line, nil
}
