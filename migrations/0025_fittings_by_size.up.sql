-- Fittings by size (issue 16): a line's flange count is named flange_pairs, and a
-- project whose fitting allowances are still the old size-blind defaults (elbow 0.6,
-- tee 0.9, valve 1.5, flange 0.6, cap 0.3 m) drops them, so the table by size applies.
-- Allowances a user changed stay: they now apply to every size.
UPDATE lines
   SET fittings = (fittings - 'flanges') || jsonb_build_object('flange_pairs', fittings -> 'flanges')
 WHERE fittings ? 'flanges';

UPDATE projects
   SET settings = settings - 'fittings'
 WHERE settings -> 'fittings' = '{"elbow_m": 0.6, "tee_m": 0.9, "valve_m": 1.5, "flange_m": 0.6, "cap_m": 0.3}'::jsonb;
