// Package migrations holds the database schema as numbered golang-migrate files
// (NNNN_name.up.sql / NNNN_name.down.sql), embedded into the binary and applied by
// store.Migrate at start.
package migrations

import "embed"

// FS holds every migration file.
//
//go:embed *.sql
var FS embed.FS
