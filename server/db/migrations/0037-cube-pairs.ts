import type { MigrationFn } from 'umzug'
import type { Sequelize } from 'sequelize'

// The digit cube also counts a number column by two text columns together (a cell per pair of
// values, digit-cube.ts): `pair_pos` and `pair_code` name the second column and its value (-1 and 0
// in the cells of one column or of the whole). `cube_pairs` lists the pairs each number column was
// counted by.
export const up: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    ALTER TABLE digit_cube ADD COLUMN pair_pos smallint NOT NULL DEFAULT -1, ADD COLUMN pair_code integer NOT NULL DEFAULT 0;
    ALTER TABLE dataset_columns ADD COLUMN cube_pairs smallint[];
  `)
}

export const down: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query('ALTER TABLE dataset_columns DROP COLUMN cube_pairs; ALTER TABLE digit_cube DROP COLUMN pair_pos, DROP COLUMN pair_code;')
}
