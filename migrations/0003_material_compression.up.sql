-- Installed compression of compressible materials (blankets and duct wrap), percent of
-- the nominal thickness. Until now the app assumed 25 % for every compressible row
-- (common practice); storing that keeps every material's data, and so its version,
-- unchanged.
ALTER TABLE materials
    ADD COLUMN compression_pct double precision NOT NULL DEFAULT 0
        CHECK (compression_pct >= 0 AND compression_pct < 100);

UPDATE materials SET compression_pct = 25 WHERE compressible;
