import type { MigrationFn } from 'umzug'
import type { Sequelize } from 'sequelize'

// Every saved state of a block, append-only like the audit trail (the app's role may only read and
// add to it, see grantAppRole). Blocks saved before history was kept get their state at this
// migration as their first version ('recorded'); publications name the block versions they froze,
// so a draft can be compared with what the public link shows.
export const up: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    CREATE TABLE block_versions (
      id bigserial PRIMARY KEY,
      block_id uuid NOT NULL REFERENCES blocks(id),
      investigation_id uuid NOT NULL REFERENCES investigations(id),
      version integer NOT NULL,
      kind text NOT NULL CHECK (kind IN ('prose', 'analysis')),
      content jsonb,
      settings jsonb,
      change text NOT NULL CHECK (change IN ('recorded', 'created', 'edited', 'restored', 'claim-removed')),
      restored_from integer,
      saved_by uuid REFERENCES users(id),
      saved_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (block_id, version)
    );
    CREATE INDEX block_versions_investigation ON block_versions (investigation_id, saved_at);
    CREATE FUNCTION block_versions_refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      RAISE EXCEPTION 'block_versions is append-only';
    END $$;
    CREATE TRIGGER block_versions_append_only BEFORE UPDATE OR DELETE ON block_versions
      FOR EACH ROW EXECUTE FUNCTION block_versions_refuse_change();
    CREATE TRIGGER block_versions_no_truncate BEFORE TRUNCATE ON block_versions
      FOR EACH STATEMENT EXECUTE FUNCTION block_versions_refuse_change();
    INSERT INTO block_versions (block_id, investigation_id, version, kind, content, settings, change, saved_by, saved_at)
      SELECT id, investigation_id, version, kind::text, content, settings, 'recorded', coalesce(updated_by, created_by), updated_at FROM blocks;
    ALTER TABLE publications ADD COLUMN block_versions jsonb;
  `)
}

export const down: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    ALTER TABLE publications DROP COLUMN block_versions;
    DROP TABLE block_versions; DROP FUNCTION block_versions_refuse_change();
  `)
}
