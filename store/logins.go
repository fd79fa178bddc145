package store

import (
	"context"
	"fmt"
	"slices"
	"time"

	"github.com/jackc/pgx/v5"
)

// Login limit, kept in PostgreSQL so that every app instance on one database counts
// the same attempts. An attempt is reserved (recorded as a failure) before the slow
// password check, under a transaction-scoped advisory lock per key, so parallel
// guesses are counted one after another and cannot all pass the check together.

// LoginLimit is how many attempts a key may have within Window.
type LoginLimit struct {
	Max    int
	Window time.Duration
}

// LoginAttempt is a reserved attempt: its rows, to be cleared by LoginSucceeded.
type LoginAttempt struct {
	ids []int64
}

// ReserveLogin records an attempt under every key, unless a key already has
// lim.Max attempts within lim.Window: then nothing is recorded and the wait until the
// oldest of those ages out is returned (> 0).
func (s *Store) ReserveLogin(ctx context.Context, lim LoginLimit, keys ...string) (LoginAttempt, time.Duration, error) {
	keys = slices.Clone(keys)
	slices.Sort(keys) // one lock order for every caller: no deadlocks
	keys = slices.Compact(keys)
	var a LoginAttempt
	var wait time.Duration
	err := pgx.BeginFunc(ctx, s.pool, func(tx pgx.Tx) error {
		a, wait = LoginAttempt{}, 0
		for _, k := range keys {
			if _, err := tx.Exec(ctx, `SELECT pg_advisory_xact_lock(hashtextextended('login:' || $1, 0))`, k); err != nil {
				return fmt.Errorf("lock: %w", err)
			}
		}
		if _, err := tx.Exec(ctx, `DELETE FROM login_attempts WHERE at < now() - $1::interval`, lim.Window); err != nil {
			return fmt.Errorf("expire: %w", err)
		}
		for _, k := range keys {
			// The lim.Max-th most recent attempt of the key, if there are that many:
			// the key is free again when it ages out.
			var w time.Duration
			err := tx.QueryRow(ctx, `
				SELECT greatest(at + $3::interval - now(), interval '1 second')
				FROM login_attempts WHERE key = $1 ORDER BY at DESC, id DESC OFFSET $2 - 1 LIMIT 1`,
				k, lim.Max, lim.Window).Scan(&w)
			if err == pgx.ErrNoRows {
				continue
			}
			if err != nil {
				return fmt.Errorf("count: %w", err)
			}
			wait = max(wait, w)
		}
		if wait > 0 {
			return nil
		}
		rows, _ := tx.Query(ctx, `INSERT INTO login_attempts (key) SELECT unnest($1::text[]) RETURNING id`, keys)
		ids, err := pgx.CollectRows(rows, pgx.RowTo[int64])
		if err != nil {
			return fmt.Errorf("record: %w", err)
		}
		a.ids = ids
		return nil
	})
	if err != nil {
		return LoginAttempt{}, 0, fmt.Errorf("store: login attempt: %w", err)
	}
	return a, wait, nil
}

// LoginSucceeded takes back a successful attempt's own rows and forgets the
// earlier failures of forgetKey (the name signed in; the client's address keeps its
// count).
func (s *Store) LoginSucceeded(ctx context.Context, a LoginAttempt, forgetKey string) error {
	_, err := s.pool.Exec(ctx, `DELETE FROM login_attempts WHERE id = ANY($1) OR key = $2`, a.ids, forgetKey)
	if err != nil {
		return fmt.Errorf("store: login succeeded: %w", err)
	}
	return nil
}
