import { describe, expect, it } from 'vitest'
import { Client, signedIn } from '../support/api'
import { ownerSql, sql } from '../support/database'
import { linkIn, waitForMail } from '../support/mail'
import { createTestNewsroom, join, PASSWORD } from '../support/newsroom'

describe('invitations', () => {
  it('e-mails a link that lets the person join once, with the invited role', async () => {
    const newsroom = await createTestNewsroom()
    const email = `new-${Date.now()}@test.example`
    const invited = await newsroom.admin.post(`/api/newsrooms/${newsroom.id}/invitations`, { email, role: 'fact-checker' })
    expect(invited.status).toBe(201)
    const mail = await waitForMail(email, 'invites you')
    const token = linkIn(mail.text, '/join/').split('/join/')[1]!

    const peek = await new Client().get(`/api/join/${token}`)
    expect(peek.body).toMatchObject({ email, role: 'fact-checker', existingAccount: false })

    const person = await join(token, 'New Person')
    const me = await person.get('/api/me')
    expect(me.body.memberships[0]).toMatchObject({ newsroomId: newsroom.id, role: 'fact-checker' })
    expect((await signedIn(email, PASSWORD)).cookie).not.toBe('')

    const again = await new Client().post(`/api/join/${token}`, { name: 'Someone else', password: PASSWORD })
    expect(again.status).toBe(404)
  })

  it('a new invitation to the same address replaces the old one, also when both are sent at once (issue 18)', async () => {
    const newsroom = await createTestNewsroom()
    const email = `twice-${Date.now()}@test.example`
    const path = `/api/newsrooms/${newsroom.id}/invitations`
    const first = await newsroom.admin.post(path, { email, role: 'reporter' })
    expect(first.status).toBe(201)
    const oldToken = linkIn((await waitForMail(email, 'invites you')).text, '/join/').split('/join/')[1]!
    const both = await Promise.all([newsroom.admin.post(path, { email, role: 'fact-checker' }), newsroom.admin.post(path, { email, role: 'fact-checker' })])
    expect(both.map(r => r.status)).toEqual([201, 201])
    expect((await new Client().get(`/api/join/${oldToken}`)).status).toBe(404)
    const pending = (await newsroom.admin.get(path)).body.filter((i: { email: string }) => i.email === email)
    expect(pending).toHaveLength(1)
    const open = await sql(`SELECT count(*)::int AS n FROM invitations WHERE email = $1 AND accepted_at IS NULL AND revoked_at IS NULL`, [email])
    expect(open.rows[0].n).toBe(1)
  })

  it('refuses an expired link', async () => {
    const newsroom = await createTestNewsroom()
    const email = `late-${Date.now()}@test.example`
    await newsroom.admin.post(`/api/newsrooms/${newsroom.id}/invitations`, { email, role: 'reporter' })
    const token = linkIn((await waitForMail(email, 'invites you')).text, '/join/').split('/join/')[1]!
    await sql(`UPDATE invitations SET expires_at = now() - interval '1 minute' WHERE email = $1`, [email])
    expect((await new Client().get(`/api/join/${token}`)).status).toBe(404)
    expect((await new Client().post(`/api/join/${token}`, { name: 'Late', password: PASSWORD })).status).toBe(404)
  })

  it('refuses to invite someone who is already a member', async () => {
    const newsroom = await createTestNewsroom()
    const reply = await newsroom.admin.post(`/api/newsrooms/${newsroom.id}/invitations`, { email: newsroom.emails.reporter, role: 'reporter' })
    expect(reply.status).toBe(409)
    expect(reply.body.data[0].path).toBe('email')
  })
})

describe('roles and removal', () => {
  it('lets an admin change a role, takes effect at once, and writes it to the audit trail', async () => {
    const newsroom = await createTestNewsroom()
    const members = (await newsroom.admin.get(`/api/newsrooms/${newsroom.id}/members`)).body
    const reporter = members.find((m: { email: string }) => m.email === newsroom.emails.reporter)
    expect((await newsroom.reporter.post(`/api/newsrooms/${newsroom.id}/invitations`, { email: 'x@test.example', role: 'reporter' })).status).toBe(403)
    expect((await newsroom.admin.patch(`/api/memberships/${reporter.membershipId}`, { role: 'admin' })).status).toBe(200)
    expect((await newsroom.reporter.get(`/api/newsrooms/${newsroom.id}/invitations`)).status).toBe(200)
    const audit = await sql(`SELECT action, detail FROM audit_events WHERE newsroom_id = $1 AND action = 'member.role-changed'`, [newsroom.id])
    expect(audit.rows).toEqual([{ action: 'member.role-changed', detail: { from: 'reporter', to: 'admin' } }])
  })

  it('never leaves a newsroom without an admin', async () => {
    const newsroom = await createTestNewsroom()
    const members = (await newsroom.admin.get(`/api/newsrooms/${newsroom.id}/members`)).body
    const admin = members.find((m: { email: string }) => m.email === newsroom.emails.admin)
    expect((await newsroom.admin.patch(`/api/memberships/${admin.membershipId}`, { role: 'reporter' })).status).toBe(409)
    expect((await newsroom.admin.delete(`/api/memberships/${admin.membershipId}`)).status).toBe(409)
  })

  it('removes a member, who is signed out and, signed in again, gets 404 for the newsroom', async () => {
    const newsroom = await createTestNewsroom()
    const members = (await newsroom.admin.get(`/api/newsrooms/${newsroom.id}/members`)).body
    const checker = members.find((m: { email: string }) => m.email === newsroom.emails['fact-checker'])
    expect((await newsroom['fact-checker'].get(`/api/newsrooms/${newsroom.id}`)).status).toBe(200)
    expect((await newsroom.admin.delete(`/api/memberships/${checker.membershipId}`)).status).toBe(200)
    // Issue 22: a removed member's sessions end at once (401), not only their access here.
    expect((await newsroom['fact-checker'].get(`/api/newsrooms/${newsroom.id}`)).status).toBe(401)
    const again = await signedIn(newsroom.emails['fact-checker'], PASSWORD)
    expect((await again.get(`/api/newsrooms/${newsroom.id}`)).status).toBe(404)
  })
})

describe('the audit trail', () => {
  it('refuses updates and deletes at the database', async () => {
    const newsroom = await createTestNewsroom()
    await expect(ownerSql(`UPDATE audit_events SET action = 'tampered' WHERE newsroom_id = $1`, [newsroom.id])).rejects.toThrow(/append-only/)
    await expect(ownerSql(`DELETE FROM audit_events WHERE newsroom_id = $1`, [newsroom.id])).rejects.toThrow(/append-only/)
    const rows = await sql(`SELECT count(*)::int AS n FROM audit_events WHERE newsroom_id = $1`, [newsroom.id])
    expect(rows.rows[0].n).toBeGreaterThan(0)
  })
})
