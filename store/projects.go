package store

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"time"

	"github.com/jackc/pgx/v5"
)

// Project is one job: a name, display units and its settings (design conditions,
// default criteria, economics, fitting allowances) as JSON in SI.
type Project struct {
	ID        int64           `db:"id"`
	Name      string          `db:"name"`
	Client    string          `db:"client"`
	Site      string          `db:"site"`
	Units     string          `db:"units"` // "si" | "us"
	Settings  json.RawMessage `db:"settings"`
	Version   int             `db:"version"`
	CreatedAt time.Time       `db:"created_at"`
	UpdatedAt time.Time       `db:"updated_at"`
}

// ProjectSummary is a project in the list, with its number of lines.
type ProjectSummary struct {
	Project
	LineCount int `db:"line_count"`
}

const projectColumns = `id, name, client, site, units, settings, version, created_at, updated_at`

// CreateProject inserts a project and returns it with its id and version.
func (s *Store) CreateProject(ctx context.Context, p Project) (Project, error) {
	if len(p.Settings) == 0 {
		p.Settings = json.RawMessage(`{}`)
	}
	rows, _ := s.pool.Query(ctx, `
		INSERT INTO projects (name, client, site, units, settings)
		VALUES ($1, $2, $3, $4, $5)
		RETURNING `+projectColumns, p.Name, p.Client, p.Site, p.Units, p.Settings)
	out, err := pgx.CollectExactlyOneRow(rows, pgx.RowToStructByName[Project])
	if err != nil {
		return Project{}, fmt.Errorf("store: create project: %w", err)
	}
	return out, nil
}

// Project returns one project, or ErrNotFound.
func (s *Store) Project(ctx context.Context, id int64) (Project, error) {
	rows, _ := s.pool.Query(ctx, `SELECT `+projectColumns+` FROM projects WHERE id = $1`, id)
	p, err := pgx.CollectExactlyOneRow(rows, pgx.RowToStructByName[Project])
	if errors.Is(err, pgx.ErrNoRows) {
		return Project{}, fmt.Errorf("store: project %d: %w", id, ErrNotFound)
	}
	if err != nil {
		return Project{}, fmt.Errorf("store: project %d: %w", id, err)
	}
	return p, nil
}

// Projects lists every project, most recently changed first.
func (s *Store) Projects(ctx context.Context) ([]ProjectSummary, error) {
	rows, _ := s.pool.Query(ctx, `
		SELECT p.id, p.name, p.client, p.site, p.units, p.settings, p.version, p.created_at, p.updated_at,
		       (SELECT count(*) FROM lines l WHERE l.project_id = p.id)::int AS line_count
		FROM projects p
		ORDER BY p.updated_at DESC, p.id DESC`)
	list, err := pgx.CollectRows(rows, pgx.RowToStructByName[ProjectSummary])
	if err != nil {
		return nil, fmt.Errorf("store: projects: %w", err)
	}
	return list, nil
}

// UpdateProject saves a project if its version is still p.Version, and returns it
// with the next version. A stale version gives ErrConflict; a missing one ErrNotFound.
func (s *Store) UpdateProject(ctx context.Context, p Project) (Project, error) {
	rows, _ := s.pool.Query(ctx, `
		UPDATE projects SET name = $3, client = $4, site = $5, units = $6, settings = $7,
		       version = version + 1, updated_at = now()
		WHERE id = $1 AND version = $2
		RETURNING `+projectColumns, p.ID, p.Version, p.Name, p.Client, p.Site, p.Units, p.Settings)
	out, err := pgx.CollectExactlyOneRow(rows, pgx.RowToStructByName[Project])
	if errors.Is(err, pgx.ErrNoRows) {
		return Project{}, s.missingOrConflict(ctx, "projects", p.ID)
	}
	if err != nil {
		return Project{}, fmt.Errorf("store: update project %d: %w", p.ID, err)
	}
	return out, nil
}

// DeleteProject removes a project and its lines.
func (s *Store) DeleteProject(ctx context.Context, id int64) error {
	tag, err := s.pool.Exec(ctx, `DELETE FROM projects WHERE id = $1`, id)
	if err != nil {
		return fmt.Errorf("store: delete project %d: %w", id, err)
	}
	if tag.RowsAffected() == 0 {
		return fmt.Errorf("store: project %d: %w", id, ErrNotFound)
	}
	return nil
}

// missingOrConflict tells apart, after an update matched no row, a row that is gone
// from one whose version moved on.
func (s *Store) missingOrConflict(ctx context.Context, table string, id int64) error {
	var exists bool
	err := s.pool.QueryRow(ctx, `SELECT EXISTS (SELECT 1 FROM `+table+` WHERE id = $1)`, id).Scan(&exists)
	switch {
	case err != nil:
		return fmt.Errorf("store: %s %d: %w", table, id, err)
	case !exists:
		return fmt.Errorf("store: %s %d: %w", table, id, ErrNotFound)
	default:
		return fmt.Errorf("store: %s %d: %w", table, id, ErrConflict)
	}
}
