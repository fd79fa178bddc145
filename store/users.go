package store

import (
	"context"
	"errors"
	"fmt"
	"strings"
	"sync"
	"time"
	"unicode/utf8"

	"github.com/jackc/pgx/v5"
	"github.com/jackc/pgx/v5/pgconn"
	"golang.org/x/crypto/bcrypt"
)

// User is an account of the web app. Editors may change everything; viewers may only
// look.
type User struct {
	ID           int64     `db:"id"`
	Name         string    `db:"name"`
	PasswordHash string    `db:"password_hash"`
	Role         string    `db:"role"`
	CreatedAt    time.Time `db:"created_at"`
}

// Roles.
const (
	RoleEditor = "editor"
	RoleViewer = "viewer"
)

// Password rules. bcrypt reads at most 72 bytes, so longer passwords are refused
// rather than silently cut.
const (
	MinPasswordLen = 10
	MaxPasswordLen = 72
	// BcryptCost is the work factor of stored hashes (≈ 0.2 s per hash on one core).
	BcryptCost = 12
)

var (
	// ErrBadLogin: no such user, or the wrong password (never said which).
	ErrBadLogin = errors.New("wrong name or password")
	// ErrUserExists: CreateUser with a name already taken.
	ErrUserExists = errors.New("user already exists")
)

// ValidUserName reports whether name is acceptable: 1–64 characters, no spaces or
// control characters.
func ValidUserName(name string) error {
	if name == "" || utf8.RuneCountInString(name) > 64 || !utf8.ValidString(name) {
		return errors.New("a user name has 1 to 64 characters")
	}
	if strings.IndexFunc(name, func(r rune) bool { return r <= ' ' || r == 0x7f }) >= 0 {
		return errors.New("a user name has no spaces or control characters")
	}
	return nil
}

// ValidPassword checks the password rules.
func ValidPassword(pw string) error {
	if utf8.RuneCountInString(pw) < MinPasswordLen {
		return fmt.Errorf("the password must have at least %d characters", MinPasswordLen)
	}
	if len(pw) > MaxPasswordLen {
		return fmt.Errorf("the password must be at most %d bytes", MaxPasswordLen)
	}
	return nil
}

// ValidRole checks a role name.
func ValidRole(role string) error {
	if role != RoleEditor && role != RoleViewer {
		return fmt.Errorf("role %q: want %s or %s", role, RoleEditor, RoleViewer)
	}
	return nil
}

func hashPassword(pw string) (string, error) {
	if err := ValidPassword(pw); err != nil {
		return "", err
	}
	h, err := bcrypt.GenerateFromPassword([]byte(pw), BcryptCost)
	if err != nil {
		return "", fmt.Errorf("store: hash password: %w", err)
	}
	return string(h), nil
}

const userColumns = `id, name, password_hash, role, created_at`

// CreateUser adds a user with a bcrypt hash of password.
func (s *Store) CreateUser(ctx context.Context, name, password, role string) (User, error) {
	if err := ValidUserName(name); err != nil {
		return User{}, err
	}
	if err := ValidRole(role); err != nil {
		return User{}, err
	}
	h, err := hashPassword(password)
	if err != nil {
		return User{}, err
	}
	rows, _ := s.pool.Query(ctx, `INSERT INTO users (name, password_hash, role) VALUES ($1, $2, $3) RETURNING `+userColumns, name, h, role)
	u, err := pgx.CollectExactlyOneRow(rows, pgx.RowToStructByName[User])
	var pg *pgconn.PgError
	if errors.As(err, &pg) && pg.Code == "23505" {
		return User{}, fmt.Errorf("store: user %q: %w", name, ErrUserExists)
	}
	if err != nil {
		return User{}, fmt.Errorf("store: create user: %w", err)
	}
	return u, nil
}

// SetPassword replaces a user's password (and role, when role is not empty) and ends
// every session of the user, in one transaction.
func (s *Store) SetPassword(ctx context.Context, name, password, role string) error {
	if role != "" {
		if err := ValidRole(role); err != nil {
			return err
		}
	}
	h, err := hashPassword(password)
	if err != nil {
		return err
	}
	return pgx.BeginFunc(ctx, s.pool, func(tx pgx.Tx) error {
		var id int64
		err := tx.QueryRow(ctx, `UPDATE users SET password_hash = $2, role = coalesce(nullif($3, ''), role)
			WHERE name = $1 RETURNING id`, name, h, role).Scan(&id)
		if errors.Is(err, pgx.ErrNoRows) {
			return fmt.Errorf("store: user %q: %w", name, ErrNotFound)
		}
		if err != nil {
			return fmt.Errorf("store: set password: %w", err)
		}
		if _, err := tx.Exec(ctx, `DELETE FROM sessions WHERE user_id = $1`, id); err != nil {
			return fmt.Errorf("store: end sessions: %w", err)
		}
		return nil
	})
}

// DeleteUser removes a user and, by cascade, their sessions.
func (s *Store) DeleteUser(ctx context.Context, name string) error {
	tag, err := s.pool.Exec(ctx, `DELETE FROM users WHERE name = $1`, name)
	if err != nil {
		return fmt.Errorf("store: delete user: %w", err)
	}
	if tag.RowsAffected() == 0 {
		return fmt.Errorf("store: user %q: %w", name, ErrNotFound)
	}
	return nil
}

// Users lists every user by name.
func (s *Store) Users(ctx context.Context) ([]User, error) {
	rows, _ := s.pool.Query(ctx, `SELECT `+userColumns+` FROM users ORDER BY name`)
	list, err := pgx.CollectRows(rows, pgx.RowToStructByName[User])
	if err != nil {
		return nil, fmt.Errorf("store: users: %w", err)
	}
	return list, nil
}

// dummyHash is compared against when the user does not exist, so a wrong name costs
// as much time as a wrong password (no user enumeration by timing).
// Made on first use, so programs that never log anyone in do not pay for it.
var dummyHash = sync.OnceValue(func() []byte {
	h, _ := bcrypt.GenerateFromPassword([]byte("lagwright-no-such-user"), BcryptCost)
	return h
})

// Authenticate checks a name and password. Any mismatch is ErrBadLogin, whether the
// name is unknown or the password wrong; other errors are the database's.
func (s *Store) Authenticate(ctx context.Context, name, password string) (User, error) {
	rows, _ := s.pool.Query(ctx, `SELECT `+userColumns+` FROM users WHERE name = $1`, name)
	u, err := pgx.CollectExactlyOneRow(rows, pgx.RowToStructByName[User])
	if errors.Is(err, pgx.ErrNoRows) {
		_ = bcrypt.CompareHashAndPassword(dummyHash(), []byte(password))
		return User{}, ErrBadLogin
	}
	if err != nil {
		return User{}, fmt.Errorf("store: authenticate: %w", err)
	}
	if bcrypt.CompareHashAndPassword([]byte(u.PasswordHash), []byte(password)) != nil {
		return User{}, ErrBadLogin
	}
	return u, nil
}
