-- Issued revisions of a project's insulation schedule: a snapshot of its rows, totals
-- and header (JSON, SI), so later edits to lines or materials never change an issued
-- schedule.
CREATE TABLE schedule_revisions (
    id          bigserial PRIMARY KEY,
    project_id  bigint NOT NULL REFERENCES projects ON DELETE CASCADE,
    number      int NOT NULL CHECK (number > 0),
    issued_at   timestamptz NOT NULL DEFAULT now(),
    note        text NOT NULL DEFAULT '',
    rows        jsonb NOT NULL,
    totals      jsonb NOT NULL,
    header      jsonb NOT NULL,
    UNIQUE (project_id, number)
);
