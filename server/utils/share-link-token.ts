import { createHmac } from 'node:crypto'

/**
 * The token of a public link, derived from a server-side secret and the link's id, so that the
 * database keeps only its hash and members who may publish can be shown the link again. Without
 * NUXT_SHARE_LINK_SECRET the session password serves; changing the secret in use changes every
 * derived token, and the publishing panel then says it cannot show the old addresses.
 */
export function shareLinkToken(linkId: string): string {
  const config = useRuntimeConfig()
  const secret = config.shareLinkSecret || config.session.password
  return createHmac('sha256', secret).update(`mantissa share link ${linkId}`).digest('base64url')
}
