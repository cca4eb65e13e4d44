import { Readable } from 'node:stream'
import type { z } from 'zod'
import { auditChanges, auditDetails, auditWords } from '#shared/audit/words'
import { toCsv } from '#shared/export/csv'
import type { auditDownloadSchema } from '#shared/schemas/history'
import type { Investigation } from '../../models'
import { auditTrail } from './audit-trail'

/** Events read per query while the download streams: the whole trail is never held at once. */
const PAGE = 500

export const AUDIT_CSV_HEADER = ['Event', 'When (UTC)', 'Who', 'What happened', 'Action', 'Block', 'Claim', 'Changed (old → new)', 'Details']

/**
 * Every event of the trail that the filters keep, newest first, as CSV (RFC 4180: a header row,
 * CRLF line ends, quoted cells where needed; a cell starting with =, +, -, @ is written as text,
 * see `toCsv`). It streams page by page through the trail's own cursor, so it reads exactly what
 * the trail shows, in the same words.
 */
export function auditCsv(investigation: Investigation, filters: z.output<typeof auditDownloadSchema>): Readable {
  async function* rows() {
    yield toCsv([AUDIT_CSV_HEADER])
    let before: string | undefined
    do {
      const page = await auditTrail(investigation, { ...filters, limit: PAGE, before })
      if (page.events.length) {
        yield toCsv(page.events.map(e => [
          e.id, e.at, e.actor ?? 'Mantissa', auditWords(e), e.action, e.block ?? '', e.claim ?? '', auditChanges(e), auditDetails(e),
        ]))
      }
      before = page.next ?? undefined
    } while (before)
  }
  return Readable.from(rows())
}

/** A file name for the download: the investigation's title in plain letters. */
export function auditFileName(investigation: Investigation): string {
  const slug = investigation.title.normalize('NFKD').replace(/[^\w\s-]/g, '').trim().replace(/\s+/g, '-').toLowerCase().slice(0, 60)
  return `audit-trail-${slug || investigation.id}.csv`
}
