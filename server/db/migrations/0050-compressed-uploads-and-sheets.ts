import type { MigrationFn } from 'umzug'
import type { Sequelize } from 'sequelize'

// A table may come gzipped or alone in a zip (compression, and the zip entry that holds it), and a
// workbook's sheet is chosen (sheet; null: the first visible one), with the sheets it lists kept
// for choosing another later.
export const up: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    ALTER TABLE datasets
      ADD COLUMN compression text CHECK (compression IN ('gzip', 'zip')),
      ADD COLUMN archive_entry text,
      ADD COLUMN sheet text,
      ADD COLUMN sheets text[];
  `)
}

export const down: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`ALTER TABLE datasets DROP COLUMN compression, DROP COLUMN archive_entry, DROP COLUMN sheet, DROP COLUMN sheets;`)
}
