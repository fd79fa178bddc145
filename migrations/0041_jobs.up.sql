-- Background jobs (large imports), shared by every app instance on this database: any
-- instance may run a queued job (claimed with FOR UPDATE SKIP LOCKED under a lease
-- that the runner renews), and any instance can show its progress. A job whose
-- runner died (its lease ran out) is taken up again, at most three times. An import
-- saves its lines and marks its job done in one transaction. Finished jobs are kept
-- an hour for their progress page.
CREATE TABLE jobs (
    id            text PRIMARY KEY CHECK (id ~ '^[0-9a-f]{32}$'),
    kind          text NOT NULL,
    project_id    bigint NOT NULL REFERENCES projects ON DELETE CASCADE,
    payload       bytea NOT NULL,
    state         text NOT NULL DEFAULT 'queued' CHECK (state IN ('queued', 'running', 'done', 'failed')),
    phase         text NOT NULL DEFAULT '',
    done          int NOT NULL DEFAULT 0,
    total         int NOT NULL DEFAULT 0,
    created       int NOT NULL DEFAULT 0,
    message       text NOT NULL DEFAULT '',
    problems      jsonb,
    attempts      int NOT NULL DEFAULT 0,
    runner        text NOT NULL DEFAULT '',
    lease_until   timestamptz,
    created_at    timestamptz NOT NULL DEFAULT now(),
    ended_at      timestamptz
);

CREATE INDEX jobs_waiting_idx ON jobs (created_at) WHERE state IN ('queued', 'running');
CREATE INDEX jobs_ended_idx ON jobs (ended_at) WHERE ended_at IS NOT NULL;
