import type { MigrationFn } from 'umzug'
import type { Sequelize } from 'sequelize'

export const up: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    CREATE TABLE newsrooms (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      name text NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE TABLE users (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      email text NOT NULL UNIQUE,
      name text NOT NULL,
      password_hash text NOT NULL,
      notify_by_email boolean NOT NULL DEFAULT true,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE TYPE member_role AS ENUM ('admin', 'data-editor', 'fact-checker', 'reporter');
    CREATE TABLE memberships (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      newsroom_id uuid NOT NULL REFERENCES newsrooms(id) ON DELETE CASCADE,
      user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      role member_role NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (newsroom_id, user_id)
    );
    CREATE INDEX memberships_user ON memberships(user_id);
    CREATE TABLE invitations (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      newsroom_id uuid NOT NULL REFERENCES newsrooms(id) ON DELETE CASCADE,
      email text NOT NULL,
      role member_role NOT NULL,
      token_hash text NOT NULL UNIQUE,
      invited_by uuid NOT NULL REFERENCES users(id),
      expires_at timestamptz NOT NULL,
      accepted_at timestamptz,
      revoked_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX invitations_newsroom ON invitations(newsroom_id);
    CREATE TABLE sign_in_attempts (
      id bigserial PRIMARY KEY,
      email text NOT NULL,
      ip text NOT NULL,
      succeeded boolean NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX sign_in_attempts_email ON sign_in_attempts(email, created_at);
    CREATE INDEX sign_in_attempts_ip ON sign_in_attempts(ip, created_at);

    -- The audit trail is append-only: the trigger refuses any change to a written event.
    CREATE TABLE audit_events (
      id bigserial PRIMARY KEY,
      newsroom_id uuid NOT NULL REFERENCES newsrooms(id) ON DELETE CASCADE,
      investigation_id uuid,
      actor_id uuid REFERENCES users(id),
      action text NOT NULL,
      subject_type text NOT NULL,
      subject_id text,
      detail jsonb NOT NULL DEFAULT '{}'::jsonb,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX audit_events_newsroom ON audit_events(newsroom_id, created_at);
    CREATE INDEX audit_events_investigation ON audit_events(investigation_id, created_at);
    CREATE FUNCTION audit_events_refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      RAISE EXCEPTION 'audit_events is append-only';
    END $$;
    CREATE TRIGGER audit_events_append_only BEFORE UPDATE OR DELETE ON audit_events
      FOR EACH ROW EXECUTE FUNCTION audit_events_refuse_change();
    CREATE TRIGGER audit_events_no_truncate BEFORE TRUNCATE ON audit_events
      FOR EACH STATEMENT EXECUTE FUNCTION audit_events_refuse_change();
  `)
}

export const down: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    DROP TABLE audit_events; DROP FUNCTION audit_events_refuse_change();
    DROP TABLE sign_in_attempts; DROP TABLE invitations; DROP TABLE memberships;
    DROP TYPE member_role; DROP TABLE users; DROP TABLE newsrooms;
  `)
}
