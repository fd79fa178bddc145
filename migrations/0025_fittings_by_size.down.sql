UPDATE lines
   SET fittings = (fittings - 'flange_pairs') || jsonb_build_object('flanges', fittings -> 'flange_pairs')
 WHERE fittings ? 'flange_pairs';

UPDATE projects
   SET settings = settings || '{"fittings": {"elbow_m": 0.6, "tee_m": 0.9, "valve_m": 1.5, "flange_m": 0.6, "cap_m": 0.3}}'::jsonb
 WHERE NOT settings ? 'fittings';
