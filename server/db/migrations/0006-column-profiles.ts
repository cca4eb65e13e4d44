import type { MigrationFn } from 'umzug'
import type { Sequelize } from 'sequelize'

// The suitability facts of each whole number column, stored at import so that an unfiltered
// digit test does not scan the column again for them.
export const up: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query('ALTER TABLE dataset_columns ADD COLUMN profiles jsonb')
}

export const down: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query('ALTER TABLE dataset_columns DROP COLUMN profiles')
}
