import { createHash, createHmac } from 'node:crypto'
import { describe, expect, it } from 'vitest'
import { Client } from '../support/api'
import { sql } from '../support/database'
import { waitForMail } from '../support/mail'
import { createTestNewsroom } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { CLAIM_TEXT, expectStatus, postClaim, saveBlock, uploadPayments, writeStory } from '../support/stories'
import type { Story } from '../support/stories'

const FOLLOW_UP = /followed up in the records and with the people and organisations concerned/
const tokenOf = (url: string) => url.split('/p/')[1]!
// The secret the test server runs with: `npm test` sets this session password (server/cli/test.mjs) and no NUXT_SHARE_LINK_SECRET.
const SECRET = process.env.NUXT_SHARE_LINK_SECRET || process.env.NUXT_SESSION_PASSWORD || 'test-only-session-password-of-more-than-32-chars'

async function draft(label: string) {
  const newsroom = await createTestNewsroom(label)
  const datasetId = await uploadPayments(newsroom.reporter, newsroom.id)
  const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
  expectStatus(await postClaim(newsroom.reporter, story), 201)
  return { newsroom, story }
}

async function approveAndVerify(newsroom: TestNewsroom, story: Story) {
  expectStatus(await newsroom['data-editor'].post(`/api/blocks/${story.analysisBlockId}/review`, { decision: 'approved' }), 200)
  expectStatus(await newsroom['fact-checker'].post(`/api/claims/${story.claimId}/verify`, { quote: CLAIM_TEXT }), 200)
}

const auditOf = async (newsroom: TestNewsroom, story: Story) => (await newsroom.admin.get(`/api/investigations/${story.id}/audit`)).body.events as { action: string, actor: string, detail: Record<string, unknown> }[]

describe('the published page asserts only what the record shows', () => {
  it('prints no follow-up statement unless the publisher confirms it, and the audit trail keeps who did', async () => {
    const { newsroom, story } = await draft('Follow-up desk')
    await approveAndVerify(newsroom, story)
    const plain = await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, {})
    expectStatus(plain, 201)
    const plainPage = await new Client().get(`/api/public/${tokenOf(plain.body.url)}`)
    expect(plainPage.body.methodology).not.toMatch(FOLLOW_UP)
    expect(plain.body.link.followUpConfirmedBy).toBeNull()

    const confirmed = await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, { followUpConfirmed: true })
    expectStatus(confirmed, 201)
    const confirmedPage = await new Client().get(`/api/public/${tokenOf(confirmed.body.url)}`)
    expect(confirmedPage.body.methodology).toMatch(FOLLOW_UP)
    expect(confirmed.body.link.followUpConfirmedBy).toBe(newsroom.names['data-editor'])
    const event = (await auditOf(newsroom, story)).find(e => e.action === 'publication.follow-up-confirmed')
    expect(event?.actor).toBe(newsroom.names['data-editor'])
  })

  it('states the checks as the record has them: one method of one unapproved, one claim of one unverified', async () => {
    const { newsroom, story } = await draft('Check count desk')
    const published = await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, { reason: 'Counting test.' })
    expectStatus(published, 201)
    const page = (await new Client().get(`/api/public/${tokenOf(published.body.url)}`)).body
    expect(page.checks).toEqual({ methods: { approved: 0, total: 1 }, claims: { verified: 0, disputed: 0, total: 1 }, independent: true })
    expect(page.methodology).toContain('0 of 1 analysis approved')
    expect(page.methodology).toContain('0 of 1 marked claim verified')
  })

  it('marks only verified claims on the public page: an open claim\'s words are there, unmarked', async () => {
    const { newsroom, story } = await draft('Claim marks desk')
    const open = await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, { reason: 'Open claim on purpose.' })
    const openPage = (await new Client().get(`/api/public/${tokenOf(open.body.url)}`)).body
    expect(openPage.verifiedClaims).toEqual([])
    const openProse = JSON.stringify(openPage.blocks[0].content)
    expect(openProse).toContain('Two in five payments')
    expect(openProse).not.toContain(story.claimId)

    await approveAndVerify(newsroom, story)
    const verified = await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, {})
    const verifiedPage = (await new Client().get(`/api/public/${tokenOf(verified.body.url)}`)).body
    expect(verifiedPage.verifiedClaims).toEqual([story.claimId])
    expect(JSON.stringify(verifiedPage.blocks[0].content)).toContain(story.claimId)
  })

  it('shows the groups the methodology names: a grouped block publishes its ranking', async () => {
    const { newsroom, story } = await draft('Groups desk')
    expectStatus(await saveBlock(newsroom.reporter, story, story.analysisBlockId, { settings: { ...story.settings, groupBy: 'supplier' } }), 200)
    const published = await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, { reason: 'Groups test.' })
    const page = (await new Client().get(`/api/public/${tokenOf(published.body.url)}`)).body
    const analysis = page.blocks.find((b: { kind: string }) => b.kind === 'analysis')
    expect(page.methodology).toContain('one test per value of “supplier”')
    expect(Array.isArray(analysis.result.groups)).toBe(true)
  })
})

describe('publishing a disputed claim is its own decision', () => {
  async function disputed() {
    const { newsroom, story } = await draft('Dispute desk')
    expectStatus(await newsroom['data-editor'].post(`/api/blocks/${story.analysisBlockId}/review`, { decision: 'approved' }), 200)
    expectStatus(await newsroom['fact-checker'].post(`/api/claims/${story.claimId}/dispute`, { note: 'The share is one in three, not two in five.' }), 200)
    return { newsroom, story }
  }

  it('is not covered by the general reason', async () => {
    const { newsroom, story } = await disputed()
    const refused = await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, { reason: 'Deadline.' })
    expectStatus(refused, 400)
    expect(refused.body.data.map((e: { path: string }) => e.path)).toEqual(['disputed'])
    const panel = await newsroom['data-editor'].get(`/api/investigations/${story.id}/publishing`)
    expect(panel.body.blockers).toEqual([expect.objectContaining({ kind: 'disputed-claim', id: story.claimId })])
  })

  it('must name every disputed claim, and is recorded per claim with the reason', async () => {
    const { newsroom, story } = await disputed()
    const stale = await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, { disputed: { claimIds: ['00000000-0000-4000-8000-000000000000'], reason: 'Legal cleared it.' } })
    expectStatus(stale, 400)
    const published = await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, { disputed: { claimIds: [story.claimId], reason: 'Legal cleared the wording.' } })
    expectStatus(published, 201)
    expect(published.body.link).toMatchObject({ disputedReason: 'Legal cleared the wording.', overrideReason: null })
    const event = (await auditOf(newsroom, story)).find(e => e.action === 'claim.published-disputed')
    expect(event).toMatchObject({ actor: newsroom.names['data-editor'], detail: { reason: 'Legal cleared the wording.', note: 'The share is one in three, not two in five.' } })
    const page = (await new Client().get(`/api/public/${tokenOf(published.body.url)}`)).body
    expect(page.verifiedClaims).toEqual([])
    expect(page.methodology).toContain('1 published while disputed')
  })
})

describe('share links', () => {
  it('derive their token from the server secret and the link id; the database keeps only its hash', async () => {
    const { newsroom, story } = await draft('Token desk')
    await approveAndVerify(newsroom, story)
    const published = await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, {})
    const token = tokenOf(published.body.url)
    // RFC 2104 HMAC-SHA256 through Node's crypto, the derivation the server promises (docs/product-rules.md, "Rules the server enforces": share links).
    expect(token).toBe(createHmac('sha256', SECRET).update(`mantissa share link ${published.body.link.id}`).digest('base64url'))
    const row = await sql('SELECT * FROM share_links WHERE id = $1', [published.body.link.id])
    expect(row.rows[0].token_hash).toBe(createHash('sha256').update(token).digest('hex'))
    expect(JSON.stringify(row.rows[0])).not.toContain(token)
  })

  it('can be seen and copied again by members who may publish, and only by them', async () => {
    const { newsroom, story } = await draft('Address desk')
    await approveAndVerify(newsroom, story)
    const published = await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, {})
    for (const role of ['data-editor', 'admin'] as const) {
      const panel = await newsroom[role].get(`/api/investigations/${story.id}/publishing`)
      expect(panel.body.links[0]).toMatchObject({ id: published.body.link.id, state: 'live', url: published.body.url })
    }
    for (const role of ['reporter', 'fact-checker'] as const) {
      const panel = await newsroom[role].get(`/api/investigations/${story.id}/publishing`)
      expect(panel.body.links[0]).toMatchObject({ id: published.body.link.id, url: null })
    }
  })

  it('answers 410, with a page that says so, once withdrawn or expired; 404 for a token no link had', async () => {
    const { newsroom, story } = await draft('Gone desk')
    await approveAndVerify(newsroom, story)
    const withdrawn = await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, {})
    const expiring = await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, {})
    expectStatus(await newsroom['data-editor'].post(`/api/share-links/${withdrawn.body.link.id}/revoke`), 200)
    await sql('UPDATE share_links SET expires_at = now() - interval \'1 minute\' WHERE id = $1', [expiring.body.link.id])

    const reader = new Client()
    const gone = await reader.get(`/api/public/${tokenOf(withdrawn.body.url)}`)
    expect(gone.status).toBe(410)
    expect(gone.body.data.reason).toBe('withdrawn')
    const page = await reader.request('GET', `/p/${tokenOf(withdrawn.body.url)}`, undefined, { accept: 'text/html' })
    expect(page.status).toBe(410)
    expect(page.body).toContain('This link was withdrawn')
    const expired = await reader.request('GET', `/p/${tokenOf(expiring.body.url)}`, undefined, { accept: 'text/html' })
    expect(expired.status).toBe(410)
    expect(expired.body).toContain('This link has expired')
    expect((await reader.get(`/api/public/${'x'.repeat(43)}`)).status).toBe(404)

    const panel = await newsroom['data-editor'].get(`/api/investigations/${story.id}/publishing`)
    const states = Object.fromEntries(panel.body.links.map((l: { id: string, state: string, url: string | null }) => [l.id, [l.state, l.url]]))
    expect(states[withdrawn.body.link.id]).toEqual(['withdrawn', null])
    expect(states[expiring.body.link.id]).toEqual(['expired', null])
  })

  it('the "Published" e-mail sends no one to a link they cannot see', async () => {
    const { newsroom, story } = await draft('Mail desk')
    await approveAndVerify(newsroom, story)
    expectStatus(await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, {}), 201)
    const mail = await waitForMail(newsroom.emails.reporter, 'Published')
    expect(mail.text).toContain('Data editors and admins can open and copy the public link in the investigation, under Publishing.')
  })
})
