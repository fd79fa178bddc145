package store

import (
	"context"
	"errors"
	"fmt"
	"time"

	"github.com/jackc/pgx/v5"

	"lagwright/catalog"
	"lagwright/field"
)

// Jacket is an outer jacket or coating in the library: a built-in one seeded from
// the catalog, or a custom one.
type Jacket struct {
	catalog.Jacket
	Builtin   bool
	Version   int
	UpdatedAt time.Time
}

// Validate checks a jacket's own data and returns every problem, or nil: a slug of
// 2–60 lowercase letters, digits and underscores; a name and source; emittance
// 0–1; permeance 0 (unknown) to 1000 perm.
func (j Jacket) Validate() field.Errors {
	var fe field.Errors
	validateSlug(&fe, j.Slug)
	validateText(&fe, "name", j.Name, true, MaxTextLen)
	validateText(&fe, "use", j.Use, false, MaxTextLen)
	validateText(&fe, "source", j.Source, true, MaxSourceLen)
	if !finite(j.Emittance) || j.Emittance < 0 || j.Emittance > 1 {
		fe.Add("emittance", "must be between 0 and 1")
	}
	if !finite(j.PermeancePerm) || j.PermeancePerm < 0 || j.PermeancePerm > MaxPermeance {
		fe.Add("permeance_perm", "must be between 0 (unknown) and %d perm", MaxPermeance)
	}
	return fe
}

const jacketColumns = `slug, name, emittance, vapour_retarder, coalesce(permeance_perm, 0), use, source, builtin,
	version, updated_at`

func scanJacket(row pgx.CollectableRow) (Jacket, error) {
	var j Jacket
	err := row.Scan(&j.Slug, &j.Name, &j.Emittance, &j.VapourRetarder, &j.PermeancePerm, &j.Use, &j.Source,
		&j.Builtin, &j.Version, &j.UpdatedAt)
	if c, ok := catalog.JacketBySlug(j.Slug); ok && j.Builtin { // catalog data, not stored (see Library)
		j.SolarAbsorptance, j.AbsorptanceSource = c.SolarAbsorptance, c.AbsorptanceSource
		j.MaxSurfaceC, j.MaxSurfaceSource = c.MaxSurfaceC, c.MaxSurfaceSource
	}
	return j, err
}

// nullPerm stores an unknown permeance (0) as NULL, as SeedCatalog does.
func nullPerm(p float64) any {
	if p > 0 {
		return p
	}
	return nil
}

// Jackets lists every jacket, built-in and custom, by name.
func (s *Store) Jackets(ctx context.Context) ([]Jacket, error) {
	rows, _ := s.pool.Query(ctx, `SELECT `+jacketColumns+` FROM jackets ORDER BY builtin DESC, name, slug`)
	list, err := pgx.CollectRows(rows, scanJacket)
	if err != nil {
		return nil, fmt.Errorf("store: jackets: %w", err)
	}
	return list, nil
}

// Jacket returns one jacket, or ErrNotFound.
func (s *Store) Jacket(ctx context.Context, slug string) (Jacket, error) {
	rows, _ := s.pool.Query(ctx, `SELECT `+jacketColumns+` FROM jackets WHERE slug = $1`, slug)
	j, err := pgx.CollectExactlyOneRow(rows, scanJacket)
	if errors.Is(err, pgx.ErrNoRows) {
		return Jacket{}, fmt.Errorf("store: jacket %q: %w", slug, ErrNotFound)
	}
	if err != nil {
		return Jacket{}, fmt.Errorf("store: jacket %q: %w", slug, err)
	}
	return j, nil
}

// CreateJacket adds a custom jacket at version 1. Invalid data gives field.Errors; a
// built-in's slug ErrBuiltinSlug; another custom jacket's slug ErrSlugTaken.
func (s *Store) CreateJacket(ctx context.Context, j Jacket) (Jacket, error) {
	if err := j.Validate().Err(); err != nil {
		return Jacket{}, err
	}
	if _, ok := catalog.JacketBySlug(j.Slug); ok {
		return Jacket{}, fmt.Errorf("store: create jacket %q: %w", j.Slug, ErrBuiltinSlug)
	}
	rows, _ := s.pool.Query(ctx, `
		INSERT INTO jackets (slug, name, emittance, vapour_retarder, permeance_perm, use, source, builtin)
		VALUES ($1, $2, $3, $4, $5, $6, $7, false)
		ON CONFLICT (slug) DO NOTHING
		RETURNING `+jacketColumns,
		j.Slug, j.Name, j.Emittance, j.VapourRetarder, nullPerm(j.PermeancePerm), j.Use, j.Source)
	out, err := pgx.CollectExactlyOneRow(rows, scanJacket)
	if errors.Is(err, pgx.ErrNoRows) {
		return Jacket{}, s.slugTaken(ctx, "jackets", j.Slug)
	}
	if err != nil {
		return Jacket{}, fmt.Errorf("store: create jacket %q: %w", j.Slug, err)
	}
	return out, nil
}

// UpdateJacket saves a custom jacket if its version is still j.Version and returns
// it with the next version. Invalid data gives field.Errors; a built-in ErrBuiltin; a
// stale version ErrConflict; a missing jacket ErrNotFound.
func (s *Store) UpdateJacket(ctx context.Context, j Jacket) (Jacket, error) {
	if err := j.Validate().Err(); err != nil {
		return Jacket{}, err
	}
	rows, _ := s.pool.Query(ctx, `
		UPDATE jackets SET name = $3, emittance = $4, vapour_retarder = $5, permeance_perm = $6, use = $7,
		       source = $8, version = version + 1, updated_at = now()
		WHERE slug = $1 AND version = $2 AND NOT builtin
		RETURNING `+jacketColumns,
		j.Slug, j.Version, j.Name, j.Emittance, j.VapourRetarder, nullPerm(j.PermeancePerm), j.Use, j.Source)
	out, err := pgx.CollectExactlyOneRow(rows, scanJacket)
	if errors.Is(err, pgx.ErrNoRows) {
		return Jacket{}, s.whyNotUpdated(ctx, "jackets", j.Slug)
	}
	if err != nil {
		return Jacket{}, fmt.Errorf("store: update jacket %q: %w", j.Slug, err)
	}
	return out, nil
}

// DeleteJacket removes a custom jacket. A built-in gives ErrBuiltin; a jacket that a
// line's input names an *InUseError (errors.Is ErrInUse); a missing one ErrNotFound.
// Lines name their jacket in their input JSON (no foreign key), so the check reads
// the inputs; the jacket row is locked meanwhile.
func (s *Store) DeleteJacket(ctx context.Context, slug string) error {
	return s.deleteLibraryRow(ctx, "jacket", "jackets", slug, `
		SELECT count(*) OVER (), l.tag, p.name
		FROM lines l JOIN projects p ON p.id = l.project_id
		WHERE l.input->>'jacket' = $1
		ORDER BY p.name, l.position, l.id LIMIT 5`)
}
