-- Accounts and login sessions. Passwords are stored as bcrypt hashes; session tokens
-- only as their SHA-256 (a copied table gives no usable cookie). Deleting a user ends
-- their sessions.
CREATE TABLE users (
    id             bigserial PRIMARY KEY,
    name           text NOT NULL UNIQUE CHECK (name <> '' AND length(name) <= 64),
    password_hash  text NOT NULL,
    role           text NOT NULL DEFAULT 'editor' CHECK (role IN ('editor', 'viewer')),
    created_at     timestamptz NOT NULL DEFAULT now()
);

CREATE TABLE sessions (
    token_hash  bytea PRIMARY KEY,
    user_id     bigint NOT NULL REFERENCES users ON DELETE CASCADE,
    expires_at  timestamptz NOT NULL,
    created_at  timestamptz NOT NULL DEFAULT now()
);

CREATE INDEX sessions_user_idx ON sessions (user_id);
CREATE INDEX sessions_expires_idx ON sessions (expires_at);
