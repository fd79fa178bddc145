package main

import (
	"context"
	"errors"
	"fmt"
	"io"

	"lagwright/demo"
	"lagwright/store"
)

// demoCmd creates the demo project (package demo: an invented brewery expansion with
// about forty-five lines) in the database serve uses, and prints its id.
func demoCmd(ctx context.Context, args []string, getenv func(string) string, stdout, stderr io.Writer) (err error) {
	cfg, rest, err := parseConfig("demo", args, getenv, stderr)
	if err != nil {
		return err
	}
	if len(rest) > 0 {
		return usageError{fmt.Sprintf("demo takes no arguments, got %q", rest)}
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
	if err := st.SeedCatalog(ctx); err != nil {
		return err
	}
	p, err := demo.Create(ctx, st)
	if err != nil {
		return err
	}
	fmt.Fprintf(stdout, "created project %d: %s (%d lines)\n", p.ID, p.Name, len(demo.Lines()))
	return nil
}
