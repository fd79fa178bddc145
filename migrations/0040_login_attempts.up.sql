-- Sign-in attempts for the login limit, shared by every app instance on this database.
-- An attempt is recorded (reserved) before its password is checked, so parallel
-- guesses cannot all slip under the limit; a successful sign-in removes its own rows
-- and the name's earlier failures. Rows older than the window are deleted as new
-- attempts arrive.
CREATE TABLE login_attempts (
    id     bigserial PRIMARY KEY,
    key    text NOT NULL CHECK (length(key) <= 200),
    at     timestamptz NOT NULL DEFAULT now()
);

CREATE INDEX login_attempts_key_idx ON login_attempts (key, at);
CREATE INDEX login_attempts_at_idx ON login_attempts (at);
