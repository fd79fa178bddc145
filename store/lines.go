package store

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"strings"
	"time"

	"github.com/jackc/pgx/v5"
	"github.com/jackc/pgx/v5/pgconn"
)

// Line is one run of pipe or duct in a project. Input is the line's own calculation
// input (analysis JSON, SI); Result is the stored analysis, valid while ResultHash
// matches the hash of the effective input.
type Line struct {
	ID         int64           `db:"id"`
	ProjectID  int64           `db:"project_id"`
	Position   int             `db:"position"`
	Tag        string          `db:"tag"`
	Service    string          `db:"service"`
	Location   string          `db:"location"` // "indoor" | "outdoor"
	Exposure   string          `db:"exposure"` // "exposed" | "concealed"
	Input      json.RawMessage `db:"input"`
	Fittings   json.RawMessage `db:"fittings"`
	Notes      string          `db:"notes"`
	Result     json.RawMessage `db:"result"`
	ResultHash string          `db:"result_hash"`
	Version    int             `db:"version"`
	CreatedAt  time.Time       `db:"created_at"`
	UpdatedAt  time.Time       `db:"updated_at"`
}

// ErrDuplicateTag is returned when a project already has a line with the tag.
var ErrDuplicateTag = errors.New("tag already used in this project")

const lineColumns = `id, project_id, position, tag, service, location, exposure, input, fittings, notes,
	result, result_hash, version, created_at, updated_at`

func defaults(l *Line) {
	if len(l.Fittings) == 0 {
		l.Fittings = json.RawMessage(`{}`)
	}
	if l.Location == "" {
		l.Location = "indoor"
	}
	if l.Exposure == "" {
		l.Exposure = "exposed"
	}
}

// nullJSON stores an empty result as SQL NULL.
func nullJSON(r json.RawMessage) any {
	if len(r) == 0 {
		return nil
	}
	return r
}

// Lines lists a project's lines in their order.
func (s *Store) Lines(ctx context.Context, projectID int64) ([]Line, error) {
	rows, _ := s.pool.Query(ctx, `SELECT `+lineColumns+` FROM lines WHERE project_id = $1 ORDER BY position, id`, projectID)
	list, err := pgx.CollectRows(rows, pgx.RowToStructByName[Line])
	if err != nil {
		return nil, fmt.Errorf("store: lines of project %d: %w", projectID, err)
	}
	return list, nil
}

// Line returns one line of a project, or ErrNotFound.
func (s *Store) Line(ctx context.Context, projectID, lineID int64) (Line, error) {
	rows, _ := s.pool.Query(ctx, `SELECT `+lineColumns+` FROM lines WHERE project_id = $1 AND id = $2`, projectID, lineID)
	l, err := pgx.CollectExactlyOneRow(rows, pgx.RowToStructByName[Line])
	if errors.Is(err, pgx.ErrNoRows) {
		return Line{}, fmt.Errorf("store: line %d: %w", lineID, ErrNotFound)
	}
	if err != nil {
		return Line{}, fmt.Errorf("store: line %d: %w", lineID, err)
	}
	return l, nil
}

// lockLinePositions takes the project's line-position lock until the transaction
// ends: every writer that appends lines holds it, so two of them never hand out the
// same positions (an import beside single additions, two imports at once).
func lockLinePositions(ctx context.Context, tx pgx.Tx, projectID int64) error {
	if _, err := tx.Exec(ctx, `SELECT pg_advisory_xact_lock(hashtextextended('line-positions', $1))`, projectID); err != nil {
		return fmt.Errorf("lock line positions: %w", err)
	}
	return nil
}

// CreateLine adds a line at the end of its project's list. materials are the slugs it
// uses (kept so a material in use cannot be deleted).
func (s *Store) CreateLine(ctx context.Context, l Line, materials []string) (Line, error) {
	defaults(&l)
	var out Line
	err := pgx.BeginFunc(ctx, s.pool, func(tx pgx.Tx) error {
		if err := lockLinePositions(ctx, tx, l.ProjectID); err != nil {
			return err
		}
		rows, _ := tx.Query(ctx, `
			INSERT INTO lines (project_id, position, tag, service, location, exposure, input, fittings, notes, result, result_hash)
			VALUES ($1, (SELECT coalesce(max(position), 0) + 1 FROM lines WHERE project_id = $1),
			        $2, $3, $4, $5, $6, $7, $8, $9, $10)
			RETURNING `+lineColumns,
			l.ProjectID, l.Tag, l.Service, l.Location, l.Exposure, l.Input, l.Fittings, l.Notes, nullJSON(l.Result), l.ResultHash)
		var err error
		out, err = pgx.CollectExactlyOneRow(rows, pgx.RowToStructByName[Line])
		if err != nil {
			return err
		}
		return setLineMaterials(ctx, tx, out.ID, materials)
	})
	if err != nil {
		return Line{}, lineError("create line", l, err)
	}
	return out, nil
}

// UpdateLine saves a line if its version is still l.Version and returns it with the
// next version. A stale version gives ErrConflict; a missing line ErrNotFound.
func (s *Store) UpdateLine(ctx context.Context, l Line, materials []string) (Line, error) {
	defaults(&l)
	var out Line
	err := pgx.BeginFunc(ctx, s.pool, func(tx pgx.Tx) error {
		rows, _ := tx.Query(ctx, `
			UPDATE lines SET tag = $4, service = $5, location = $6, exposure = $7, input = $8, fittings = $9,
			       notes = $10, result = $11, result_hash = $12, version = version + 1, updated_at = now()
			WHERE project_id = $1 AND id = $2 AND version = $3
			RETURNING `+lineColumns,
			l.ProjectID, l.ID, l.Version, l.Tag, l.Service, l.Location, l.Exposure, l.Input, l.Fittings, l.Notes,
			nullJSON(l.Result), l.ResultHash)
		var err error
		out, err = pgx.CollectExactlyOneRow(rows, pgx.RowToStructByName[Line])
		if err != nil {
			return err
		}
		return setLineMaterials(ctx, tx, out.ID, materials)
	})
	if errors.Is(err, pgx.ErrNoRows) {
		return Line{}, s.lineMissingOrConflict(ctx, l.ProjectID, l.ID)
	}
	if err != nil {
		return Line{}, lineError("update line", l, err)
	}
	return out, nil
}

// DeleteLine removes a line.
func (s *Store) DeleteLine(ctx context.Context, projectID, lineID int64) error {
	tag, err := s.pool.Exec(ctx, `DELETE FROM lines WHERE project_id = $1 AND id = $2`, projectID, lineID)
	if err != nil {
		return fmt.Errorf("store: delete line %d: %w", lineID, err)
	}
	if tag.RowsAffected() == 0 {
		return fmt.Errorf("store: line %d: %w", lineID, ErrNotFound)
	}
	return nil
}

// ResultUpdate is a freshly computed result for a stored line.
type ResultUpdate struct {
	LineID int64
	Result json.RawMessage
	Hash   string
}

// SaveResults stores computed results without touching the lines' versions: a
// result is derived data, and recomputing it must not make an open edit form stale.
// A few are updated in one batch; many (a whole project after a method change) are
// copied into a temporary table and applied by one UPDATE, which is far quicker.
func (s *Store) SaveResults(ctx context.Context, updates []ResultUpdate) error {
	switch {
	case len(updates) == 0:
		return nil
	case len(updates) <= bulkResults:
		batch := &pgx.Batch{}
		for _, u := range updates {
			batch.Queue(`UPDATE lines SET result = $2, result_hash = $3 WHERE id = $1`, u.LineID, nullJSON(u.Result), u.Hash)
		}
		if err := s.pool.SendBatch(ctx, batch).Close(); err != nil {
			return fmt.Errorf("store: save results: %w", err)
		}
		return nil
	}
	err := pgx.BeginFunc(ctx, s.pool, func(tx pgx.Tx) error {
		if _, err := tx.Exec(ctx, `CREATE TEMP TABLE fresh_results (id bigint, result jsonb, result_hash text) ON COMMIT DROP`); err != nil {
			return err
		}
		_, err := tx.CopyFrom(ctx, pgx.Identifier{"fresh_results"}, []string{"id", "result", "result_hash"},
			pgx.CopyFromSlice(len(updates), func(i int) ([]any, error) {
				u := updates[i]
				return []any{u.LineID, nullString(u.Result), u.Hash}, nil
			}))
		if err != nil {
			return err
		}
		_, err = tx.Exec(ctx, `UPDATE lines l SET result = f.result, result_hash = f.result_hash FROM fresh_results f WHERE l.id = f.id`)
		return err
	})
	if err != nil {
		return fmt.Errorf("store: save results: %w", err)
	}
	return nil
}

// bulkResults is the batch size above which SaveResults copies instead.
const bulkResults = 64

// LineMaterials pairs a new line (by index in the list given to CreateLines) with
// the material slugs it uses.
type LineMaterials [][]string

// DuplicateTagsError is ErrDuplicateTag naming the tags (at most a few) that a
// project already has, found by CreateLines: they were added since the list was
// checked (by another import or an edit).
type DuplicateTagsError struct{ Tags []string }

func (e *DuplicateTagsError) Error() string {
	return fmt.Sprintf("tags already used in this project: %s", strings.Join(e.Tags, ", "))
}

func (e *DuplicateTagsError) Unwrap() error { return ErrDuplicateTag }

// CreateLines adds many lines to a project in one transaction (all or nothing), after
// the existing ones, by COPY. Ids come from the lines' sequence and positions are
// counted under the project's position lock, so imports and single additions may run
// at once. Tags the project has already give a *DuplicateTagsError. It returns how
// many lines were created.
func (s *Store) CreateLines(ctx context.Context, projectID int64, lines []Line, materials LineMaterials) (int, error) {
	err := pgx.BeginFunc(ctx, s.pool, func(tx pgx.Tx) error {
		return createLinesTx(ctx, tx, projectID, lines, materials)
	})
	return lineResult("import lines", projectID, len(lines), err)
}

// lineResult maps the outcome of a bulk line insert.
func lineResult(op string, projectID int64, n int, err error) (int, error) {
	var dup *DuplicateTagsError
	switch {
	case err == nil:
		return n, nil
	case errors.As(err, &dup), errors.Is(err, ErrJobLost):
		return 0, fmt.Errorf("store: %s: %w", op, err)
	}
	return 0, lineError(op, Line{ProjectID: projectID}, err)
}

// createLinesTx is CreateLines inside tx.
func createLinesTx(ctx context.Context, tx pgx.Tx, projectID int64, lines []Line, materials LineMaterials) error {
	tags := make([]string, len(lines))
	for i, l := range lines {
		tags[i] = l.Tag
	}
	if err := lockLinePositions(ctx, tx, projectID); err != nil {
		return err
	}
	rows, _ := tx.Query(ctx, `SELECT tag FROM lines WHERE project_id = $1 AND tag = ANY($2) ORDER BY position LIMIT 5`, projectID, tags)
	taken, err := pgx.CollectRows(rows, pgx.RowTo[string])
	if err != nil {
		return err
	}
	if len(taken) > 0 {
		return &DuplicateTagsError{Tags: taken}
	}
	var start int
	if err := tx.QueryRow(ctx, `SELECT coalesce(max(position), 0) FROM lines WHERE project_id = $1`, projectID).Scan(&start); err != nil {
		return err
	}
	// Ids drawn from the sequence up front, so line_materials can be copied without
	// a round trip per line; other writers draw theirs meanwhile without clashing.
	rows, _ = tx.Query(ctx, `SELECT nextval(pg_get_serial_sequence('lines', 'id')) FROM generate_series(1, $1)`, len(lines))
	ids, err := pgx.CollectRows(rows, pgx.RowTo[int64])
	if err != nil {
		return err
	}
	_, err = tx.CopyFrom(ctx, pgx.Identifier{"lines"},
		[]string{"id", "project_id", "position", "tag", "service", "location", "exposure", "input", "fittings", "notes", "result", "result_hash"},
		pgx.CopyFromSlice(len(lines), func(i int) ([]any, error) {
			l := lines[i]
			defaults(&l)
			return []any{ids[i], projectID, start + i + 1, l.Tag, l.Service, l.Location, l.Exposure,
				string(l.Input), string(l.Fittings), l.Notes, nullString(l.Result), l.ResultHash}, nil
		}))
	if err != nil {
		return err
	}
	var pairs [][]any
	for i, slugs := range materials {
		for _, m := range slugs {
			pairs = append(pairs, []any{ids[i], m})
		}
	}
	_, err = tx.CopyFrom(ctx, pgx.Identifier{"line_materials"}, []string{"line_id", "material_slug"}, pgx.CopyFromRows(pairs))
	return err
}

func nullString(r json.RawMessage) any {
	if len(r) == 0 {
		return nil
	}
	return string(r)
}

func setLineMaterials(ctx context.Context, tx pgx.Tx, lineID int64, materials []string) error {
	if _, err := tx.Exec(ctx, `DELETE FROM line_materials WHERE line_id = $1`, lineID); err != nil {
		return err
	}
	for _, m := range materials {
		if _, err := tx.Exec(ctx, `INSERT INTO line_materials (line_id, material_slug) VALUES ($1, $2) ON CONFLICT DO NOTHING`, lineID, m); err != nil {
			return err
		}
	}
	return nil
}

// lineError maps constraint violations by SQLSTATE (never by text).
func lineError(op string, l Line, err error) error {
	var pg *pgconn.PgError
	if errors.As(err, &pg) {
		switch pg.Code {
		case "23505":
			if pg.ConstraintName == "lines_project_id_tag_key" {
				return fmt.Errorf("store: %s: %w", op, ErrDuplicateTag)
			}
			return fmt.Errorf("store: %s: %s already exists: %w", op, pg.ConstraintName, err)
		case "23503":
			if pg.ConstraintName == "lines_project_id_fkey" {
				return fmt.Errorf("store: %s: project %d: %w", op, l.ProjectID, ErrNotFound)
			}
			return fmt.Errorf("store: %s: %w", op, ErrUnknownMaterial)
		}
	}
	return fmt.Errorf("store: %s: %w", op, err)
}

// ErrUnknownMaterial is returned when a line names a material the library lacks.
var ErrUnknownMaterial = errors.New("unknown material")

func (s *Store) lineMissingOrConflict(ctx context.Context, projectID, lineID int64) error {
	var exists bool
	err := s.pool.QueryRow(ctx, `SELECT EXISTS (SELECT 1 FROM lines WHERE project_id = $1 AND id = $2)`, projectID, lineID).Scan(&exists)
	switch {
	case err != nil:
		return fmt.Errorf("store: line %d: %w", lineID, err)
	case !exists:
		return fmt.Errorf("store: line %d: %w", lineID, ErrNotFound)
	default:
		return fmt.Errorf("store: line %d: %w", lineID, ErrConflict)
	}
}
