import type { MigrationFn } from 'umzug'
import type { Sequelize } from 'sequelize'

// Accounts that can be ended and recovered (server/services/account/):
// - sessions: one row per sign-in; the sealed cookie carries a random token whose hash is the key,
//   so ending the row ends the cookie, wherever it was copied to.
// - sign_in_throttles: failure counters per key (address and account, address alone, account alone);
//   an attempt is admitted under the row lock, counted as pending, before the password is checked.
// - password_resets: single-use, expiring links, stored as the token's hash.
// - two-factor sign-in: the authenticator secret on the user (pending until the first code proves it),
//   the last time step used (a code works once), hashed recovery codes, and the newsroom's requirement.
export const up: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    CREATE TABLE sessions (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      token_hash text NOT NULL UNIQUE,
      second_factor boolean NOT NULL DEFAULT false,
      ip text NOT NULL,
      user_agent text NOT NULL DEFAULT '',
      created_at timestamptz NOT NULL DEFAULT now(),
      last_seen_at timestamptz NOT NULL DEFAULT now(),
      expires_at timestamptz NOT NULL,
      ended_at timestamptz,
      ended_reason text
    );
    CREATE INDEX sessions_user_open ON sessions(user_id) WHERE ended_at IS NULL;

    CREATE TABLE sign_in_throttles (
      key text PRIMARY KEY,
      failures integer NOT NULL DEFAULT 0,
      blocked_until timestamptz,
      last_failure_at timestamptz NOT NULL DEFAULT now(),
      -- attempts admitted and not yet settled (a crashed server's count lapses after pending_at + 15 s)
      pending integer NOT NULL DEFAULT 0,
      pending_at timestamptz
    );

    CREATE TABLE password_resets (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      token_hash text NOT NULL UNIQUE,
      expires_at timestamptz NOT NULL,
      used_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX password_resets_user ON password_resets(user_id, created_at);

    ALTER TABLE users
      ADD COLUMN totp_secret text,
      ADD COLUMN totp_pending_secret text,
      ADD COLUMN totp_last_step bigint;
    CREATE TABLE recovery_codes (
      id bigserial PRIMARY KEY,
      user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      code_hash text NOT NULL,
      used_at timestamptz,
      UNIQUE (user_id, code_hash)
    );
    ALTER TABLE newsrooms ADD COLUMN require_two_factor boolean NOT NULL DEFAULT false;

    -- Two invitations for one address could both be pending when created at the same moment.
    UPDATE invitations i SET revoked_at = now()
      WHERE accepted_at IS NULL AND revoked_at IS NULL AND EXISTS (
        SELECT 1 FROM invitations n WHERE n.newsroom_id = i.newsroom_id AND n.email = i.email
          AND n.accepted_at IS NULL AND n.revoked_at IS NULL AND n.created_at > i.created_at);
    CREATE UNIQUE INDEX invitations_one_pending ON invitations(newsroom_id, email)
      WHERE accepted_at IS NULL AND revoked_at IS NULL;
  `)
}

export const down: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    DROP INDEX invitations_one_pending;
    ALTER TABLE newsrooms DROP COLUMN require_two_factor;
    DROP TABLE recovery_codes;
    ALTER TABLE users DROP COLUMN totp_secret, DROP COLUMN totp_pending_secret, DROP COLUMN totp_last_step;
    DROP TABLE password_resets; DROP TABLE sign_in_throttles; DROP TABLE sessions;
  `)
}
