import { describe, expect, it } from 'vitest'
import { contentSecurityPolicy, createCspNonce, securityHeaders } from '../../server/utils/security-headers'

// Values as the OWASP Secure Headers Project and MDN describe them (from memory); the served
// headers are checked over HTTP in tests/server/security-headers.test.ts.
describe('the security headers', () => {
  it('asks browsers to stay on https only when the public address is https', () => {
    expect(securityHeaders('n', { https: true })['Strict-Transport-Security']).toBe('max-age=31536000')
    expect(securityHeaders('n')).not.toHaveProperty('Strict-Transport-Security')
  })

  it('relaxes scripts, workers and frames only in development (error overlay, restart watcher)', () => {
    const built = contentSecurityPolicy('n')
    expect(built).toContain('script-src \'self\' \'nonce-n\';')
    expect(built).not.toMatch(/worker-src|frame-src/)
    const dev = contentSecurityPolicy('n', { dev: true })
    expect(dev).toContain('script-src \'self\' \'unsafe-inline\';')
    expect(dev).toMatch(/; worker-src 'self' blob:; frame-src 'self' data:$/)
    const rest = (policy: string) => policy.replace(/script-src [^;]+;/, '').replace(/; worker-src .*$/, '')
    expect(rest(dev)).toBe(rest(built))
    for (const policy of [built, dev]) expect(policy).not.toContain('unsafe-eval')
  })

  it('makes a fresh 128-bit nonce each time, also past a draw of random bytes for many', () => {
    const nonces = new Set(Array.from({ length: 1000 }, createCspNonce))
    expect(nonces.size).toBe(1000)
    for (const nonce of nonces) expect(Buffer.from(nonce, 'base64')).toHaveLength(16)
  })
})
