import type { MigrationFn } from 'umzug'
import type { Sequelize } from 'sequelize'

// A number column's value ladder (server/services/datasets/value-ladder.ts): the bounds of its rungs,
// whose digit counts the cube keeps (group_pos -2, and -3 by one text column), so that a range filter
// on the tested column adds up rungs. A dataset imported before has none and scans. Per value of a
// text column, a number column's repeated values are also kept (counted once after the import), so
// that repeated amounts filtered to one department or one vendor read them instead of grouping values.
export const up: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    ALTER TABLE dataset_columns ADD COLUMN ladder jsonb;
    CREATE TABLE dataset_code_repeats (
      dataset_id uuid NOT NULL REFERENCES datasets(id) ON DELETE CASCADE,
      column_pos smallint NOT NULL,
      group_pos smallint NOT NULL,
      group_code integer NOT NULL,
      sign smallint NOT NULL,
      repeats jsonb NOT NULL,
      PRIMARY KEY (dataset_id, column_pos, group_pos, group_code, sign)
    );
  `)
}

export const down: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query('DROP TABLE dataset_code_repeats; ALTER TABLE dataset_columns DROP COLUMN ladder;')
}
