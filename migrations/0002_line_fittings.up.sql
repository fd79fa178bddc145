-- Fitting counts per line (elbows, tees, valves, flanges, caps) and whether the run
-- is exposed or concealed (for the schedule and the finish).
ALTER TABLE lines
    ADD COLUMN fittings jsonb NOT NULL DEFAULT '{}',
    ADD COLUMN exposure text NOT NULL DEFAULT 'exposed' CHECK (exposure IN ('exposed', 'concealed'));
