// Command lagwright is the Lagwright server and its tools.
//
//	lagwright [serve]              run the web app (the default)
//	lagwright migrate up|down|version
//	lagwright calc < line.json     analyse one line (JSON in, JSON out; no database)
//	lagwright demo                 create the demo project
//	lagwright user add|passwd|remove|list <name> [--role editor|viewer]
//	lagwright version
//
// Configuration comes from flags, then the environment: LAGWRIGHT_ADDR,
// DATABASE_URL, LAGWRIGHT_DATA, LAGWRIGHT_LOG_LEVEL. Exit status: 0 ok, 1 failure,
// 2 usage error.
package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
)

func main() {
	err := run(context.Background(), os.Args[1:], os.Getenv, os.Stdin, os.Stdout, os.Stderr)
	os.Exit(exitCode(err, os.Stderr))
}

// exitCode reports err and turns it into the process's exit status.
func exitCode(err error, stderr io.Writer) int {
	if err == nil {
		return 0
	}
	var es exitStatus
	if errors.As(err, &es) {
		return es.code
	}
	fmt.Fprintln(stderr, "lagwright:", err)
	var ue usageError
	if errors.As(err, &ue) {
		fmt.Fprintln(stderr, "Run 'lagwright help' for usage.")
		return 2
	}
	return 1
}

// run is the whole program, with its dependencies passed in (no globals), so tests
// can run it in-process. Each subcommand is one case.
func run(ctx context.Context, args []string, getenv func(string) string, stdin io.Reader, stdout, stderr io.Writer) error {
	cmd := "serve"
	if len(args) > 0 {
		cmd, args = args[0], args[1:]
	}
	switch cmd {
	case "serve":
		return serve(ctx, args, getenv, stderr)
	case "migrate":
		return migrateCmd(ctx, args, getenv, stdout, stderr)
	case "calc":
		return calcCmd(args, stdin, stdout)
	case "demo":
		return demoCmd(ctx, args, getenv, stdout, stderr)
	case "user":
		return userCmd(ctx, args, getenv, stdin, stdout, stderr)
	case "version":
		fmt.Fprintln(stdout, "lagwright", version())
		return nil
	case "help", "-h", "-help", "--help":
		fmt.Fprint(stdout, usage)
		return nil
	default:
		return usageError{fmt.Sprintf("unknown command %q", cmd)}
	}
}

const usage = `Usage: lagwright <command> [flags]

Commands:
  serve                     run the web app (default)
  migrate up|down|version   apply, revert, or show the database schema
  calc                      analyse one line: JSON on stdin, JSON on stdout (exit 2 on bad input)
  demo                      create the demo project (an invented brewery expansion)
  user add|passwd <name> [--role editor|viewer]   add a user or set the password (first line of stdin)
  user remove <name> | user list                  remove a user (ends their sessions), list users
  version                   print the version

Flags and environment (flags win):
  -addr          LAGWRIGHT_ADDR        listen address (default 127.0.0.1:8080)
  -database-url  DATABASE_URL          PostgreSQL URL; unset: a private cluster in the data folder
  -data          LAGWRIGHT_DATA        data folder (default ./data)
  -log-level     LAGWRIGHT_LOG_LEVEL   debug, info, warn or error (default info)
                 LAGWRIGHT_AUTH        auto (login unless loopback), required, or off (loopback only)
                 LAGWRIGHT_SECURE_COOKIES  1: session cookie always Secure (TLS at a proxy)
`

// usageError marks a mistake in the command line (exit status 2).
type usageError struct{ msg string }

func (e usageError) Error() string { return e.msg }
