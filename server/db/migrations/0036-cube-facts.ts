import type { MigrationFn } from 'umzug'
import type { Sequelize } from 'sequelize'

// Each cell of the digit cube also keeps the smallest and largest absolute value per sign, beside
// the suitability counts its counts array now ends with (digit-cube.ts), so that a filter on one text
// or date column answers its suitability check from the cells too. Cells counted before have none:
// those datasets count the records for it.
export const up: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query('ALTER TABLE digit_cube ADD COLUMN ends text[]')
}

export const down: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query('ALTER TABLE digit_cube DROP COLUMN ends')
}
