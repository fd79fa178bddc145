package store

import (
	"context"
	"crypto/rand"
	"crypto/sha256"
	"encoding/base64"
	"errors"
	"fmt"
	"time"

	"github.com/jackc/pgx/v5"
)

// Sessions: the browser holds a random 32-byte token; the database holds only its
// SHA-256, so reading the sessions table gives no usable cookie.

// NewSessionToken returns a fresh random token (base64url, 43 characters).
func NewSessionToken() string {
	var b [32]byte
	_, _ = rand.Read(b[:]) // never fails (Go 1.24+: it crashes the program instead)
	return base64.RawURLEncoding.EncodeToString(b[:])
}

func tokenHash(token string) []byte {
	h := sha256.Sum256([]byte(token))
	return h[:]
}

// CreateSession stores a session of user for token until expires. It also drops
// expired sessions (of everyone), so the table does not grow.
func (s *Store) CreateSession(ctx context.Context, userID int64, token string, expires time.Time) error {
	return pgx.BeginFunc(ctx, s.pool, func(tx pgx.Tx) error {
		if _, err := tx.Exec(ctx, `DELETE FROM sessions WHERE expires_at < now()`); err != nil {
			return fmt.Errorf("store: expire sessions: %w", err)
		}
		if _, err := tx.Exec(ctx, `INSERT INTO sessions (token_hash, user_id, expires_at) VALUES ($1, $2, $3)`,
			tokenHash(token), userID, expires); err != nil {
			return fmt.Errorf("store: create session: %w", err)
		}
		return nil
	})
}

// SessionUser returns the user of a live session, or ErrNotFound when the token is
// unknown or expired.
func (s *Store) SessionUser(ctx context.Context, token string) (User, error) {
	rows, _ := s.pool.Query(ctx, `
		SELECT u.id, u.name, u.password_hash, u.role, u.created_at
		FROM sessions s JOIN users u ON u.id = s.user_id
		WHERE s.token_hash = $1 AND s.expires_at > now()`, tokenHash(token))
	u, err := pgx.CollectExactlyOneRow(rows, pgx.RowToStructByName[User])
	if errors.Is(err, pgx.ErrNoRows) {
		return User{}, fmt.Errorf("store: session: %w", ErrNotFound)
	}
	if err != nil {
		return User{}, fmt.Errorf("store: session: %w", err)
	}
	return u, nil
}

// DeleteSession ends one session; an unknown token is not an error.
func (s *Store) DeleteSession(ctx context.Context, token string) error {
	if _, err := s.pool.Exec(ctx, `DELETE FROM sessions WHERE token_hash = $1`, tokenHash(token)); err != nil {
		return fmt.Errorf("store: delete session: %w", err)
	}
	return nil
}
