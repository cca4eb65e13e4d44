import type { MigrationFn } from 'umzug'
import type { Sequelize } from 'sequelize'

// Conversations and notifications (issue 20):
// - threads: one per subject, where subject is a method review (an analysis block's id), a claim,
//   or a block. block_id is where the thread is drawn (a claim's block); a removed claim leaves its
//   thread in the database, out of sight, so nothing anyone wrote is lost.
// - thread_messages: plain text in parts, a mention as the member's id ({ type: 'mention', userId }),
//   never as text to read again; mentioned_ids repeats those ids for the notification query.
// - notifications: one row per person and event, with the anchor of the block, review or claim it is about.
// - users.email_mentions: a mention is e-mailed unless the member turns this off.
// Notes of methods already sent back and claims already disputed become the first message of their threads.
export const up: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    CREATE TABLE threads (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      investigation_id uuid NOT NULL REFERENCES investigations(id) ON DELETE CASCADE,
      subject_type text NOT NULL CHECK (subject_type IN ('review', 'claim', 'block')),
      subject_id uuid NOT NULL,
      block_id uuid NOT NULL REFERENCES blocks(id) ON DELETE CASCADE,
      created_by uuid REFERENCES users(id) ON DELETE SET NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      resolved_by uuid REFERENCES users(id) ON DELETE SET NULL,
      resolved_at timestamptz,
      reopened_by uuid REFERENCES users(id) ON DELETE SET NULL,
      reopened_at timestamptz,
      UNIQUE (subject_type, subject_id)
    );
    CREATE INDEX threads_investigation ON threads(investigation_id);

    CREATE TABLE thread_messages (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      thread_id uuid NOT NULL REFERENCES threads(id) ON DELETE CASCADE,
      author_id uuid REFERENCES users(id) ON DELETE SET NULL,
      kind text NOT NULL DEFAULT 'message' CHECK (kind IN ('message', 'sent-back', 'disputed')),
      parts jsonb NOT NULL,
      mentioned_ids uuid[] NOT NULL DEFAULT '{}',
      created_at timestamptz NOT NULL DEFAULT clock_timestamp()
    );
    CREATE INDEX thread_messages_thread ON thread_messages(thread_id, created_at);

    CREATE TABLE notifications (
      id bigserial PRIMARY KEY,
      user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      newsroom_id uuid NOT NULL REFERENCES newsrooms(id) ON DELETE CASCADE,
      investigation_id uuid NOT NULL REFERENCES investigations(id) ON DELETE CASCADE,
      kind text NOT NULL,
      actor_id uuid REFERENCES users(id) ON DELETE SET NULL,
      -- Where the link lands: '' (the top), 'block-<id>', 'review-<block id>' or 'claim-<id>'.
      anchor text NOT NULL DEFAULT '',
      thread_id uuid REFERENCES threads(id) ON DELETE CASCADE,
      excerpt text NOT NULL DEFAULT '',
      created_at timestamptz NOT NULL DEFAULT now(),
      read_at timestamptz
    );
    CREATE INDEX notifications_user ON notifications(user_id, id DESC);
    CREATE INDEX notifications_unread ON notifications(user_id) WHERE read_at IS NULL;

    ALTER TABLE users ADD COLUMN email_mentions boolean NOT NULL DEFAULT true;

    INSERT INTO threads (investigation_id, subject_type, subject_id, block_id, created_by, created_at)
      SELECT investigation_id, 'review', id, id, reviewed_by, coalesce(reviewed_at, now()) FROM blocks
      WHERE kind = 'analysis' AND review_status::text = 'sent-back' AND coalesce(review_note, '') <> '';
    INSERT INTO thread_messages (thread_id, author_id, kind, parts, created_at)
      SELECT t.id, b.reviewed_by, 'sent-back', jsonb_build_array(jsonb_build_object('type', 'text', 'text', b.review_note)), t.created_at
      FROM threads t JOIN blocks b ON b.id = t.subject_id WHERE t.subject_type = 'review';
    INSERT INTO threads (investigation_id, subject_type, subject_id, block_id, created_by, created_at)
      SELECT c.investigation_id, 'claim', c.id, c.block_id, c.decided_by, coalesce(c.decided_at, now()) FROM claims c
      WHERE c.status::text = 'disputed' AND coalesce(c.note, '') <> '' AND EXISTS (SELECT 1 FROM blocks b WHERE b.id = c.block_id);
    INSERT INTO thread_messages (thread_id, author_id, kind, parts, created_at)
      SELECT t.id, c.decided_by, 'disputed', jsonb_build_array(jsonb_build_object('type', 'text', 'text', c.note)), t.created_at
      FROM threads t JOIN claims c ON c.id = t.subject_id WHERE t.subject_type = 'claim';
  `)
}

export const down: MigrationFn<Sequelize> = async ({ context: sequelize }) => {
  await sequelize.query(`
    ALTER TABLE users DROP COLUMN email_mentions;
    DROP TABLE notifications; DROP TABLE thread_messages; DROP TABLE threads;
  `)
}
