import { randomUUID } from 'node:crypto'
import { describe, expect, it } from 'vitest'
import { Client, signedIn } from '../support/api'
import { ClientAt, freshLoopbackAddress } from '../support/client-at'
import { sql } from '../support/database'
import { linkIn, mailTo, waitForMail } from '../support/mail'
import { createTestNewsroom, PASSWORD } from '../support/newsroom'

// Issue 18: password reset by e-mail, single use, expiring, the same answer whether or not the
// address exists.

const NEW_PASSWORD = 'a-freshly-chosen-password'

async function requestLink(email: string) {
  const reply = await new Client().post('/api/auth/password-reset', { email })
  expect(reply.status).toBe(202)
  return reply.body
}

const tokenOf = (text: string) => linkIn(text, '/reset-password/').split('/reset-password/')[1]!

describe('password reset by e-mail', () => {
  it('answers the same for an address with an account and one without, and mails only the first', async () => {
    const { emails } = await createTestNewsroom()
    const nobody = `nobody-${randomUUID()}@test.example`
    expect(await requestLink(emails.reporter)).toEqual(await requestLink(nobody))
    await waitForMail(emails.reporter, 'new Mantissa password')
    expect(await mailTo(nobody)).toEqual([])
  })

  it('sets a new password once, ends every session, and lifts the sign-in waits', async () => {
    const { emails, id, reporter } = await createTestNewsroom()
    const attacker = new ClientAt(freshLoopbackAddress())
    for (let i = 0; i < 6; i++) await attacker.post('/api/auth/login', { email: emails.reporter, password: `wrong-${i}` })
    expect((await attacker.post('/api/auth/login', { email: emails.reporter, password: PASSWORD })).status).toBe(429)

    await requestLink(emails.reporter)
    const token = tokenOf((await waitForMail(emails.reporter, 'new Mantissa password')).text)
    const peek = await new Client().get(`/api/auth/password-reset/${token}`)
    expect(peek.status).toBe(200)
    expect(peek.body.email).toBe(emails.reporter)

    const done = await new Client().post(`/api/auth/password-reset/${token}`, { password: NEW_PASSWORD })
    expect(done.status).toBe(200)
    expect((await reporter.get('/api/me')).status).toBe(401)
    const again = await new Client().post(`/api/auth/password-reset/${token}`, { password: 'yet-another-password' })
    expect(again.status).toBe(404)
    expect((await new Client().get(`/api/auth/password-reset/${token}`)).status).toBe(404)

    expect((await new Client().post('/api/auth/login', { email: emails.reporter, password: PASSWORD })).status).toBe(401)
    expect((await attacker.post('/api/auth/login', { email: emails.reporter, password: NEW_PASSWORD })).status).toBe(200)
    const actions = (await sql(`SELECT action FROM audit_events WHERE newsroom_id = $1 AND subject_type = 'user'`, [id])).rows.map(r => r.action)
    expect(actions).toContain('account.password-reset-requested')
    expect(actions).toContain('account.password-reset')
  })

  it('only the newest link works, and a link past its hour does not', async () => {
    const { emails } = await createTestNewsroom()
    await requestLink(emails['fact-checker'])
    const first = tokenOf((await waitForMail(emails['fact-checker'], 'new Mantissa password')).text)
    await requestLink(emails['fact-checker'])
    const until = Date.now() + 10_000
    let second = first
    while (second === first && Date.now() < until) {
      const newest = (await mailTo(emails['fact-checker'])).filter(m => m.subject.includes('new Mantissa password'))[0]
      if (newest) second = tokenOf(newest.text)
      await new Promise(r => setTimeout(r, 100))
    }
    expect(second).not.toBe(first)
    expect((await new Client().post(`/api/auth/password-reset/${first}`, { password: NEW_PASSWORD })).status).toBe(404)
    // Expiry: the link's row moved an hour and a minute into the past, as if the mail sat unread.
    await sql(`UPDATE password_resets SET expires_at = now() - interval '1 minute', created_at = now() - interval '61 minutes' WHERE user_id = (SELECT id FROM users WHERE email = $1)`, [emails['fact-checker']])
    expect((await new Client().post(`/api/auth/password-reset/${second}`, { password: NEW_PASSWORD })).status).toBe(404)
    expect((await signedIn(emails['fact-checker'], PASSWORD)).cookie).not.toBe('')
  })
})
