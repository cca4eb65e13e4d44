import { describe, expect, it } from 'vitest'
import { generate } from 'otplib'
import { Client, signedIn } from '../support/api'
import { sql } from '../support/database'
import { createTestNewsroom, invite, PASSWORD } from '../support/newsroom'

// Issue 18: two-factor sign-in with an authenticator app (TOTP, RFC 6238: SHA-1, 30 s steps,
// 6 digits, what the apps assume), recovery codes, and an admin setting that requires it.
// Codes are made with otplib's generator at an explicit time, one 30-second step apart,
// since a code works once.

const now = () => Math.floor(Date.now() / 1000)
const codeAt = (secret: string, offsetSteps: number) => generate({ secret, epoch: now() + 30 * offsetSteps })

/** Turns two-factor sign-in on for the client's account; the secret and the recovery codes. */
async function enable(client: Client) {
  const setup = await client.post('/api/me/two-factor/setup')
  expect(setup.status).toBe(200)
  expect(setup.body.uri).toMatch(/^otpauth:\/\/totp\/Mantissa:/)
  expect(setup.body.qr.length).toBeGreaterThan(20)
  const confirmed = await client.post('/api/me/two-factor/confirm', { code: await codeAt(setup.body.secret, 0) })
  expect(confirmed.status).toBe(200)
  expect(confirmed.body.recoveryCodes).toHaveLength(10)
  return { secret: setup.body.secret as string, recoveryCodes: confirmed.body.recoveryCodes as string[] }
}

const login = (body: Record<string, string>) => new Client().post('/api/auth/login', body)

describe('two-factor sign-in', () => {
  it('a wrong code does not turn it on', async () => {
    const { reporter } = await createTestNewsroom()
    const setup = await reporter.post('/api/me/two-factor/setup')
    const code = await codeAt(setup.body.secret, 0)
    const wrong = String((Number(code) + 1) % 1_000_000).padStart(6, '0')
    const reply = await reporter.post('/api/me/two-factor/confirm', { code: wrong })
    expect(reply.status).toBe(400)
    expect(reply.body.data[0].path).toBe('code')
    expect((await reporter.get('/api/me')).body.twoFactor.enabled).toBe(false)
  })

  it('asks for the code after the password, takes it once, and takes a recovery code once', async () => {
    const { reporter, emails } = await createTestNewsroom()
    const elsewhere = await signedIn(emails.reporter, PASSWORD)
    const { secret, recoveryCodes } = await enable(reporter)
    // Sessions opened with the password alone end when two-factor sign-in comes on.
    expect((await elsewhere.get('/api/me')).status).toBe(401)
    expect((await reporter.get('/api/me')).body.twoFactor).toEqual({ enabled: true, thisSession: true, recoveryCodesLeft: 10 })

    const asked = await login({ email: emails.reporter, password: PASSWORD })
    expect(asked.status).toBe(401)
    expect(asked.body.data.secondFactor).toBe('required')
    // The wrong password still says only that the password does not match.
    const wrongPassword = await login({ email: emails.reporter, password: 'not-the-password', code: '123456' })
    expect(wrongPassword.status).toBe(401)
    expect(wrongPassword.body.data.secondFactor).toBeUndefined()

    const code = await codeAt(secret, 1)
    const client = new Client()
    const ok = await client.post('/api/auth/login', { email: emails.reporter, password: PASSWORD, code })
    expect(ok.status).toBe(200)
    expect(ok.body.user.email).toBe(emails.reporter)
    expect((await client.get('/api/me')).body.twoFactor.thisSession).toBe(true)
    const replayed = await login({ email: emails.reporter, password: PASSWORD, code })
    expect(replayed.status).toBe(401)
    expect(replayed.body.data.secondFactor).toBe('wrong')

    const recovery = recoveryCodes[0]!
    expect((await login({ email: emails.reporter, password: PASSWORD, code: recovery.toUpperCase() })).status).toBe(200)
    expect((await login({ email: emails.reporter, password: PASSWORD, code: recovery })).status).toBe(401)
    expect((await reporter.get('/api/me')).body.twoFactor.recoveryCodesLeft).toBe(9)
  })

  it('throttles codes: 5 wrong ones, then even the right one waits', async () => {
    const { reporter, emails } = await createTestNewsroom()
    const { secret } = await enable(reporter)
    for (let i = 0; i < 5; i++) {
      expect((await login({ email: emails.reporter, password: PASSWORD, code: String(100000 + i) })).status).toBe(401)
    }
    const held = await login({ email: emails.reporter, password: PASSWORD, code: await codeAt(secret, 1) })
    expect(held.status).toBe(429)
  })

  it('an account with it on that joins another newsroom signs in with its code, not through the link', async () => {
    const first = await createTestNewsroom()
    const second = await createTestNewsroom()
    await enable(first.reporter)
    const { token } = await invite(second.admin, second.id, first.emails.reporter, 'fact-checker')
    const client = new Client()
    const joined = await client.post(`/api/join/${token}`, { name: 'x', password: PASSWORD })
    expect(joined.status).toBe(201)
    expect(joined.body.signedIn).toBe(false)
    expect((await client.get('/api/me')).status).toBe(401)
  })

  it('the newsroom can require it: members without it get 403 until they sign in with a code; all of it in the audit trail', async () => {
    const newsroom = await createTestNewsroom()
    const { admin, reporter, id, emails } = newsroom
    // The admin must use it first.
    const early = await admin.patch(`/api/newsrooms/${id}`, { requireTwoFactor: true })
    expect(early.status).toBe(409)
    expect((await reporter.patch(`/api/newsrooms/${id}`, { requireTwoFactor: false })).status).toBe(403)
    await enable(admin)
    expect((await admin.patch(`/api/newsrooms/${id}`, { requireTwoFactor: true })).status).toBe(200)
    expect((await admin.get(`/api/newsrooms/${id}`)).body.requireTwoFactor).toBe(true)

    const refused = await reporter.get(`/api/newsrooms/${id}`)
    expect(refused.status).toBe(403)
    expect(refused.body.data.reason).toBe('two-factor-required')
    // The account itself stays reachable, so the member can turn it on.
    expect((await reporter.get('/api/me')).body.memberships[0].requireTwoFactor).toBe(true)
    const { secret } = await enable(reporter)
    expect((await reporter.get(`/api/newsrooms/${id}`)).status).toBe(200)
    // And cannot turn it off while the newsroom asks for it.
    const off = await reporter.post('/api/me/two-factor/disable', { password: PASSWORD })
    expect(off.status).toBe(409)
    const again = new Client()
    expect((await again.post('/api/auth/login', { email: emails.reporter, password: PASSWORD, code: await codeAt(secret, 1) })).status).toBe(200)
    expect((await again.get(`/api/newsrooms/${id}`)).status).toBe(200)

    const actions = (await sql(`SELECT action FROM audit_events WHERE newsroom_id = $1`, [id])).rows.map(r => r.action)
    expect(actions.filter(a => a === 'account.two-factor-enabled')).toHaveLength(2)
    expect(actions).toContain('newsroom.two-factor')
  })

  it('turns off with the password, and then the password alone signs in', async () => {
    const { reporter, emails } = await createTestNewsroom()
    await enable(reporter)
    expect((await reporter.post('/api/me/two-factor/disable', { password: 'not-the-password' })).status).toBe(400)
    expect((await reporter.post('/api/me/two-factor/disable', { password: PASSWORD })).status).toBe(200)
    expect((await login({ email: emails.reporter, password: PASSWORD })).status).toBe(200)
  })
})
