import type { Session } from 'h3'
import { LRUCache } from 'lru-cache'

/**
 * Session cookies already unsealed by this server, by their exact text. Unsealing is a few WebCrypto
 * calls, about a millisecond of every request; the same text always unseals to the same session, so
 * it is done once per cookie. h3's own rule still holds: a session older than the maximum age is not
 * answered from here (and h3 then refuses the cookie too). Whether the session is still open is
 * asked of the sessions table on every request all the same (sessions.ts).
 */
export class UnsealedCookies {
  private readonly kept: LRUCache<string, Session>

  constructor(private readonly maxAgeMs: number, max = 10_000, private readonly now = () => Date.now()) {
    this.kept = new LRUCache({ max })
  }

  /** A copy of the session the cookie text unsealed to, while it is young enough; else undefined. */
  get(sealed: string): Session | undefined {
    const hit = this.kept.get(sealed)
    if (!hit) return undefined
    if (this.now() - hit.createdAt > this.maxAgeMs) {
      this.kept.delete(sealed)
      return undefined
    }
    return structuredClone(hit)
  }

  /** Keeps what a cookie unsealed to, when it holds a signed-in session. */
  remember(sealed: string, session: Session) {
    if (session.id && session.data?.user) this.kept.set(sealed, structuredClone(session))
  }
}
