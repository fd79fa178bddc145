package main

import (
	"context"
	"errors"
	"fmt"
	"log/slog"
	"os"
	"path/filepath"
	"time"

	"lagwright/store"
	"lagwright/store/localpg"
)

// How a command uses the private cluster: the app owns it; short-lived commands
// (demo, migrate, user) attach to it when a running app owns it.
const (
	ownCluster    = false
	attachCluster = true
)

// openStore connects to DATABASE_URL, or when it is unset starts the private
// cluster in <data>/pg. The returned close function closes the store and stops the
// cluster (with its own timeout: it runs after ctx is cancelled) unless it was
// attached to a running app's cluster.
func openStore(ctx context.Context, cfg config, log *slog.Logger, attach bool) (*store.Store, func() error, error) {
	if cfg.DatabaseURL != "" {
		st, err := store.OpenWith(ctx, cfg.DatabaseURL, cfg.DB)
		if err != nil {
			return nil, nil, err
		}
		return st, func() error { st.Close(); return nil }, nil
	}
	if err := checkDataDir(cfg.DataDir); err != nil {
		return nil, nil, err
	}
	cl, err := localpg.Start(ctx, localpg.Options{
		DataDir: filepath.Join(cfg.DataDir, "pg"),
		Logger:  log.With("component", "localpg"),
		Attach:  attach,
	})
	if err != nil {
		return nil, nil, err
	}
	stop := func() error {
		sctx, cancel := context.WithTimeout(context.Background(), time.Minute)
		defer cancel()
		return cl.Stop(sctx)
	}
	st, err := store.OpenWith(ctx, cl.DSN("lagwright"), cfg.DB)
	if err != nil {
		return nil, nil, errors.Join(err, stop())
	}
	return st, func() error { st.Close(); return stop() }, nil
}

// checkDataDir refuses a data folder that exists but is not a folder (a file, or a
// link to one), rather than letting the cluster land somewhere else.
func checkDataDir(dir string) error {
	fi, err := os.Stat(dir)
	if err == nil && !fi.IsDir() {
		return fmt.Errorf("LAGWRIGHT_DATA %s is a file, not a folder: point it at a folder (it is made when missing)", dir)
	}
	if err != nil && !errors.Is(err, os.ErrNotExist) {
		return fmt.Errorf("LAGWRIGHT_DATA %s: %w", dir, err)
	}
	return nil
}
