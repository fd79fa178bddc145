package store

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"strings"
	"time"

	"github.com/jackc/pgx/v5"
)

// ScheduleRevision is an issued revision of a project's insulation schedule: a
// snapshot of its rows, totals and header as JSON (SI), never changed afterwards.
type ScheduleRevision struct {
	ID        int64           `db:"id"`
	ProjectID int64           `db:"project_id"`
	Number    int             `db:"number"`
	IssuedAt  time.Time       `db:"issued_at"`
	Note      string          `db:"note"`
	Rows      json.RawMessage `db:"rows"`
	Totals    json.RawMessage `db:"totals"`
	Header    json.RawMessage `db:"header"`
}

// RevisionSummary is a revision in a list, without its snapshot.
type RevisionSummary struct {
	Number   int       `db:"number"`
	IssuedAt time.Time `db:"issued_at"`
	Note     string    `db:"note"`
}

const revisionColumns = `id, project_id, number, issued_at, note, rows, totals, header`

// IssueRevision stores the next revision of a project's schedule. snapshot receives the
// revision's number and issue time and returns the rows, totals and header to store,
// so the number and date inside the snapshot are the ones stored. Revisions of one
// project are numbered 1, 2, … under a lock on the project row.
func (s *Store) IssueRevision(ctx context.Context, projectID int64, note string,
	snapshot func(number int, issuedAt time.Time) (rows, totals, header json.RawMessage, err error)) (ScheduleRevision, error) {
	var out ScheduleRevision
	err := pgx.BeginFunc(ctx, s.pool, func(tx pgx.Tx) error {
		var id int64
		if err := tx.QueryRow(ctx, `SELECT id FROM projects WHERE id = $1 FOR UPDATE`, projectID).Scan(&id); err != nil {
			if errors.Is(err, pgx.ErrNoRows) {
				return fmt.Errorf("project %d: %w", projectID, ErrNotFound)
			}
			return err
		}
		var number int
		var now time.Time
		if err := tx.QueryRow(ctx, `SELECT coalesce(max(number), 0) + 1, date_trunc('second', now())
			FROM schedule_revisions WHERE project_id = $1`, projectID).Scan(&number, &now); err != nil {
			return err
		}
		rows, totals, header, err := snapshot(number, now)
		if err != nil {
			return err
		}
		r, _ := tx.Query(ctx, `
			INSERT INTO schedule_revisions (project_id, number, issued_at, note, rows, totals, header)
			VALUES ($1, $2, $3, $4, $5, $6, $7)
			RETURNING `+revisionColumns, projectID, number, now, note, rows, totals, header)
		out, err = pgx.CollectExactlyOneRow(r, pgx.RowToStructByName[ScheduleRevision])
		return err
	})
	if err != nil {
		return ScheduleRevision{}, fmt.Errorf("store: issue schedule revision: %w", err)
	}
	return out, nil
}

// Revision returns one revision of a project's schedule, or ErrNotFound.
func (s *Store) Revision(ctx context.Context, projectID int64, number int) (ScheduleRevision, error) {
	rows, _ := s.pool.Query(ctx, `SELECT `+revisionColumns+` FROM schedule_revisions
		WHERE project_id = $1 AND number = $2`, projectID, number)
	r, err := pgx.CollectExactlyOneRow(rows, pgx.RowToStructByName[ScheduleRevision])
	if errors.Is(err, pgx.ErrNoRows) {
		return ScheduleRevision{}, fmt.Errorf("store: schedule revision %d: %w", number, ErrNotFound)
	}
	if err != nil {
		return ScheduleRevision{}, fmt.Errorf("store: schedule revision %d: %w", number, err)
	}
	return r, nil
}

// LatestRevision returns a project's latest revision; ok is false when none is issued.
func (s *Store) LatestRevision(ctx context.Context, projectID int64) (r ScheduleRevision, ok bool, err error) {
	rows, _ := s.pool.Query(ctx, `SELECT `+revisionColumns+` FROM schedule_revisions
		WHERE project_id = $1 ORDER BY number DESC LIMIT 1`, projectID)
	r, err = pgx.CollectExactlyOneRow(rows, pgx.RowToStructByName[ScheduleRevision])
	if errors.Is(err, pgx.ErrNoRows) {
		return ScheduleRevision{}, false, nil
	}
	if err != nil {
		return ScheduleRevision{}, false, fmt.Errorf("store: latest schedule revision: %w", err)
	}
	return r, true, nil
}

// Revisions lists a project's revisions, newest first.
func (s *Store) Revisions(ctx context.Context, projectID int64) ([]RevisionSummary, error) {
	rows, _ := s.pool.Query(ctx, `SELECT number, issued_at, note FROM schedule_revisions
		WHERE project_id = $1 ORDER BY number DESC`, projectID)
	list, err := pgx.CollectRows(rows, pgx.RowToStructByName[RevisionSummary])
	if err != nil {
		return nil, fmt.Errorf("store: schedule revisions: %w", err)
	}
	return list, nil
}

// ScheduleLine is a line as the schedule exports read it: the JSON columns as raw
// bytes, unvalidated (the database has validated them as jsonb), so reading a big
// project costs one copy of each value and no parse.
type ScheduleLine struct {
	ID         int64  `db:"id"`
	Tag        string `db:"tag"`
	Service    string `db:"service"`
	Location   string `db:"location"`
	Exposure   string `db:"exposure"`
	Input      []byte `db:"input"`
	Fittings   []byte `db:"fittings"`
	Notes      string `db:"notes"`
	Result     []byte `db:"result"`
	ResultHash string `db:"result_hash"`
}

// ScheduleLines lists a project's lines in their order, for the schedule exports.
func (s *Store) ScheduleLines(ctx context.Context, projectID int64) ([]ScheduleLine, error) {
	rows, _ := s.pool.Query(ctx, `SELECT id, tag, service, location, exposure, input, fittings, notes, result, result_hash
		FROM lines WHERE project_id = $1 ORDER BY position, id`, projectID)
	list, err := pgx.CollectRows(rows, pgx.RowToStructByName[ScheduleLine])
	if err != nil {
		return nil, fmt.Errorf("store: schedule lines of project %d: %w", projectID, err)
	}
	return list, nil
}

// StreamedLine is a line as the streamed schedule exports read it: its own input and
// fittings as raw JSON, and only the parts of its stored result that the caller named
// (ResultParts[i] for paths[i]), so a big project's results are neither sent whole
// nor decoded whole.
type StreamedLine struct {
	ID         int64
	Tag        string
	Service    string
	Location   string
	Exposure   string
	Input      []byte
	Fittings   []byte
	Notes      string
	ResultHash string
	HasResult  bool // a result is stored (it may still be stale)
	// ResultParts are the values at the named paths as PostgreSQL's #>> writes them:
	// JSON text for objects and arrays, numbers and booleans as their JSON text,
	// strings unquoted, nil for a JSON null or a missing key.
	ResultParts [][]byte
}

// EachScheduleLines reads a project's lines in their order through one result set
// (pgx reads the rows off the connection as they are iterated, never all at once) and
// hands them to fn batch lines at a time; a batch's slice is fn's to keep. paths name
// the parts of each stored result to read, e.g. {"output", "sizing", "governing"}.
// fn's error stops the reading and is returned.
func (s *Store) EachScheduleLines(ctx context.Context, projectID int64, paths [][]string, batch int,
	fn func([]StreamedLine) error) error {
	batch = max(batch, 1)
	// The inner query detoasts each stored result once (result #> '{}' returns the whole
	// value, decompressed); without it every path below would decompress it again.
	var sql strings.Builder
	sql.WriteString(`SELECT id, tag, service, location, exposure, input, fittings, notes, result_hash, r IS NOT NULL`)
	args := []any{projectID}
	for _, p := range paths {
		args = append(args, p)
		fmt.Fprintf(&sql, `, r #>> $%d::text[]`, len(args))
	}
	sql.WriteString(` FROM (SELECT id, position, tag, service, location, exposure, input, fittings, notes, result_hash,
		result #> '{}'::text[] AS r FROM lines WHERE project_id = $1 OFFSET 0) l ORDER BY position, id`)
	rows, err := s.pool.Query(ctx, sql.String(), args...)
	if err != nil {
		return fmt.Errorf("store: schedule lines of project %d: %w", projectID, err)
	}
	defer rows.Close()
	out := make([]StreamedLine, 0, batch)
	dest := make([]any, 10+len(paths))
	for rows.Next() {
		out = append(out, StreamedLine{ResultParts: make([][]byte, len(paths))})
		l := &out[len(out)-1]
		dest[0], dest[1], dest[2], dest[3], dest[4] = &l.ID, &l.Tag, &l.Service, &l.Location, &l.Exposure
		dest[5], dest[6], dest[7], dest[8], dest[9] = &l.Input, &l.Fittings, &l.Notes, &l.ResultHash, &l.HasResult
		for i := range paths {
			dest[10+i] = &l.ResultParts[i]
		}
		if err := rows.Scan(dest...); err != nil {
			return fmt.Errorf("store: schedule lines of project %d: %w", projectID, err)
		}
		if len(out) == batch {
			if err := fn(out); err != nil {
				return err
			}
			out = make([]StreamedLine, 0, batch)
		}
	}
	if err := rows.Err(); err != nil {
		return fmt.Errorf("store: schedule lines of project %d: %w", projectID, err)
	}
	if len(out) > 0 {
		return fn(out)
	}
	return nil
}
