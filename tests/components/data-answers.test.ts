import { describe, expect, it } from 'vitest'
import { registerEndpoint } from '@nuxt/test-utils/runtime'
import { readBody } from 'h3'
import type { MeDTO, MemberDTO } from '#shared/types/dto'
import type { InvestigationDTO } from '#shared/types/investigation'
import type { PublishingDTO, ShareLinkDTO } from '#shared/types/publication'

// A change shows what the server answered, without reading the list or the record again
// (DEVELOPERS.md, "Client data"). Each fake route counts its reads; the answers have the shapes the
// real routes give (server/api/…), written here.

const NEWSROOM = '11111111-1111-4111-8111-111111111111'
const MEMBERSHIP = '22222222-2222-4222-8222-222222222222'
const INVESTIGATION = '33333333-3333-4333-8333-333333333333'
const flush = () => new Promise(resolve => setTimeout(resolve, 20))

const reads = { members: 0, invitations: 0, me: 0, publishing: 0 }
const member = (role: MemberDTO['role']): MemberDTO => ({ membershipId: MEMBERSHIP, userId: 'u1', name: 'Ada Reporter', email: 'ada@desk.example', role, joinedAt: '2026-12-01T09:00:00.000Z' })
registerEndpoint(`/api/newsrooms/${NEWSROOM}/members`, () => {
  reads.members++
  return [member('reporter')]
})
registerEndpoint(`/api/newsrooms/${NEWSROOM}/invitations`, () => {
  reads.invitations++
  return []
})
registerEndpoint(`/api/memberships/${MEMBERSHIP}`, { method: 'PATCH', handler: () => ({ ok: true }) })
registerEndpoint(`/api/memberships/${MEMBERSHIP}`, { method: 'DELETE', handler: () => ({ ok: true }) })

describe('members', () => {
  it('changes a role and removes a member in the list it holds, reading it once', async () => {
    const { members, changeRole, remove } = useMembers(ref(NEWSROOM), ref(true))
    await flush()
    expect(members.value.map(m => m.role)).toEqual(['reporter'])
    await changeRole(MEMBERSHIP, 'data-editor')
    expect(members.value.map(m => m.role)).toEqual(['data-editor'])
    await remove(MEMBERSHIP)
    expect(members.value).toEqual([])
    expect(reads.members).toBe(1)
  })
})

registerEndpoint('/api/me', () => {
  reads.me++
  return null
})
registerEndpoint('/api/me/preferences', {
  method: 'PATCH',
  // As updatePreferences answers: both preferences, as stored.
  handler: async event => ({ notifyByEmail: true, emailMentions: true, ...await readBody(event) }),
})

describe('the account', () => {
  it('shows the preferences the server answered in the account it holds', async () => {
    const { data: me } = useNuxtData<MeDTO>('me')
    me.value = {
      user: { id: 'u1', name: 'Ada Reporter', email: 'ada@desk.example' } as MeDTO['user'], memberships: [],
      notifyByEmail: true, emailMentions: true, twoFactor: { enabled: false, thisSession: false, recoveryCodesLeft: 0 },
    }
    await useAccount().setPreference('emailMentions', false)
    expect(me.value).toMatchObject({ notifyByEmail: true, emailMentions: false })
    expect(reads.me).toBe(0)
  })
})

const link: ShareLinkDTO = {
  id: '44444444-4444-4444-8444-444444444444', publicationId: '55555555-5555-4555-8555-555555555555', publishedAt: '2026-12-03T10:00:00.000Z',
  createdBy: 'Bea Editor', expiresAt: null, revokedAt: null, state: 'live', url: 'http://localhost/p/token', addressLost: false,
  overrideReason: null, disputedReason: null, followUpConfirmedBy: null,
}
registerEndpoint(`/api/investigations/${INVESTIGATION}/publishing`, (): PublishingDTO => {
  reads.publishing++
  return { blockers: [], checks: [], links: [], fourEyes: true }
})
registerEndpoint(`/api/investigations/${INVESTIGATION}/publish`, { method: 'POST', handler: () => ({ url: link.url, link }) })

describe('publishing', () => {
  it('adds the new link to the panel and marks the draft published, reading neither again', async () => {
    const store = useDocumentStore()
    store.load({ id: INVESTIGATION, title: 'Story', status: 'in-review', newsroomId: NEWSROOM, layoutVersion: 1, titleVersion: 1, blocks: [], claims: [] } as unknown as InvestigationDTO)
    const { publishing, publish } = usePublishing()
    await flush()
    expect(publishing.value?.links).toEqual([])
    await publish({ followUpConfirmed: false })
    expect(publishing.value?.links).toEqual([link])
    expect(store.investigation?.status).toBe('published')
    expect(reads.publishing).toBe(1)
  })
})
