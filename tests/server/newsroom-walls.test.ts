import { describe, expect, it } from 'vitest'
import { ROLES } from '#shared/auth/roles'
import { createTestNewsroom } from '../support/newsroom'

// docs/product-rules.md: a member sees only the newsroom(s) they belong to; another newsroom's ids answer 404.
describe('newsroom walls', () => {
  it('answers 404 to every role of another newsroom', async () => {
    const mine = await createTestNewsroom('Mine')
    const theirs = await createTestNewsroom('Theirs')
    const theirMembers = (await theirs.admin.get(`/api/newsrooms/${theirs.id}/members`)).body
    const someone = theirMembers[0].membershipId
    for (const role of ROLES) {
      const client = mine[role]
      expect((await client.get(`/api/newsrooms/${theirs.id}`)).status).toBe(404)
      expect((await client.get(`/api/newsrooms/${theirs.id}/members`)).status).toBe(404)
      expect((await client.get(`/api/newsrooms/${theirs.id}/invitations`)).status).toBe(404)
      expect((await client.post(`/api/newsrooms/${theirs.id}/invitations`, { email: 'x@test.example', role: 'admin' })).status).toBe(404)
      expect((await client.patch(`/api/memberships/${someone}`, { role: 'reporter' })).status).toBe(404)
      expect((await client.delete(`/api/memberships/${someone}`)).status).toBe(404)
    }
    expect((await theirs.admin.get(`/api/newsrooms/${theirs.id}/members`)).body).toHaveLength(4)
  })

  it('answers 404 for ids that do not exist and for malformed ids alike', async () => {
    const mine = await createTestNewsroom()
    expect((await mine.admin.get('/api/newsrooms/00000000-0000-4000-8000-000000000000')).status).toBe(404)
    expect((await mine.admin.get('/api/newsrooms/not-an-id')).status).toBe(404)
  })

  it('lets each role do exactly what the role table allows on member management', async () => {
    const newsroom = await createTestNewsroom()
    const expected = { 'admin': 201, 'data-editor': 403, 'fact-checker': 403, 'reporter': 403 } as const
    for (const role of ROLES) {
      const reply = await newsroom[role].post(`/api/newsrooms/${newsroom.id}/invitations`, { email: `by-${role}-${Date.now()}@test.example`, role: 'reporter' })
      expect(reply.status, role).toBe(expected[role])
      expect((await newsroom[role].get(`/api/newsrooms/${newsroom.id}/members`)).status, role).toBe(200)
    }
  })
})
