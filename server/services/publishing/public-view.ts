import { timingSafeEqual } from 'node:crypto'
import { Op } from 'sequelize'
import type { PublishedSnapshot } from '#shared/types/publication'

/**
 * The snapshot behind a public token, or 404 for an unknown, revoked or expired one. The lookup
 * is by the token's hash; the final comparison runs in constant time.
 */
export async function publicSnapshot(token: string): Promise<PublishedSnapshot> {
  const hash = hashToken(token)
  const { models } = useDb()
  const link = await models.ShareLink.findOne({
    where: { tokenHash: hash, revokedAt: null, [Op.or]: [{ expiresAt: null }, { expiresAt: { [Op.gt]: new Date() } }] },
  })
  if (!link || !timingSafeEqual(Buffer.from(link.tokenHash, 'hex'), Buffer.from(hash, 'hex'))) throw fail(404)
  const publication = await models.Publication.findByPk(link.publicationId)
  if (!publication) throw fail(404)
  return publication.snapshot
}
