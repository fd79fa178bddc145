package store

import "errors"

// Errors the store's methods return (wrapped) for callers to test with errors.Is.
// Database constraint violations arrive as *pgconn.PgError; handlers map their
// SQLSTATE codes, never their text.
var (
	// ErrNotFound: no row has that key.
	ErrNotFound = errors.New("not found")
	// ErrConflict: the row changed since it was read (optimistic version check).
	ErrConflict = errors.New("changed by someone else")
)
