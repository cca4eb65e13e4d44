import type { Transaction } from 'sequelize'
// Imported, not auto-imported: the command-line scripts record events too.
import { useDb } from './db'

export interface AuditEntry {
  newsroomId: string
  investigationId?: string | null
  actorId: string | null
  action: string
  subjectType: string
  subjectId?: string | null
  detail?: Record<string, unknown>
}

/** Appends one event to the audit trail, inside the caller's transaction when given. */
export async function recordAudit(entry: AuditEntry, transaction?: Transaction) {
  await useDb().models.AuditEvent.create({
    newsroomId: entry.newsroomId,
    investigationId: entry.investigationId ?? null,
    actorId: entry.actorId,
    action: entry.action,
    subjectType: entry.subjectType,
    subjectId: entry.subjectId ?? null,
    detail: entry.detail ?? {},
  }, { transaction })
}
