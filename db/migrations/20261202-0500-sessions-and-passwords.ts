// Server-side sessions (a token is only as good as its row), one-time password reset links, the
// refused sign-ins the site-wide throttle counts, and the wrong signature passwords the signing
// lock-out counts. All of it lives in PostgreSQL so that it holds across restarts and processes.
import type { Migration } from '../migrator';

export const up: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    CREATE TABLE sessions (
      id varchar(64) PRIMARY KEY,
      user_id integer NOT NULL REFERENCES users (id) ON DELETE CASCADE,
      created_at timestamptz NOT NULL DEFAULT now(),
      expires_at timestamptz NOT NULL,
      ended_at timestamptz,
      end_reason varchar(30) CHECK (end_reason IN ('sign-out', 'password-changed', 'password-reset', 'deactivated')),
      CHECK ((ended_at IS NULL) = (end_reason IS NULL))
    );
    CREATE INDEX sessions_open_by_user ON sessions (user_id) WHERE ended_at IS NULL;

    CREATE TABLE password_reset_tokens (
      id serial PRIMARY KEY,
      user_id integer NOT NULL REFERENCES users (id) ON DELETE CASCADE,
      token_hash char(64) NOT NULL UNIQUE,
      requested_by integer REFERENCES users (id),
      created_at timestamptz NOT NULL DEFAULT now(),
      expires_at timestamptz NOT NULL,
      used_at timestamptz
    );
    CREATE INDEX password_reset_tokens_by_user ON password_reset_tokens (user_id, created_at);

    CREATE TABLE refused_sign_ins (
      id bigserial PRIMARY KEY,
      email varchar(254) NOT NULL,
      address varchar(64) NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX refused_sign_ins_time ON refused_sign_ins (created_at);
    CREATE INDEX refused_sign_ins_email ON refused_sign_ins (email, created_at);
    CREATE INDEX refused_sign_ins_address ON refused_sign_ins (address, created_at);

    CREATE TABLE signature_failures (
      id bigserial PRIMARY KEY,
      user_id integer NOT NULL REFERENCES users (id) ON DELETE CASCADE,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX signature_failures_by_user ON signature_failures (user_id, created_at);

    ALTER TABLE users ADD COLUMN signing_locked_until timestamptz;
  `);
};

export const down: Migration = async ({ sequelize }) => {
  await sequelize.query(`
    ALTER TABLE users DROP COLUMN signing_locked_until;
    DROP TABLE signature_failures;
    DROP TABLE refused_sign_ins;
    DROP TABLE password_reset_tokens;
    DROP TABLE sessions;
  `);
};
