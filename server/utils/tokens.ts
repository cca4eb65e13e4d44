import { createHash, randomBytes } from 'node:crypto'

/** A secret for a link (invitation, share link): 32 random bytes, URL-safe. Only its hash is stored. */
export function newToken(): string {
  return randomBytes(32).toString('base64url')
}

/** What the database keeps of a token: its SHA-256, in hex. */
export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex')
}
