import type { MigrationFn } from 'umzug'
import type { Sequelize } from 'sequelize'

// Claim ids name a claim within its investigation only (0100), so a thread's subject does too: two
// newsrooms that use the same claim id each get their own conversation, and neither can reach the other's.
export const up: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    ALTER TABLE threads DROP CONSTRAINT threads_subject_type_subject_id_key;
    ALTER TABLE threads ADD CONSTRAINT threads_subject UNIQUE (investigation_id, subject_type, subject_id);
  `)
}

export const down: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    ALTER TABLE threads DROP CONSTRAINT threads_subject;
    ALTER TABLE threads ADD CONSTRAINT threads_subject_type_subject_id_key UNIQUE (subject_type, subject_id);
  `)
}
