import type { MigrationFn } from 'umzug'
import type { Sequelize } from 'sequelize'

// The digit counts of every distribution test, counted once at import per number column, whole and
// per value of each text column (server/services/datasets/digit-cube.ts); partitioned by dataset
// like the records they summarise. `cube_groups` lists the text columns a number column was
// counted by (-1: the whole column); a dataset imported before this has none and scans.
export const up: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    CREATE TABLE digit_cube (
      dataset_id uuid NOT NULL,
      column_pos smallint NOT NULL,
      group_pos smallint NOT NULL,
      group_code integer NOT NULL,
      counts integer[] NOT NULL,
      arcs double precision[] NOT NULL
    ) PARTITION BY LIST (dataset_id);
    ALTER TABLE dataset_columns ADD COLUMN cube_groups smallint[];
  `)
}

export const down: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query('ALTER TABLE dataset_columns DROP COLUMN cube_groups; DROP TABLE digit_cube;')
}
