ALTER TABLE materials DROP COLUMN compression_pct;
