ALTER TABLE lines DROP COLUMN exposure, DROP COLUMN fittings;
