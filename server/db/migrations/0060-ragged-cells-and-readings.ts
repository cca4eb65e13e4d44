import type { MigrationFn } from 'umzug'
import type { Sequelize } from 'sequelize'

// Ragged rows are kept whole: a row with another number of cells than the header keeps that number
// (cell_count; null when it matched) and the cells past the header (extra_cells).
// Readings: a column read another way after the import is a new dataset over the same stored bytes.
// reading_of names the first reading of that upload (null on the first reading itself), reading_no
// counts them from 1, and column_readings holds how its columns were told to be read, by column name.
export const up: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    ALTER TABLE dataset_rows ADD COLUMN cell_count integer, ADD COLUMN extra_cells text[];
    ALTER TABLE datasets
      ADD COLUMN reading_of uuid REFERENCES datasets(id) ON DELETE SET NULL,
      ADD COLUMN reading_no integer NOT NULL DEFAULT 1,
      ADD COLUMN column_readings jsonb NOT NULL DEFAULT '{}'::jsonb;
    CREATE UNIQUE INDEX datasets_reading ON datasets (reading_of, reading_no) WHERE reading_of IS NOT NULL;
  `)
}

export const down: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    ALTER TABLE datasets DROP COLUMN reading_of, DROP COLUMN reading_no, DROP COLUMN column_readings;
    ALTER TABLE dataset_rows DROP COLUMN cell_count, DROP COLUMN extra_cells;
  `)
}
