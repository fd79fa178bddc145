package main

import (
	"context"
	"errors"
	"fmt"
	"io"

	"lagwright/store"
)

func migrateCmd(ctx context.Context, args []string, getenv func(string) string, stdout, stderr io.Writer) (err error) {
	cfg, rest, err := parseConfig("migrate", args, getenv, stderr)
	if err != nil {
		return err
	}
	if len(rest) != 1 {
		return usageError{"migrate needs one of: up, down, version"}
	}
	var dir store.Direction
	switch rest[0] {
	case "up":
		dir = store.MigrateUp
	case "down":
		dir = store.MigrateDown
	case "version":
		dir = store.MigrateVersion
	default:
		return usageError{fmt.Sprintf("migrate %q: want up, down or version", rest[0])}
	}
	log := newLogger(stderr, cfg.LogLevel)
	st, closeStore, err := openStore(ctx, cfg, log, attachCluster)
	if err != nil {
		return err
	}
	defer func() { err = errors.Join(err, closeStore()) }()
	v, err := st.Migrate(ctx, dir)
	if err != nil {
		return err
	}
	fmt.Fprintln(stdout, "schema version:", v)
	return nil
}
