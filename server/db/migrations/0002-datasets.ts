import type { MigrationFn } from 'umzug'
import type { Sequelize } from 'sequelize'

// Rows and digit records are partitioned by dataset: an import fills standalone tables and
// attaches them in one transaction when done, so a half-imported dataset is never visible,
// and every query of one dataset touches only its own partitions.
export const up: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    CREATE TYPE dataset_status AS ENUM ('importing', 'ready', 'failed');
    CREATE TABLE datasets (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      newsroom_id uuid NOT NULL REFERENCES newsrooms(id) ON DELETE CASCADE,
      title text NOT NULL,
      source_note text,
      source_url text,
      obtained_on date,
      original_name text NOT NULL,
      format text NOT NULL,
      sha256 text NOT NULL,
      byte_size bigint NOT NULL,
      storage_key text NOT NULL,
      status dataset_status NOT NULL DEFAULT 'importing',
      error text,
      progress real NOT NULL DEFAULT 0,
      row_count integer,
      ragged_rows integer NOT NULL DEFAULT 0,
      encoding text,
      delimiter text,
      replaces_id uuid REFERENCES datasets(id),
      archived_at timestamptz,
      created_by uuid NOT NULL REFERENCES users(id),
      created_at timestamptz NOT NULL DEFAULT now(),
      ready_at timestamptz
    );
    CREATE INDEX datasets_newsroom ON datasets(newsroom_id, created_at DESC);

    CREATE TABLE dataset_columns (
      dataset_id uuid NOT NULL REFERENCES datasets(id) ON DELETE CASCADE,
      position smallint NOT NULL,
      name text NOT NULL,
      kind text NOT NULL,
      decimal_mark char(1),
      parsed integer NOT NULL DEFAULT 0,
      blank integer NOT NULL DEFAULT 0,
      unreadable integer NOT NULL DEFAULT 0,
      zero integer NOT NULL DEFAULT 0,
      negative integer NOT NULL DEFAULT 0,
      min numeric,
      max numeric,
      magnitude_span real,
      samples jsonb NOT NULL DEFAULT '[]'::jsonb,
      PRIMARY KEY (dataset_id, position)
    );

    CREATE TABLE dataset_rows (
      dataset_id uuid NOT NULL,
      row_no integer NOT NULL,
      cells text[] NOT NULL
    ) PARTITION BY LIST (dataset_id);

    CREATE TABLE digit_records (
      dataset_id uuid NOT NULL,
      column_pos smallint NOT NULL,
      row_no integer NOT NULL,
      status smallint NOT NULL,
      sign smallint NOT NULL,
      value numeric,
      first_digit smallint,
      second_digit smallint,
      first_two smallint,
      first_three smallint,
      last_two smallint,
      integer_digits smallint NOT NULL,
      trailing_zeros smallint NOT NULL,
      fraction_digits smallint NOT NULL,
      mantissa real
    ) PARTITION BY LIST (dataset_id);
  `)
}

export const down: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    DROP TABLE digit_records; DROP TABLE dataset_rows; DROP TABLE dataset_columns;
    DROP TABLE datasets; DROP TYPE dataset_status;
  `)
}
