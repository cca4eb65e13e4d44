import { createHash } from 'node:crypto'
import { describe, expect, it } from 'vitest'
import { Client } from '../support/api'
import { sql } from '../support/database'
import { createTestNewsroom } from '../support/newsroom'
import { AFTER_CLAIM, BEFORE_CLAIM, CLAIM_TEXT, expectStatus, postClaim, proseDoc, saveBlock, uploadPayments, writeStory } from '../support/stories'

async function draft() {
  const newsroom = await createTestNewsroom('Publishing desk')
  const datasetId = await uploadPayments(newsroom.reporter, newsroom.id)
  const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
  expectStatus(await postClaim(newsroom.reporter, story), 201)
  return { newsroom, story }
}

/** Every check done: the method approved, the claim verified. */
async function clear(newsroom: Awaited<ReturnType<typeof draft>>['newsroom'], story: Awaited<ReturnType<typeof draft>>['story']) {
  expectStatus(await newsroom['data-editor'].post(`/api/blocks/${story.analysisBlockId}/review`, { decision: 'approved' }), 200)
  expectStatus(await newsroom['fact-checker'].post(`/api/claims/${story.claimId}/verify`, { quote: CLAIM_TEXT }), 200)
}

const tokenOf = (url: string) => url.split('/p/')[1]!

describe('the publishing gate', () => {
  it('refuses to publish with checks open unless a reason is given, and the audit trail keeps the reason', async () => {
    const { newsroom, story } = await draft()
    const refused = await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, {})
    expect(refused.status).toBe(400)
    expect(refused.body.data[0].path).toBe('reason')
    const publishing = await newsroom['data-editor'].get(`/api/investigations/${story.id}/publishing`)
    expect(publishing.body.blockers.map((b: { kind: string }) => b.kind).sort()).toEqual(['unreviewed-block', 'unverified-claim'])

    const forced = await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, { reason: 'The council meeting is tonight.' })
    expect(forced.status).toBe(201)
    const audit = await newsroom.admin.get(`/api/investigations/${story.id}/audit`)
    const event = audit.body.events.find((e: { action: string }) => e.action === 'investigation.published')
    expect(event.detail.reason).toBe('The council meeting is tonight.')
    expect(event.detail.blockers).toHaveLength(2)
  })

  it('publishes without a reason once every method is approved and every claim verified', async () => {
    const { newsroom, story } = await draft()
    await clear(newsroom, story)
    const published = await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, {})
    expect(published.status).toBe(201)
    expect(published.body.link.overrideReason).toBeNull()
    expect((await newsroom.reporter.get(`/api/investigations/${story.id}`)).body.status).toBe('published')
  })

  it('lets only data editors and admins publish and withdraw', async () => {
    const { newsroom, story } = await draft()
    await clear(newsroom, story)
    expect((await newsroom.reporter.post(`/api/investigations/${story.id}/publish`, {})).status).toBe(403)
    expect((await newsroom['fact-checker'].post(`/api/investigations/${story.id}/publish`, {})).status).toBe(403)
    const outsider = await createTestNewsroom('Elsewhere')
    expect((await outsider['data-editor'].post(`/api/investigations/${story.id}/publish`, {})).status).toBe(404)
    const published = await newsroom.admin.post(`/api/investigations/${story.id}/publish`, {})
    expect(published.status).toBe(201)
    expect((await newsroom.reporter.post(`/api/share-links/${published.body.link.id}/revoke`)).status).toBe(403)
  })
})

describe('the public link', () => {
  it('keeps only the token\'s SHA-256 and opens the snapshot without an account', async () => {
    const { newsroom, story } = await draft()
    await clear(newsroom, story)
    const published = await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, {})
    const token = tokenOf(published.body.url)
    expect(token.length).toBeGreaterThanOrEqual(40)
    const stored = await sql('SELECT token_hash FROM share_links WHERE id = $1', [published.body.link.id])
    expect(stored.rows[0].token_hash).toBe(createHash('sha256').update(token).digest('hex'))
    const leaked = await sql(`SELECT count(*)::int AS n FROM share_links s JOIN publications p ON p.id = s.publication_id
      WHERE s.token_hash = $1 OR p.snapshot::text LIKE '%' || $1 || '%'`, [token])
    expect(leaked.rows[0].n).toBe(0)

    const reader = await new Client().get(`/api/public/${token}`)
    expect(reader.status).toBe(200)
    expect(reader.body.title).toBe(story.title)
    expect(reader.body.datasets[0].sha256).toMatch(/^[0-9a-f]{64}$/)
    expect(reader.body.methodology).toContain('screen, not proof')
    expect(reader.body.methodology).toContain('legal review')
    const analysis = reader.body.blocks.find((b: { kind: string }) => b.kind === 'analysis')
    expect(analysis.result.test).toBe('first-digit')
    expect(analysis.summary).toMatch(/First digit of/)
  })

  it('is a frozen snapshot: later edits reach the public only with the next publication', async () => {
    const { newsroom, story } = await draft()
    await clear(newsroom, story)
    const first = await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, {})
    const edited = proseDoc(BEFORE_CLAIM, { text: CLAIM_TEXT, claimId: story.claimId }, ' — and a sentence added after publication.')
    expectStatus(await saveBlock(newsroom.reporter, story, story.proseBlockId, { content: edited }), 200)
    const oldView = await new Client().get(`/api/public/${tokenOf(first.body.url)}`)
    expect(JSON.stringify(oldView.body.blocks)).toContain(AFTER_CLAIM.trim())
    expect(JSON.stringify(oldView.body.blocks)).not.toContain('added after publication')

    const second = await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, {})
    const newView = await new Client().get(`/api/public/${tokenOf(second.body.url)}`)
    expect(JSON.stringify(newView.body.blocks)).toContain('added after publication')
    expect(JSON.stringify((await new Client().get(`/api/public/${tokenOf(first.body.url)}`)).body.blocks)).not.toContain('added after publication')
  })

  it('answers 410 once revoked or expired (the issue: a withdrawn link says so), and 404 for unknown tokens', async () => {
    const { newsroom, story } = await draft()
    await clear(newsroom, story)
    const revoked = await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, {})
    expect((await new Client().get(`/api/public/${tokenOf(revoked.body.url)}`)).status).toBe(200)
    const withdrawn = await newsroom['data-editor'].post(`/api/share-links/${revoked.body.link.id}/revoke`)
    expectStatus(withdrawn, 200)
    expect((await new Client().get(`/api/public/${tokenOf(revoked.body.url)}`)).status).toBe(410)
    // The answer is the link as the panel now lists it, and the investigation's status: its only live link gone, it is back in review.
    const panel = await newsroom['data-editor'].get(`/api/investigations/${story.id}/publishing`)
    expect(withdrawn.body).toEqual({ ok: true, link: panel.body.links.find((l: { id: string }) => l.id === revoked.body.link.id), investigationStatus: 'in-review' })
    expect(withdrawn.body.link).toMatchObject({ state: 'withdrawn', url: null })
    expect((await newsroom['data-editor'].get(`/api/investigations/${story.id}`)).body.status).toBe('in-review')

    const expiring = await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, { expiresAt: new Date(Date.now() + 3600_000).toISOString() })
    expect((await new Client().get(`/api/public/${tokenOf(expiring.body.url)}`)).status).toBe(200)
    await sql(`UPDATE share_links SET expires_at = now() - interval '1 second' WHERE id = $1`, [expiring.body.link.id])
    expect((await new Client().get(`/api/public/${tokenOf(expiring.body.url)}`)).status).toBe(410)

    expect((await new Client().get(`/api/public/${'x'.repeat(43)}`)).status).toBe(404)
    const audit = await newsroom.admin.get(`/api/investigations/${story.id}/audit`)
    expect(audit.body.events.map((e: { action: string }) => e.action)).toContain('investigation.unpublished')
  })

  it('refuses everything but reading', async () => {
    const { newsroom, story } = await draft()
    await clear(newsroom, story)
    const published = await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, {})
    const path = `/api/public/${tokenOf(published.body.url)}`
    for (const method of ['POST', 'PUT', 'PATCH', 'DELETE']) {
      const reply = await new Client().request(method, path, {})
      expect([404, 405], method).toContain(reply.status)
    }
    // A public reader holds no session: member routes stay closed.
    expect((await new Client().get(`/api/investigations/${story.id}`)).status).toBe(401)
    expect((await new Client().get(path)).status).toBe(200)
  })
})
