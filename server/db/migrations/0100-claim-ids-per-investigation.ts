import type { MigrationFn } from 'umzug'
import type { Sequelize } from 'sequelize'

// A claim's id is the one its mark carries in the text, chosen by the editor. It names the claim
// within its investigation only: a newsroom that happens to use (or copies) an id another
// investigation holds simply gets its own claim, so no answer can tell that the id is in use elsewhere.
// The rows stay as they are; only the key changes, and an index keeps `/api/claims/{id}` a lookup.
export const up: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    ALTER TABLE claims DROP CONSTRAINT claims_pkey;
    ALTER TABLE claims ADD CONSTRAINT claims_pkey PRIMARY KEY (investigation_id, id);
    CREATE INDEX claims_id ON claims(id);
    DROP INDEX claims_investigation;
  `)
}

// Back to one key for every claim: refused while two investigations hold the same id.
export const down: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    CREATE INDEX claims_investigation ON claims(investigation_id);
    DROP INDEX claims_id;
    ALTER TABLE claims DROP CONSTRAINT claims_pkey;
    ALTER TABLE claims ADD CONSTRAINT claims_pkey PRIMARY KEY (id);
  `)
}
