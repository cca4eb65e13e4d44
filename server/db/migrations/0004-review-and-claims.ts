import type { MigrationFn } from 'umzug'
import type { Sequelize } from 'sequelize'

export const up: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    CREATE TYPE review_status AS ENUM ('unreviewed', 'approved', 'changes-requested');
    ALTER TABLE blocks
      ADD COLUMN review_status review_status NOT NULL DEFAULT 'unreviewed',
      ADD COLUMN review_note text,
      ADD COLUMN reviewed_by uuid REFERENCES users(id),
      ADD COLUMN reviewed_at timestamptz,
      ADD COLUMN locked_by uuid REFERENCES users(id),
      ADD COLUMN locked_at timestamptz;

    CREATE TYPE claim_status AS ENUM ('open', 'verified', 'disputed');
    CREATE TABLE claims (
      id uuid PRIMARY KEY,
      investigation_id uuid NOT NULL REFERENCES investigations(id) ON DELETE CASCADE,
      block_id uuid NOT NULL REFERENCES blocks(id) ON DELETE CASCADE,
      quote text NOT NULL,
      supporting_block_ids uuid[] NOT NULL DEFAULT '{}',
      status claim_status NOT NULL DEFAULT 'open',
      note text,
      created_by uuid NOT NULL REFERENCES users(id),
      decided_by uuid REFERENCES users(id),
      decided_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX claims_investigation ON claims(investigation_id);
    CREATE INDEX claims_block ON claims(block_id);
  `)
}

export const down: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    DROP TABLE claims; DROP TYPE claim_status;
    ALTER TABLE blocks DROP COLUMN review_status, DROP COLUMN review_note, DROP COLUMN reviewed_by,
      DROP COLUMN reviewed_at, DROP COLUMN locked_by, DROP COLUMN locked_at;
    DROP TYPE review_status;
  `)
}
