package store_test

import (
	"context"
	"io/fs"
	"testing"

	"github.com/jackc/pgx/v5"

	"lagwright/migrations"
	"lagwright/store/storetest"
)

// Migration 0025 renames a stored line's "flanges" to "flange_pairs" and drops only the
// old size-blind default allowances from a project (a user's own allowances stay).
func TestMigrationFittingsBySize(t *testing.T) {
	ctx := context.Background()
	conn, err := pgx.Connect(ctx, storetest.NewDSN(t))
	if err != nil {
		t.Fatal(err)
	}
	defer conn.Close(ctx)
	up, err := fs.ReadFile(migrations.FS, "0025_fittings_by_size.up.sql")
	if err != nil {
		t.Fatal(err)
	}
	for _, sql := range []string{
		`INSERT INTO projects (id, name, settings) VALUES
		   (1, 'Old defaults', '{"fittings": {"elbow_m": 0.6, "tee_m": 0.9, "valve_m": 1.5, "flange_m": 0.6, "cap_m": 0.3}}'),
		   (2, 'Own allowances', '{"fittings": {"elbow_m": 0.8, "tee_m": 0.9, "valve_m": 1.5, "flange_m": 0.6, "cap_m": 0.3}}')`,
		`INSERT INTO lines (id, project_id, tag, input, fittings) VALUES (1, 1, 'HW-1', '{}', '{"elbows": 2, "flanges": 3}')`,
		string(up),
	} {
		if _, err := conn.Exec(ctx, sql); err != nil {
			t.Fatalf("%s: %v", sql, err)
		}
	}
	var fit string
	if err := conn.QueryRow(ctx, `SELECT fittings::text FROM lines WHERE id = 1`).Scan(&fit); err != nil {
		t.Fatal(err)
	}
	if fit != `{"elbows": 2, "flange_pairs": 3}` {
		t.Errorf("line fittings after 0025: %s", fit)
	}
	var has1, has2 bool
	if err := conn.QueryRow(ctx, `SELECT (SELECT settings ? 'fittings' FROM projects WHERE id = 1), (SELECT settings ? 'fittings' FROM projects WHERE id = 2)`).Scan(&has1, &has2); err != nil {
		t.Fatal(err)
	}
	if has1 || !has2 {
		t.Errorf("after 0025: old defaults kept %v (want dropped), own allowances kept %v (want kept)", has1, has2)
	}
}
