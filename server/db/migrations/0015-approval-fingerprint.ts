import type { MigrationFn } from 'umzug'
import type { Sequelize } from 'sequelize'
import { fingerprintOf } from '../../utils/fingerprint'

// An approval belongs to the settings it approved. When the settings change, the block goes back to
// unreviewed but keeps who approved what (a fingerprint of the approved settings, and the settings
// themselves for the editor's undo); settings that return to the fingerprint return the approval.
export const up: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    ALTER TABLE blocks
      ADD COLUMN approved_fingerprint text,
      ADD COLUMN approved_settings jsonb,
      ADD COLUMN approved_by uuid REFERENCES users(id),
      ADD COLUMN approved_at timestamptz;
  `)
  // Blocks approved before this migration: their current settings are the approved ones.
  const [approved] = await sequelize.query(`SELECT id, settings FROM blocks WHERE review_status = 'approved' AND reviewed_by IS NOT NULL`) as [{ id: string, settings: unknown }[], unknown]
  for (const block of approved) {
    await sequelize.query(
      `UPDATE blocks SET approved_fingerprint = $1, approved_settings = settings, approved_by = reviewed_by, approved_at = reviewed_at WHERE id = $2`,
      { bind: [fingerprintOf(block.settings ?? {}), block.id] },
    )
  }
}

export const down: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    ALTER TABLE blocks DROP COLUMN approved_fingerprint, DROP COLUMN approved_settings, DROP COLUMN approved_by, DROP COLUMN approved_at;
  `)
}
