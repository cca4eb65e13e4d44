import { describe, expect, it } from 'vitest'
import { contentSecurityPolicy, createCspNonce, securityHeaders } from '../../server/utils/security-headers'

// Values as the OWASP Secure Headers Project and MDN describe them (from memory); the served
// headers are checked over HTTP in tests/server/security-headers.test.ts.
describe('the security headers', () => {
  it('asks browsers to stay on https only when the public address is https', () => {
    expect(securityHeaders('n', { https: true })['Strict-Transport-Security']).toBe('max-age=31536000')
    expect(securityHeaders('n')).not.toHaveProperty('Strict-Transport-Security')
  })

  it('lets the development server evaluate and open its socket, and the built app neither', () => {
    const built = contentSecurityPolicy('n')
    expect(built).toContain('script-src \'self\' \'nonce-n\';')
    expect(built).not.toContain('unsafe-eval')
    expect(built).toContain('connect-src \'self\';')
    const dev = contentSecurityPolicy('n', { dev: true })
    expect(dev).toContain('\'unsafe-eval\'')
    expect(dev).toMatch(/connect-src 'self' ws: wss:/)
  })

  it('makes a fresh 128-bit nonce each time', () => {
    const nonces = new Set(Array.from({ length: 50 }, createCspNonce))
    expect(nonces.size).toBe(50)
    for (const nonce of nonces) expect(Buffer.from(nonce, 'base64')).toHaveLength(16)
  })
})
