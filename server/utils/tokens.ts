import { createHash, randomBytes } from 'node:crypto'

/** A fresh secret for a link or a session: 256 random bits, URL-safe. */
export function createToken(): string {
  return randomBytes(32).toString('base64url')
}

/**
 * What the database keeps of a token (invitation and reset links, session keys, recovery codes):
 * its SHA-256, so a copy of the tables opens nothing. Tokens are random, so no salt is needed.
 */
export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex')
}
