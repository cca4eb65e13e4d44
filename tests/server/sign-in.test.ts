import { randomUUID } from 'node:crypto'
import { describe, expect, it } from 'vitest'
import { Client } from '../support/api'
import { createTestNewsroom, PASSWORD } from '../support/newsroom'

describe('sign-in', () => {
  it('answers 200 with the user and an HttpOnly, SameSite=Lax, Secure session cookie', async () => {
    const { emails } = await createTestNewsroom()
    const client = new Client()
    const reply = await client.post('/api/auth/login', { email: emails.reporter, password: PASSWORD })
    expect(reply.status).toBe(200)
    expect(reply.body.user.email).toBe(emails.reporter)
    expect(reply.body.user).not.toHaveProperty('passwordHash')
    // The attributes as RFC 6265 (4.1.2) and the SameSite draft (RFC 6265bis) spell them; `npm test` runs the server with NODE_ENV=production.
    const cookies = reply.headers.getSetCookie()
    expect(cookies).toHaveLength(1)
    const attributes = cookies[0]!.split(';').slice(1).map(a => a.trim().toLowerCase())
    expect(attributes).toContain('httponly')
    expect(attributes).toContain('samesite=lax')
    expect(attributes).toContain('secure')
    expect(attributes).toContain('path=/')
    const me = await client.get('/api/me')
    expect(me.status).toBe(200)
    expect(me.body.memberships).toHaveLength(1)
    expect(me.body.memberships[0].role).toBe('reporter')
  })

  it('answers 401 in the one error shape for a wrong password and an unknown address', async () => {
    const { emails } = await createTestNewsroom()
    for (const body of [{ email: emails.reporter, password: 'not-the-password' }, { email: `nobody-${randomUUID()}@test.example`, password: 'whatever-it-is' }]) {
      const reply = await new Client().post('/api/auth/login', body)
      expect(reply.status).toBe(401)
      expect(reply.body).toMatchObject({ statusCode: 401, statusMessage: 'Sign in first' })
      expect(reply.body.data.message).toMatch(/does not match/)
    }
  })

  it('answers 400 with field messages for a malformed body', async () => {
    const reply = await new Client().post('/api/auth/login', { email: 'not-an-address' })
    expect(reply.status).toBe(400)
    expect(reply.body.data.map((f: { path: string }) => f.path).sort()).toEqual(['email', 'password'])
  })

  it('slows down repeated failures with 429, even for the right password', async () => {
    const { emails } = await createTestNewsroom()
    const client = new Client()
    for (let i = 0; i < 5; i++) {
      expect((await client.post('/api/auth/login', { email: emails['fact-checker'], password: `wrong-${i}` })).status).toBe(401)
    }
    const limited = await client.post('/api/auth/login', { email: emails['fact-checker'], password: PASSWORD })
    expect(limited.status).toBe(429)
    expect(limited.body.statusMessage).toBe('Too many attempts')
  })

  it('signs out: the session no longer answers', async () => {
    const { reporter } = await createTestNewsroom()
    expect((await reporter.get('/api/me')).status).toBe(200)
    expect((await reporter.post('/api/auth/logout')).status).toBe(200)
    expect((await reporter.get('/api/me')).status).toBe(401)
  })
})
