// Package migrations holds the database schema as numbered golang-migrate files
// (NNNN_name.up.sql / NNNN_name.down.sql), embedded into the binary and applied by
// store.Migrate at start.
package migrations

import (
	"embed"
	"fmt"
	"io/fs"
	"strconv"
	"strings"
)

// FS holds every migration file.
//
//go:embed *.sql
var FS embed.FS

// Latest returns the highest migration number in FS: the schema version after
// every migration is applied.
func Latest() (uint, error) {
	names, err := fs.Glob(FS, "*.up.sql")
	if err != nil {
		return 0, err
	}
	var latest uint
	for _, n := range names {
		num, _, ok := strings.Cut(n, "_")
		v, err := strconv.ParseUint(num, 10, 32)
		if !ok || err != nil {
			return 0, fmt.Errorf("migrations: %s is not named NNNN_name.up.sql", n)
		}
		latest = max(latest, uint(v))
	}
	return latest, nil
}
