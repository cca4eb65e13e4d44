import type { AuditEventDTO } from '../types/investigation'

/** What each recorded action says after the person's name, in the trail and its download. */
export const AUDIT_WORDS: Record<string, string> = {
  'review.requested': 'asked for review',
  'review.reset': 'changed an approved method, which now needs review again',
  'review.restored': 'put a method back to the settings a data editor approved, which brought that approval back',
  'block.approved': 'approved the method of an analysis block',
  'block.sent-back': 'sent an analysis block back',
  'claim.marked': 'marked a claim',
  'claim.verified': 'verified and locked a claim',
  'claim.disputed': 'disputed a claim',
  'claim.unmarked': 'unmarked a claim (the words stay in the text)',
  'claim.removed': 'removed a claim (the words stay in the text)',
  'claim.published-disputed': 'published a claim while it was disputed',
  'publication.follow-up-confirmed': 'confirmed the follow-up statement printed in the methodology',
  'lock.lifted': 'lifted a lock',
  'dataset.imported': 'imported a dataset',
  'member.role-changed': 'changed a member’s role',
  'member.removed': 'removed a member',
  'member.joined': 'joined the newsroom',
  'investigation.created': 'started the investigation',
  'investigation.published': 'published the investigation',
  'investigation.unpublished': 'withdrew the public link',
  'investigation.renamed': 'renamed the investigation',
  'investigation.archived': 'archived the investigation',
  'investigation.restored': 'brought the investigation back from the archive',
  'block.added': 'added a block',
  'block.edited': 'edited a block',
  'block.version-restored': 'restored an earlier version of a block',
  'block.removed': 'removed a block',
  'block.restored': 'brought back a removed block',
  'blocks.reordered': 'moved blocks',
  'claim.sources-changed': 'changed the blocks a claim cites',
  'member.invited': 'invited someone',
  'member.invitation-revoked': 'withdrew an invitation',
  'dataset.archived': 'archived a dataset',
  'dataset.deleted': 'deleted a dataset',
  'dataset.restored': 'brought back an archived dataset',
  'thread.resolved': 'resolved a conversation',
  'thread.reopened': 'reopened a conversation',
}

/** The families the trail can be narrowed to, with what each holds. */
export const AUDIT_KINDS: [string, string][] = [
  ['', 'Everything'], ['block', 'Blocks: added, edited, restored, removed'], ['review', 'Reviews'], ['claim', 'Claims'], ['lock', 'Lifted locks'],
  ['investigation', 'Title, archiving, publication'], ['member', 'Members and invitations'], ['dataset', 'Datasets'], ['thread', 'Conversations resolved and reopened'],
]

export const auditWords = (event: Pick<AuditEventDTO, 'action'>) => AUDIT_WORDS[event.action] ?? event.action

/** The notes, reasons and addresses an event keeps, in one line (the block, claim and changes have their own). */
export function auditDetails(event: Pick<AuditEventDTO, 'detail'>): string {
  const d = event.detail
  return [d.email && String(d.email), d.note && `note: ${d.note}`, d.reason && `reason: ${d.reason}`, d.title && String(d.title), d.restoredFrom && `brought back version ${d.restoredFrom} as version ${d.version}`]
    .filter(Boolean).join(' · ')
}

/** The changes as "Field: old → new", one after another. */
export function auditChanges(event: Pick<AuditEventDTO, 'changes'>): string {
  return event.changes.map(c => `${c.label}: ${c.from ?? 'none'} → ${c.to ?? 'none'}`).join('; ')
}
