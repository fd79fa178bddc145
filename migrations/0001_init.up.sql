-- Projects: settings holds the design conditions per location, the criteria
-- defaults and the economics, as JSON in SI units.
CREATE TABLE projects (
    id          bigserial PRIMARY KEY,
    name        text NOT NULL,
    client      text NOT NULL DEFAULT '',
    site        text NOT NULL DEFAULT '',
    units       text NOT NULL DEFAULT 'si' CHECK (units IN ('si', 'us')),
    settings    jsonb NOT NULL DEFAULT '{}',
    version     int NOT NULL DEFAULT 1,
    created_at  timestamptz NOT NULL DEFAULT now(),
    updated_at  timestamptz NOT NULL DEFAULT now()
);

-- Materials: built-in classes (seeded from catalog) and custom ones. k_points are
-- apparent conductivity against mean temperature: [{"t_c": …, "k_w_mk": …}, …].
CREATE TABLE materials (
    slug            text PRIMARY KEY,
    name            text NOT NULL,
    category        text NOT NULL,
    spec            text NOT NULL DEFAULT '',
    k_points        jsonb NOT NULL,
    min_temp_c      double precision,
    max_temp_c      double precision,
    thicknesses_mm  jsonb NOT NULL DEFAULT '[]',
    max_layer_mm    double precision,
    compressible    boolean NOT NULL DEFAULT false,
    source          text NOT NULL DEFAULT '',
    builtin         boolean NOT NULL DEFAULT false,
    version         int NOT NULL DEFAULT 1,
    updated_at      timestamptz NOT NULL DEFAULT now()
);

CREATE TABLE jackets (
    slug             text PRIMARY KEY,
    name             text NOT NULL,
    emittance        double precision NOT NULL,
    vapour_retarder  boolean NOT NULL DEFAULT false,
    permeance_perm   double precision,
    use              text NOT NULL DEFAULT '',
    source           text NOT NULL DEFAULT '',
    builtin          boolean NOT NULL DEFAULT false,
    version          int NOT NULL DEFAULT 1,
    updated_at       timestamptz NOT NULL DEFAULT now()
);

-- Lines: one run of pipe or duct. input is the line's calc input JSON (SI);
-- result is the stored analysis, valid while result_hash matches.
CREATE TABLE lines (
    id           bigserial PRIMARY KEY,
    project_id   bigint NOT NULL REFERENCES projects ON DELETE CASCADE,
    position     int NOT NULL DEFAULT 0,
    tag          text NOT NULL,
    service      text NOT NULL DEFAULT '',
    location     text NOT NULL DEFAULT 'indoor',
    input        jsonb NOT NULL,
    notes        text NOT NULL DEFAULT '',
    result       jsonb,
    result_hash  text NOT NULL DEFAULT '',
    version      int NOT NULL DEFAULT 1,
    created_at   timestamptz NOT NULL DEFAULT now(),
    updated_at   timestamptz NOT NULL DEFAULT now(),
    UNIQUE (project_id, tag)
);

CREATE INDEX lines_project_position_idx ON lines (project_id, position);

-- Which materials each line uses, so a material in use cannot be deleted
-- (ON DELETE RESTRICT refuses it with SQLSTATE 23503).
CREATE TABLE line_materials (
    line_id        bigint NOT NULL REFERENCES lines ON DELETE CASCADE,
    material_slug  text NOT NULL REFERENCES materials ON UPDATE CASCADE ON DELETE RESTRICT,
    PRIMARY KEY (line_id, material_slug)
);

CREATE INDEX line_materials_material_idx ON line_materials (material_slug);
