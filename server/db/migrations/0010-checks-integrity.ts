import type { MigrationFn } from 'umzug'
import type { Sequelize } from 'sequelize'

export const up: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    -- Mantissa's own word for a method the data editor returns to its author (the API still
    -- accepts the old value on input for a while, README: the scripting API).
    ALTER TYPE review_status RENAME VALUE 'changes-requested' TO 'sent-back';

    -- Four eyes: whoever approves a method or verifies a claim is not its author. On unless an
    -- admin turns it off.
    ALTER TABLE newsrooms ADD COLUMN four_eyes boolean NOT NULL DEFAULT true;

    -- A publication keeps its two explicit decisions beside the general override reason.
    ALTER TABLE publications
      ADD COLUMN disputed_reason text,
      ADD COLUMN follow_up_confirmed_by uuid REFERENCES users(id);
  `)
  // Methodologies published before this printed a follow-up statement that nobody had confirmed.
  // Nothing in the record backs it, so it comes out of every earlier snapshot.
  await sequelize.query(`
    UPDATE publications
    SET snapshot = jsonb_set(snapshot, '{methodology}', to_jsonb(replace(snapshot->>'methodology', :unconfirmed, :kept)))
    WHERE strpos(snapshot->>'methodology', :unconfirmed) > 0
  `, { replacements: {
    unconfirmed: 'Every deviation reported here was followed up in the records and with the people and organisations concerned before publication, and the newsroom’s legal review applies before anyone is named.',
    kept: 'The newsroom’s legal review applies before anyone is named.',
  } })
}

export const down: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    ALTER TABLE publications DROP COLUMN disputed_reason, DROP COLUMN follow_up_confirmed_by;
    ALTER TABLE newsrooms DROP COLUMN four_eyes;
    ALTER TYPE review_status RENAME VALUE 'sent-back' TO 'changes-requested';
  `)
}
