-- Energy-code tables as data: the catalog's built-in tables (seeded read-only at start, like
-- materials) and users' own. The table itself (rows, columns, systems, footnotes, source) is
-- the body; slug is the table's id ("ashrae-90.1-2016"), the key a line's
-- criteria.energy_code names.
CREATE TABLE code_tables (
    slug       text PRIMARY KEY,
    name       text NOT NULL,
    edition    text NOT NULL,
    kind       text NOT NULL CHECK (kind IN ('pipe', 'duct')),
    body       jsonb NOT NULL,
    builtin    boolean NOT NULL DEFAULT false,
    version    integer NOT NULL DEFAULT 1,
    created_at timestamptz NOT NULL DEFAULT now(),
    updated_at timestamptz NOT NULL DEFAULT now()
);
