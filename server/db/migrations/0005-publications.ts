import type { MigrationFn } from 'umzug'
import type { Sequelize } from 'sequelize'

export const up: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    -- A publication is a frozen snapshot: later edits never reach it.
    CREATE TABLE publications (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      investigation_id uuid NOT NULL REFERENCES investigations(id) ON DELETE CASCADE,
      snapshot jsonb NOT NULL,
      override_reason text,
      published_by uuid NOT NULL REFERENCES users(id),
      published_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX publications_investigation ON publications(investigation_id, published_at DESC);

    -- Only the token's SHA-256 is kept; the token itself is shown once, to the publisher.
    CREATE TABLE share_links (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      publication_id uuid NOT NULL REFERENCES publications(id) ON DELETE CASCADE,
      investigation_id uuid NOT NULL REFERENCES investigations(id) ON DELETE CASCADE,
      token_hash text NOT NULL UNIQUE,
      expires_at timestamptz,
      revoked_at timestamptz,
      revoked_by uuid REFERENCES users(id),
      created_by uuid NOT NULL REFERENCES users(id),
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX share_links_investigation ON share_links(investigation_id);
  `)
}

export const down: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query('DROP TABLE share_links; DROP TABLE publications;')
}
