import { createHash } from 'node:crypto'
import { beforeAll, describe, expect, it } from 'vitest'
import { sql } from '../support/database'
import { createTestNewsroom } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { blockOf, expectStatus, saveBlock, uploadPayments, writeStory } from '../support/stories'
import type { Story } from '../support/stories'

// Issue 15: an approval is tied to the settings it approved. Changing them sets it aside
// (review.reset, as before); settings that return to the approved ones bring it back.

let newsroom: TestNewsroom
let datasetId: string

beforeAll(async () => {
  newsroom = await createTestNewsroom('Approval return')
  datasetId = await uploadPayments(newsroom.reporter, newsroom.id)
})

async function approvedStory(): Promise<{ story: Story, approvedAt: string }> {
  const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
  const reply = await newsroom['data-editor'].post(`/api/blocks/${story.analysisBlockId}/review`, { decision: 'approved' })
  expectStatus(reply, 200)
  return { story, approvedAt: reply.body.review.stamp.at }
}

const reviewOf = async (story: Story) => (await blockOf(newsroom.reporter, story, story.analysisBlockId)).review
const trail = async (story: Story) => (await newsroom.reporter.get(`/api/investigations/${story.id}/audit`)).body.events
  .filter((e: { action: string }) => e.action.startsWith('review.'))
  .map((e: { action: string }) => e.action)

describe('an approval tied to the settings it approved', () => {
  it('is set aside when the settings change, with who approved what, and returns when they change back', async () => {
    const { story, approvedAt } = await approvedStory()
    const changed = await saveBlock(newsroom.reporter, story, story.analysisBlockId, { settings: { ...story.settings, test: 'second-digit' } })
    expectStatus(changed, 200)
    expect(changed.body.review).toEqual({
      status: 'unreviewed', note: null, stamp: null,
      lapsed: { stamp: { by: newsroom.names['data-editor'], at: approvedAt }, settings: story.settings },
    })
    // Another change away from the approved settings keeps the same lapsed approval.
    expectStatus(await saveBlock(newsroom.reporter, story, story.analysisBlockId, { settings: { ...story.settings, test: 'last-two-digits' } }), 200)
    expect((await reviewOf(story)).lapsed.stamp.at).toBe(approvedAt)

    // Back to the approved settings, keys in another order: the same method, approved as it was.
    const { test, column, datasetId: dataset } = story.settings
    const back = await saveBlock(newsroom.reporter, story, story.analysisBlockId, { settings: { test, column, datasetId: dataset } })
    expectStatus(back, 200)
    expect(back.body.review).toEqual({ status: 'approved', note: null, stamp: { by: newsroom.names['data-editor'], at: approvedAt }, lapsed: null })
    // The trail answers newest first.
    expect(await trail(story)).toEqual(['review.restored', 'review.reset'])
  })

  it('keeps a fingerprint of the approved settings with the review', async () => {
    const { story } = await approvedStory()
    const { rows: [row] } = await sql<{ approved_fingerprint: string }>(`SELECT approved_fingerprint FROM blocks WHERE id = $1`, [story.analysisBlockId])
    // SHA-256 hex of the settings' canonical JSON (keys sorted), computed here with Node's crypto.
    const canonical = JSON.stringify({ column: story.settings.column, datasetId: story.settings.datasetId, test: story.settings.test })
    expect(row!.approved_fingerprint).toBe(createHash('sha256').update(canonical).digest('hex'))
  })

  it('does not return an approval that the data editor has since replaced by sending the method back', async () => {
    const { story } = await approvedStory()
    expectStatus(await saveBlock(newsroom.reporter, story, story.analysisBlockId, { settings: { ...story.settings, test: 'second-digit' } }), 200)
    expectStatus(await newsroom['data-editor'].post(`/api/blocks/${story.analysisBlockId}/review`, { decision: 'sent-back', note: 'Use the first digit after all?' }), 200)
    expect((await reviewOf(story)).lapsed).toBeNull()
    expectStatus(await saveBlock(newsroom.reporter, story, story.analysisBlockId, { settings: story.settings }), 200)
    expect(await reviewOf(story)).toMatchObject({ status: 'unreviewed', lapsed: null })
  })

  it('returns only the latest approval: a second approval of other settings replaces the first', async () => {
    const { story } = await approvedStory()
    const second = { ...story.settings, test: 'second-digit' as const }
    expectStatus(await saveBlock(newsroom.reporter, story, story.analysisBlockId, { settings: second }), 200)
    const reapproved = await newsroom.admin.post(`/api/blocks/${story.analysisBlockId}/review`, { decision: 'approved' })
    expectStatus(reapproved, 200)
    expectStatus(await saveBlock(newsroom.reporter, story, story.analysisBlockId, { settings: story.settings }), 200)
    expect(await reviewOf(story)).toMatchObject({ status: 'unreviewed', lapsed: { stamp: { by: newsroom.names.admin }, settings: second } })
    expectStatus(await saveBlock(newsroom.reporter, story, story.analysisBlockId, { settings: second }), 200)
    expect(await reviewOf(story)).toMatchObject({ status: 'approved', stamp: { by: newsroom.names.admin, at: reapproved.body.review.stamp.at } })
  })
})
