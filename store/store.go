// Package store keeps Lagwright's data in PostgreSQL through pgx. It is the only
// package that holds SQL: one file per aggregate (projects, lines, materials, …),
// with the SQL beside the method that runs it.
package store

import (
	"context"
	"fmt"
	"strings"
	"time"

	"github.com/jackc/pgx/v5/pgxpool"
)

// Store is the application's database.
type Store struct {
	pool *pgxpool.Pool
}

// Pool limits and timeouts. A DSN may override the pool limits with pool_max_conns
// and friends; the statement timeout comes from Options, else from the DSN
// (options=-c%20statement_timeout=…), else DefaultStatementTimeout.
const (
	defaultMaxConns       = 16
	defaultConnectTimeout = 5 * time.Second
	// DefaultStatementTimeout is the server's statement_timeout for the app's
	// connections unless configured: long enough for a whole-project recompute's
	// writes, short enough that a stuck statement frees its connection.
	DefaultStatementTimeout = 30 * time.Second
	// DefaultAcquireTimeout is how long a request waits for a pooled connection (or
	// a new one) before it is answered 503. Waiting in line for a busy pool is no sign
	// of a hung server (that shows in pingTimeout and the connect timeout), so it is
	// generous: an overloaded machine slows answers down rather than refusing them.
	DefaultAcquireTimeout = 15 * time.Second
	// pingTimeout bounds the liveness check of a connection that sat idle before
	// it is handed out: a frozen server is noticed within it.
	pingTimeout = 2 * time.Second
)

// Options are the settings of Open beyond the DSN.
type Options struct {
	// StatementTimeout sets the server's statement_timeout; 0 keeps the DSN's, or
	// DefaultStatementTimeout when the DSN sets none.
	StatementTimeout time.Duration
	// AcquireTimeout bounds the wait for a connection; 0 means DefaultAcquireTimeout.
	AcquireTimeout time.Duration
}

// Open connects to the database at dsn (a postgres:// URL or key=value string) with
// the default Options and checks that it answers.
func Open(ctx context.Context, dsn string) (*Store, error) {
	return OpenWith(ctx, dsn, Options{})
}

// OpenWith is Open with explicit Options.
func OpenWith(ctx context.Context, dsn string, opt Options) (*Store, error) {
	cfg, err := pgxpool.ParseConfig(dsn)
	if err != nil {
		// The parse error may quote the DSN, password included: do not wrap it.
		return nil, fmt.Errorf("store: DATABASE_URL is not a valid PostgreSQL connection string")
	}
	if !strings.Contains(dsn, "pool_max_conns") {
		cfg.MaxConns = defaultMaxConns
	}
	cfg.MaxConnIdleTime = 5 * time.Minute
	cfg.MaxConnLifetime = time.Hour
	cfg.HealthCheckPeriod = 30 * time.Second
	cfg.PingTimeout = pingTimeout
	if cfg.ConnConfig.ConnectTimeout == 0 {
		cfg.ConnConfig.ConnectTimeout = defaultConnectTimeout
	}
	rp := cfg.ConnConfig.RuntimeParams
	_, inParams := rp["statement_timeout"]
	switch {
	case opt.StatementTimeout > 0:
		rp["statement_timeout"] = fmt.Sprint(opt.StatementTimeout.Milliseconds())
	case !inParams && !strings.Contains(rp["options"], "statement_timeout"):
		rp["statement_timeout"] = fmt.Sprint(DefaultStatementTimeout.Milliseconds())
	}
	if _, ok := rp["application_name"]; !ok {
		rp["application_name"] = "lagwright"
	}
	if opt.AcquireTimeout <= 0 {
		opt.AcquireTimeout = DefaultAcquireTimeout
	}
	tracer := &deadlineTracer{acquire: opt.AcquireTimeout}
	cfg.ConnConfig.Tracer = tracer
	pool, err := pgxpool.NewWithConfig(ctx, cfg)
	if err != nil {
		return nil, fmt.Errorf("store: %w", err)
	}
	s := &Store{pool: pool}
	pctx, cancel := context.WithTimeout(ctx, defaultConnectTimeout+time.Second)
	defer cancel()
	// The statement timeout in force (whichever source set it) gives the client's own
	// deadline per statement; 0 (none) leaves statements without one.
	var ms int64
	if err := pool.QueryRow(pctx, `SELECT setting::bigint FROM pg_settings WHERE name = 'statement_timeout'`).Scan(&ms); err != nil {
		pool.Close()
		return nil, fmt.Errorf("store: connect to %s: %w", describe(cfg), err)
	}
	if ms > 0 {
		tracer.statement.Store(int64(time.Duration(ms)*time.Millisecond + statementGrace))
	}
	return s, nil
}

// StatementTimeout is the server's statement_timeout on the app's connections.
func (s *Store) StatementTimeout(ctx context.Context) (time.Duration, error) {
	var ms int64
	if err := s.pool.QueryRow(ctx, `SELECT setting::bigint FROM pg_settings WHERE name = 'statement_timeout'`).Scan(&ms); err != nil {
		return 0, fmt.Errorf("store: statement timeout: %w", err)
	}
	return time.Duration(ms) * time.Millisecond, nil
}

// describe names the server without credentials, for messages.
func describe(cfg *pgxpool.Config) string {
	c := cfg.ConnConfig
	return fmt.Sprintf("database %q on %s port %d", c.Database, c.Host, c.Port)
}

// Close closes every connection. Calls after the first do nothing.
func (s *Store) Close() { s.pool.Close() }

// Ping checks that the database answers a query.
func (s *Store) Ping(ctx context.Context) error {
	var one int
	if err := s.pool.QueryRow(ctx, `SELECT 1`).Scan(&one); err != nil {
		return fmt.Errorf("store: ping: %w", err)
	}
	return nil
}
