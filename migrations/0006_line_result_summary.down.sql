ALTER TABLE lines DROP COLUMN result_key;
ALTER TABLE lines DROP COLUMN result_summary;
DROP FUNCTION line_result_summary(jsonb);
