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

// Pool limits and the server-side statement timeout. A DSN may override the pool
// limits with pool_max_conns and friends, and the timeout with
// options=-c%20statement_timeout=….
const (
	defaultMaxConns         = 16
	defaultStatementTimeout = 30 * time.Second
	defaultConnectTimeout   = 5 * time.Second
)

// Open connects to the database at dsn (a postgres:// URL or key=value string) and
// checks that it answers.
func Open(ctx context.Context, dsn string) (*Store, error) {
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
	if cfg.ConnConfig.ConnectTimeout == 0 {
		cfg.ConnConfig.ConnectTimeout = defaultConnectTimeout
	}
	rp := cfg.ConnConfig.RuntimeParams
	if _, ok := rp["statement_timeout"]; !ok {
		rp["statement_timeout"] = fmt.Sprint(defaultStatementTimeout.Milliseconds())
	}
	if _, ok := rp["application_name"]; !ok {
		rp["application_name"] = "lagwright"
	}
	pool, err := pgxpool.NewWithConfig(ctx, cfg)
	if err != nil {
		return nil, fmt.Errorf("store: %w", err)
	}
	s := &Store{pool: pool}
	pctx, cancel := context.WithTimeout(ctx, defaultConnectTimeout+time.Second)
	defer cancel()
	if err := s.Ping(pctx); err != nil {
		pool.Close()
		return nil, fmt.Errorf("store: connect to %s: %w", describe(cfg), err)
	}
	return s, nil
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
