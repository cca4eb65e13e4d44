import type { MigrationFn } from 'umzug'
import type { Sequelize } from 'sequelize'

export const up: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    CREATE TYPE investigation_status AS ENUM ('draft', 'in-review', 'published');
    CREATE TABLE investigations (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      newsroom_id uuid NOT NULL REFERENCES newsrooms(id) ON DELETE CASCADE,
      title text NOT NULL,
      status investigation_status NOT NULL DEFAULT 'draft',
      -- Bumped by every reorder, so two people moving blocks at once cannot silently undo each other.
      layout_version integer NOT NULL DEFAULT 1,
      created_by uuid NOT NULL REFERENCES users(id),
      updated_by uuid REFERENCES users(id),
      archived_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX investigations_newsroom ON investigations(newsroom_id, updated_at DESC);

    CREATE TYPE block_kind AS ENUM ('prose', 'analysis');
    CREATE TABLE blocks (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      investigation_id uuid NOT NULL REFERENCES investigations(id) ON DELETE CASCADE,
      kind block_kind NOT NULL,
      position integer NOT NULL,
      content jsonb,
      settings jsonb,
      version integer NOT NULL DEFAULT 1,
      created_by uuid NOT NULL REFERENCES users(id),
      updated_by uuid REFERENCES users(id),
      deleted_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX blocks_investigation ON blocks(investigation_id, position) WHERE deleted_at IS NULL;
    CREATE INDEX blocks_dataset ON blocks((settings->>'datasetId')) WHERE kind = 'analysis';

    -- Datasets never change once ready, so a result computed for a dataset and settings stays true.
    CREATE TABLE analysis_results (
      cache_key text PRIMARY KEY,
      dataset_id uuid NOT NULL REFERENCES datasets(id) ON DELETE CASCADE,
      result jsonb NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now()
    );
  `)
}

export const down: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    DROP TABLE analysis_results; DROP TABLE blocks; DROP TYPE block_kind;
    DROP TABLE investigations; DROP TYPE investigation_status;
  `)
}
