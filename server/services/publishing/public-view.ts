import { timingSafeEqual } from 'node:crypto'
import type { PublishedSnapshot } from '#shared/types/publication'

/**
 * The snapshot behind a public token: 404 for a token no link ever had, 410 for a link withdrawn
 * or expired (with which, and when, so the page can say so). The lookup is by the token's hash;
 * the final comparison runs in constant time.
 */
export async function publicSnapshot(token: string): Promise<PublishedSnapshot> {
  const hash = hashToken(token)
  const { models } = useDb()
  const link = await models.ShareLink.findOne({ where: { tokenHash: hash } })
  if (!link || !timingSafeEqual(Buffer.from(link.tokenHash, 'hex'), Buffer.from(hash, 'hex'))) throw fail(404)
  if (link.revokedAt) throw fail(410, { message: 'The newsroom withdrew this link.', reason: 'withdrawn', at: link.revokedAt.toISOString() })
  if (link.expiresAt && link.expiresAt <= new Date()) throw fail(410, { message: 'This link has expired.', reason: 'expired', at: link.expiresAt.toISOString() })
  const publication = await models.Publication.findByPk(link.publicationId)
  if (!publication) throw fail(404)
  return publication.snapshot
}
