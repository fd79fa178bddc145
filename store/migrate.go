package store

import (
	"context"
	"errors"
	"fmt"

	"github.com/golang-migrate/migrate/v4"
	pgxmigrate "github.com/golang-migrate/migrate/v4/database/pgx/v5"
	"github.com/golang-migrate/migrate/v4/source/iofs"
	"github.com/jackc/pgx/v5/stdlib"

	"lagwright/migrations"
)

// Direction says what Migrate does.
type Direction int

const (
	// MigrateUp applies every pending migration.
	MigrateUp Direction = iota
	// MigrateDown reverts every migration (all data is lost).
	MigrateDown
	// MigrateVersion only reports the schema version.
	MigrateVersion
)

// SchemaVersion is the state of the schema: Version 0 means no migration applied.
type SchemaVersion struct {
	Version uint
	Dirty   bool
}

func (v SchemaVersion) String() string {
	switch {
	case v.Version == 0:
		return "none"
	case v.Dirty:
		return fmt.Sprintf("%d (dirty)", v.Version)
	}
	return fmt.Sprint(v.Version)
}

// ErrDirtySchema is returned when an earlier migration failed part-way.
var ErrDirtySchema = errors.New("the database schema is dirty: a migration failed part-way")

// Migrate moves the schema in direction d and returns the resulting version. A
// schema already up to date is success. A dirty schema is refused (for up and down)
// with ErrDirtySchema: repair it by hand; Lagwright never forces a version.
func (s *Store) Migrate(ctx context.Context, d Direction) (SchemaVersion, error) {
	src, err := iofs.New(migrations.FS, ".")
	if err != nil {
		return SchemaVersion{}, fmt.Errorf("store: migrations: %w", err)
	}
	// Closing m closes this *sql.DB and its connection, not the pool.
	db := stdlib.OpenDBFromPool(s.pool)
	drv, err := pgxmigrate.WithInstance(db, &pgxmigrate.Config{})
	if err != nil {
		db.Close()
		return SchemaVersion{}, fmt.Errorf("store: migrate: %w", err)
	}
	m, err := migrate.NewWithInstance("iofs", src, "pgx5", drv)
	if err != nil {
		drv.Close()
		return SchemaVersion{}, fmt.Errorf("store: migrate: %w", err)
	}
	defer m.Close()

	stop := context.AfterFunc(ctx, func() {
		select {
		case m.GracefulStop <- true:
		default:
		}
	})
	defer stop()

	cur, err := version(m)
	if err != nil {
		return cur, err
	}
	if d == MigrateVersion {
		return cur, nil
	}
	if cur.Dirty {
		return cur, fmt.Errorf("store: %w at version %d; repair the schema by hand (see the failed NNNN file in migrations/), "+
			"then set schema_migrations.dirty = false", ErrDirtySchema, cur.Version)
	}
	switch d {
	case MigrateUp:
		err = m.Up()
	case MigrateDown:
		err = m.Down()
	default:
		return cur, fmt.Errorf("store: unknown migration direction %d", d)
	}
	if err != nil && !errors.Is(err, migrate.ErrNoChange) {
		v, _ := version(m)
		return v, fmt.Errorf("store: migrate: %w", err)
	}
	if err := ctx.Err(); err != nil {
		return cur, fmt.Errorf("store: migrate: %w", err)
	}
	return version(m)
}

func version(m *migrate.Migrate) (SchemaVersion, error) {
	v, dirty, err := m.Version()
	if errors.Is(err, migrate.ErrNilVersion) {
		return SchemaVersion{}, nil
	}
	if err != nil {
		return SchemaVersion{}, fmt.Errorf("store: schema version: %w", err)
	}
	return SchemaVersion{Version: v, Dirty: dirty}, nil
}
