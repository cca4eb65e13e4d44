import type { MigrationFn } from 'umzug'
import type { Sequelize } from 'sequelize'

// The trail is read newest first a page at a time (by id); a title save names the version it renamed from.
export const up: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    CREATE INDEX audit_events_newsroom_id ON audit_events (newsroom_id, id DESC);
    CREATE INDEX audit_events_investigation_id ON audit_events (investigation_id, id DESC);
    ALTER TABLE investigations ADD COLUMN title_version integer NOT NULL DEFAULT 1;
  `)
}

export const down: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    DROP INDEX audit_events_newsroom_id; DROP INDEX audit_events_investigation_id;
    ALTER TABLE investigations DROP COLUMN title_version;
  `)
}
