import { describe, expect, it } from 'vitest'
import { Client, signedIn } from '../support/api'
import { sql } from '../support/database'
import { createTestNewsroom, PASSWORD } from '../support/newsroom'

// Issue 22: "Signing out does not end the session: a copied cookie still answers /api/me for
// 12 hours." A session ends on the server, so every copy of its cookie stops at once.

/** A second client holding the same cookie, as an attacker who copied it would. */
function copyOf(client: Client): Client {
  const copy = new Client()
  copy.cookie = client.cookie
  return copy
}

async function expectEnded(client: Client, newsroomId: string) {
  expect((await client.get('/api/me')).status).toBe(401)
  expect((await client.get(`/api/newsrooms/${newsroomId}`)).status).toBe(401)
  // What the page's `useUserSession()` asks: an ended session is not signed in there either.
  expect((await client.get('/api/_auth/session')).status).toBe(401)
}

describe('sessions end on the server', () => {
  it('sign out: a copied cookie answers 401 everywhere', async () => {
    const { reporter, id } = await createTestNewsroom()
    const stolen = copyOf(reporter)
    expect((await stolen.get('/api/me')).status).toBe(200)
    expect((await reporter.post('/api/auth/logout')).status).toBe(200)
    await expectEnded(stolen, id)
  })

  it('a copied cookie can neither write nor open a page after sign-out or removal', async () => {
    const newsroom = await createTestNewsroom()
    const { admin, id, emails } = newsroom
    const stolen = copyOf(newsroom.reporter)
    expect((await newsroom.reporter.post('/api/auth/logout')).status).toBe(200)
    expect((await stolen.post('/api/investigations', { newsroomId: id, title: 'Written with a copied cookie' })).status).toBe(401)
    // The pages send a visitor without a session to the sign-in page.
    const page = await stolen.request('GET', '/investigations', undefined, { accept: 'text/html' })
    expect(page.status).toBe(302)
    expect(page.headers.get('location')).toMatch(/^\/login/)

    const kept = copyOf(newsroom['data-editor'])
    const members = (await admin.get(`/api/newsrooms/${id}/members`)).body as { membershipId: string, email: string }[]
    expect((await admin.delete(`/api/memberships/${members.find(m => m.email === emails['data-editor'])!.membershipId}`)).status).toBe(200)
    expect((await kept.post('/api/investigations', { newsroomId: id, title: 'Written after removal' })).status).toBe(401)
    expect((await kept.request('GET', '/investigations', undefined, { accept: 'text/html' })).status).toBe(302)
    const titles = (await admin.get(`/api/investigations?newsroomId=${id}`)).body.map((i: { title: string }) => i.title)
    expect(titles).toEqual([])
  })

  it('lists one\'s own open sessions, marks the current one, and ends one of them', async () => {
    const { emails, id } = await createTestNewsroom()
    const laptop = await signedIn(emails.reporter, PASSWORD)
    const phone = await signedIn(emails.reporter, PASSWORD)
    const list = await laptop.get('/api/me/sessions')
    expect(list.status).toBe(200)
    // The join session plus the two sign-ins.
    expect(list.body).toHaveLength(3)
    expect(list.body.filter((s: { current: boolean }) => s.current)).toHaveLength(1)
    const phoneId = (await phone.get('/api/me/sessions')).body.find((s: { current: boolean }) => s.current).id
    expect((await laptop.delete(`/api/me/sessions/${phoneId}`)).status).toBe(200)
    await expectEnded(phone, id)
    expect((await laptop.get('/api/me')).status).toBe(200)
    expect((await laptop.get('/api/me/sessions')).body).toHaveLength(2)
  })

  it('cannot end another person\'s session (404, as if missing)', async () => {
    const { reporter, 'fact-checker': checker } = await createTestNewsroom()
    const checkerSession = (await checker.get('/api/me/sessions')).body[0].id
    expect((await reporter.delete(`/api/me/sessions/${checkerSession}`)).status).toBe(404)
    expect((await checker.get('/api/me')).status).toBe(200)
  })

  it('sign out everywhere ends every session of the account, this one too, and is in the audit trail', async () => {
    const { emails, id, admin } = await createTestNewsroom()
    const one = await signedIn(emails.reporter, PASSWORD)
    const two = await signedIn(emails.reporter, PASSWORD)
    const reply = await one.post('/api/auth/logout-everywhere')
    expect(reply.status).toBe(200)
    expect(reply.body.sessionsEnded).toBe(3)
    await expectEnded(one, id)
    await expectEnded(two, id)
    expect((await admin.get('/api/me')).status).toBe(200)
    const events = await sql(`SELECT action FROM audit_events WHERE newsroom_id = $1 AND action = 'account.signed-out-everywhere'`, [id])
    expect(events.rows).toHaveLength(1)
  })

  it('removal from the newsroom: that member\'s sessions answer 401 everywhere', async () => {
    const newsroom = await createTestNewsroom()
    const { admin, emails, id } = newsroom
    const second = await signedIn(emails['fact-checker'], PASSWORD)
    const members = (await admin.get(`/api/newsrooms/${id}/members`)).body as { membershipId: string, email: string }[]
    const checker = members.find(m => m.email === emails['fact-checker'])!
    expect((await admin.delete(`/api/memberships/${checker.membershipId}`)).status).toBe(200)
    await expectEnded(newsroom['fact-checker'], id)
    await expectEnded(second, id)
  })

  it('a password change ends the other sessions and keeps this one', async () => {
    const { emails, id, reporter } = await createTestNewsroom()
    const elsewhere = await signedIn(emails.reporter, PASSWORD)
    const wrong = await reporter.post('/api/me/password', { currentPassword: 'not-my-password', newPassword: 'a-new-long-password' })
    expect(wrong.status).toBe(400)
    expect(wrong.body.data[0].path).toBe('currentPassword')
    expect((await elsewhere.get('/api/me')).status).toBe(200)

    const changed = await reporter.post('/api/me/password', { currentPassword: PASSWORD, newPassword: 'a-new-long-password' })
    expect(changed.status).toBe(200)
    expect(changed.body.otherSessionsEnded).toBe(1)
    await expectEnded(elsewhere, id)
    expect((await reporter.get('/api/me')).status).toBe(200)
    expect((await new Client().post('/api/auth/login', { email: emails.reporter, password: PASSWORD })).status).toBe(401)
    expect((await new Client().post('/api/auth/login', { email: emails.reporter, password: 'a-new-long-password' })).status).toBe(200)
  })
})
