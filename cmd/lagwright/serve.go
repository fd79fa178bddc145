package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"log/slog"
	"net"
	"net/http"
	"os"
	"os/signal"
	"syscall"
	"time"

	"lagwright/handlers"
	"lagwright/store"
)

// Server timeouts. WriteTimeout bounds a whole response: raise it if an export
// of a very large project needs longer.
const (
	readHeaderTimeout = 5 * time.Second
	readTimeout       = 30 * time.Second
	writeTimeout      = 60 * time.Second
	idleTimeout       = 120 * time.Second
	shutdownTimeout   = 15 * time.Second
)

// serve runs the web app until ctx is cancelled or SIGINT/SIGTERM arrives, then
// drains requests, closes the store and stops the private database.
func serve(ctx context.Context, args []string, getenv func(string) string, stderr io.Writer) (err error) {
	cfg, rest, err := parseConfig("serve", args, getenv, stderr)
	if err != nil {
		return err
	}
	if len(rest) > 0 {
		return usageError{fmt.Sprintf("serve takes no arguments, got %q", rest)}
	}
	auth, err := authConfig(cfg.Addr, getenv)
	if err != nil {
		return err
	}
	log := newLogger(stderr, cfg.LogLevel)
	ctx, stop := signal.NotifyContext(ctx, os.Interrupt, syscall.SIGTERM)
	defer stop()

	// Listen first: a taken port fails at once, before PostgreSQL starts and
	// migrations run (and tests may use :0). Connections wait in the backlog until
	// the database is ready.
	ln, err := net.Listen("tcp", cfg.Addr)
	if err != nil {
		return fmt.Errorf("listen on %s: %w (is another Lagwright running? set LAGWRIGHT_ADDR or -addr to another port)", cfg.Addr, err)
	}
	defer ln.Close()

	t0 := time.Now()
	st, closeStore, err := openStore(ctx, cfg, log, ownCluster)
	if err != nil {
		return err
	}
	defer func() { err = errors.Join(err, closeStore()) }()
	v, err := st.Migrate(ctx, store.MigrateUp)
	if err != nil {
		return err
	}
	if err := st.SeedCatalog(ctx); err != nil {
		return err
	}
	log.Info("database ready", "schema_version", v.String(), "elapsed", time.Since(t0).Round(time.Millisecond))

	srv, err := handlers.New(st, log, handlers.Config{Version: version(), Auth: auth})
	if err != nil {
		return err
	}
	hs := newHTTPServer(ctx, srv.Routes(), log)
	log.Info("listening", "addr", ln.Addr().String(), "url", "http://"+ln.Addr().String()+"/", "version", version(),
		"login_required", auth.Required)

	// Background jobs (imports) queued by this or any other instance on the database.
	jobsDone := make(chan struct{})
	go func() { srv.RunJobs(ctx); close(jobsDone) }()

	errc := make(chan error, 1)
	go func() { errc <- hs.Serve(ln) }()
	select {
	case err := <-errc:
		return fmt.Errorf("serve: %w", err)
	case <-ctx.Done():
	}
	stop() // a second Ctrl-C now kills at once
	log.Info("shutting down")
	sctx, cancel := context.WithTimeout(context.Background(), shutdownTimeout)
	defer cancel()
	if err := hs.Shutdown(sctx); err != nil {
		return fmt.Errorf("shutdown: %w", err)
	}
	select { // a running job goes back to the queue for another instance
	case <-jobsDone:
	case <-sctx.Done():
	}
	return nil
}

// newHTTPServer is the http.Server of serve, with its timeouts.
func newHTTPServer(ctx context.Context, h http.Handler, log *slog.Logger) *http.Server {
	return &http.Server{
		Handler:           h,
		ReadHeaderTimeout: readHeaderTimeout,
		ReadTimeout:       readTimeout,
		WriteTimeout:      writeTimeout,
		IdleTimeout:       idleTimeout,
		ErrorLog:          slog.NewLogLogger(log.Handler(), slog.LevelWarn),
		BaseContext:       func(net.Listener) context.Context { return context.WithoutCancel(ctx) },
	}
}
