import type { MigrationFn } from 'umzug'
import type { Sequelize } from 'sequelize'

// Dates read at import: each coded text of a date column gets its day (days since 1970-01-01, null
// when it reads as no date), so date ranges and periods compare integers; the column keeps how its
// dates were read. A number column also keeps its repeated amounts per sign, counted once after the
// import, so the unfiltered repeated-amounts test reads them instead of grouping every value again.
export const up: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    ALTER TABLE dataset_group_values ADD COLUMN day integer;
    ALTER TABLE dataset_columns ADD COLUMN dates jsonb;
    ALTER TABLE dataset_columns ADD COLUMN repeats jsonb;
  `)
}

export const down: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    ALTER TABLE dataset_columns DROP COLUMN repeats;
    ALTER TABLE dataset_columns DROP COLUMN dates;
    ALTER TABLE dataset_group_values DROP COLUMN day;
  `)
}
