package store

import (
	"context"
	"crypto/rand"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"time"

	"github.com/jackc/pgx/v5"
)

// Background jobs in PostgreSQL (migration 0041): queued by any instance, claimed by
// any instance's runner under a lease it renews, reported from the table. See the
// migration for the rules.

// Job states.
const (
	JobQueued  = "queued"
	JobRunning = "running"
	JobDone    = "done"
	JobFailed  = "failed"
)

// JobMaxAttempts is how often a job is started before an interrupted one is failed.
const JobMaxAttempts = 3

// jobKeep is how long a finished job stays for its progress page.
const jobKeep = time.Hour

// ErrJobLost: the runner's lease ran out and another runner took the job.
var ErrJobLost = errors.New("job taken over by another runner")

// Job is one background job. Payload is read only by ClaimJob.
type Job struct {
	ID        string          `db:"id"`
	Kind      string          `db:"kind"`
	ProjectID int64           `db:"project_id"`
	Payload   []byte          `db:"payload"`
	State     string          `db:"state"`
	Phase     string          `db:"phase"`
	Done      int             `db:"done"`
	Total     int             `db:"total"`
	Created   int             `db:"created"`
	Message   string          `db:"message"`
	Problems  json.RawMessage `db:"problems"`
	Attempts  int             `db:"attempts"`
	Runner    string          `db:"runner"`
	CreatedAt time.Time       `db:"created_at"`
}

const jobColumns = `id, kind, project_id, ''::bytea AS payload, state, phase, done, total, created, message, problems, attempts, runner, created_at`

// EnqueueJob queues a job and returns its id (32 random hex digits). It also drops
// jobs that ended over an hour ago.
func (s *Store) EnqueueJob(ctx context.Context, kind string, projectID int64, payload []byte) (string, error) {
	b := make([]byte, 16)
	_, _ = rand.Read(b) // never fails
	id := hex.EncodeToString(b)
	err := pgx.BeginFunc(ctx, s.pool, func(tx pgx.Tx) error {
		if _, err := tx.Exec(ctx, `DELETE FROM jobs WHERE ended_at < now() - $1::interval`, jobKeep); err != nil {
			return err
		}
		_, err := tx.Exec(ctx, `INSERT INTO jobs (id, kind, project_id, payload) VALUES ($1, $2, $3, $4)`, id, kind, projectID, payload)
		return err
	})
	if err != nil {
		return "", lineError("queue job", Line{ProjectID: projectID}, err)
	}
	return id, nil
}

// Job returns a job without its payload, or ErrNotFound.
func (s *Store) Job(ctx context.Context, id string) (Job, error) {
	rows, _ := s.pool.Query(ctx, `SELECT `+jobColumns+` FROM jobs WHERE id = $1`, id)
	j, err := pgx.CollectExactlyOneRow(rows, pgx.RowToStructByName[Job])
	if errors.Is(err, pgx.ErrNoRows) {
		return Job{}, fmt.Errorf("store: job: %w", ErrNotFound)
	}
	if err != nil {
		return Job{}, fmt.Errorf("store: job: %w", err)
	}
	return j, nil
}

// ClaimJob takes the oldest queued job of kind (or a running one whose lease ran
// out) for runner until lease from now, with its payload; ok is false when there is
// none. Interrupted jobs already started JobMaxAttempts times are failed instead.
func (s *Store) ClaimJob(ctx context.Context, kind, runner string, lease time.Duration) (j Job, ok bool, err error) {
	_, err = s.pool.Exec(ctx, `
		UPDATE jobs SET state = 'failed', ended_at = now(), payload = '',
		       message = 'it was interrupted ' || attempts || ' times (the app stopped while it ran); try again'
		WHERE kind = $1 AND state = 'running' AND lease_until < now() AND attempts >= $2`, kind, JobMaxAttempts)
	if err != nil {
		return Job{}, false, fmt.Errorf("store: claim job: %w", err)
	}
	rows, _ := s.pool.Query(ctx, `
		UPDATE jobs SET state = 'running', runner = $2, lease_until = now() + $3::interval, attempts = attempts + 1,
		       phase = '', done = 0
		WHERE id = (SELECT id FROM jobs
		            WHERE kind = $1 AND (state = 'queued' OR (state = 'running' AND lease_until < now()))
		            ORDER BY created_at LIMIT 1 FOR UPDATE SKIP LOCKED)
		RETURNING id, kind, project_id, payload, state, phase, done, total, created, message, problems, attempts, runner, created_at`,
		kind, runner, lease)
	j, err = pgx.CollectExactlyOneRow(rows, pgx.RowToStructByName[Job])
	if errors.Is(err, pgx.ErrNoRows) {
		return Job{}, false, nil
	}
	if err != nil {
		return Job{}, false, fmt.Errorf("store: claim job: %w", err)
	}
	return j, true, nil
}

// JobProgress records a running job's progress and renews its lease; ErrJobLost
// when runner no longer holds it.
func (s *Store) JobProgress(ctx context.Context, id, runner, phase string, done, total int, lease time.Duration) error {
	tag, err := s.pool.Exec(ctx, `
		UPDATE jobs SET phase = $3, done = $4, total = $5, lease_until = now() + $6::interval
		WHERE id = $1 AND runner = $2 AND state = 'running'`, id, runner, phase, done, total, lease)
	if err != nil {
		return fmt.Errorf("store: job progress: %w", err)
	}
	if tag.RowsAffected() == 0 {
		return fmt.Errorf("store: job %s: %w", id, ErrJobLost)
	}
	return nil
}

// FailJob ends a running job as failed with a message (and row problems, as JSON).
func (s *Store) FailJob(ctx context.Context, id, runner, message string, problems any) error {
	js, err := json.Marshal(problems)
	if err != nil {
		return fmt.Errorf("store: fail job: %w", err)
	}
	tag, err := s.pool.Exec(ctx, `
		UPDATE jobs SET state = 'failed', phase = 'failed', message = $3, problems = $4, ended_at = now(), payload = ''
		WHERE id = $1 AND runner = $2 AND state = 'running'`, id, runner, message, js)
	if err != nil {
		return fmt.Errorf("store: fail job: %w", err)
	}
	if tag.RowsAffected() == 0 {
		return fmt.Errorf("store: job %s: %w", id, ErrJobLost)
	}
	return nil
}

// CreateLinesForJob is CreateLines for a running import job: the lines are saved and
// the job marked done in one transaction, so a job is never done twice nor lost
// between the two. ErrJobLost when runner no longer holds the job (nothing saved).
func (s *Store) CreateLinesForJob(ctx context.Context, jobID, runner string, projectID int64, lines []Line, materials LineMaterials) (int, error) {
	err := pgx.BeginFunc(ctx, s.pool, func(tx pgx.Tx) error {
		// Lock the job row first: a runner that took it over meanwhile waits or sees it done.
		tag, err := tx.Exec(ctx, `
			UPDATE jobs SET state = 'done', phase = 'done', created = $3, done = $3, total = $3, ended_at = now(), payload = ''
			WHERE id = $1 AND runner = $2 AND state = 'running'`, jobID, runner, len(lines))
		if err != nil {
			return err
		}
		if tag.RowsAffected() == 0 {
			return fmt.Errorf("job %s: %w", jobID, ErrJobLost)
		}
		return createLinesTx(ctx, tx, projectID, lines, materials)
	})
	return lineResult("import lines", projectID, len(lines), err)
}

// RenewJob extends runner's lease on a running job; ErrJobLost when it no longer
// holds it.
func (s *Store) RenewJob(ctx context.Context, id, runner string, lease time.Duration) error {
	tag, err := s.pool.Exec(ctx, `UPDATE jobs SET lease_until = now() + $3::interval WHERE id = $1 AND runner = $2 AND state = 'running'`,
		id, runner, lease)
	if err != nil {
		return fmt.Errorf("store: renew job: %w", err)
	}
	if tag.RowsAffected() == 0 {
		return fmt.Errorf("store: job %s: %w", id, ErrJobLost)
	}
	return nil
}

// ReleaseJob puts a running job back in the queue (its runner is stopping), not
// counting the attempt, so another instance starts it at once.
func (s *Store) ReleaseJob(ctx context.Context, id, runner string) error {
	_, err := s.pool.Exec(ctx, `
		UPDATE jobs SET state = 'queued', runner = '', lease_until = NULL, attempts = greatest(attempts - 1, 0), phase = '', done = 0
		WHERE id = $1 AND runner = $2 AND state = 'running'`, id, runner)
	if err != nil {
		return fmt.Errorf("store: release job: %w", err)
	}
	return nil
}
