import { randomUUID } from 'node:crypto'
import { describe, expect, it } from 'vitest'
import { createTestNewsroom } from '../support/newsroom'
import { expectStatus, proseDoc, uploadPayments, writeStory } from '../support/stories'

async function desk(label: string) {
  const newsroom = await createTestNewsroom(label)
  const datasetId = await uploadPayments(newsroom.reporter, newsroom.id)
  const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
  return { newsroom, story }
}

describe('four eyes (a newsroom setting, on by default)', () => {
  it('is on in a new newsroom', async () => {
    const { newsroom } = await desk('Default desk')
    expect((await newsroom.reporter.get(`/api/newsrooms/${newsroom.id}`)).body.fourEyes).toBe(true)
  })

  it('refuses the approval of a method by the person who wrote its block; another data editor may approve it', async () => {
    const { newsroom, story } = await desk('Method desk')
    const own = await newsroom['data-editor'].post(`/api/investigations/${story.id}/blocks`, { kind: 'analysis', settings: story.settings })
    expectStatus(own, 201)
    const refused = await newsroom['data-editor'].post(`/api/blocks/${own.body.id}/review`, { decision: 'approved' })
    expectStatus(refused, 403)
    expect(refused.body.data).toMatchObject({ rule: 'four-eyes' })
    expect(refused.body.data.message).toMatch(/another data editor must approve/)
    // Sending one's own method back is no approval: allowed.
    expectStatus(await newsroom['data-editor'].post(`/api/blocks/${own.body.id}/review`, { decision: 'sent-back', note: 'I want to redo this.' }), 200)
    const approved = await newsroom.admin.post(`/api/blocks/${own.body.id}/review`, { decision: 'approved' })
    expectStatus(approved, 200)
    expect(approved.body.review.stamp.by).toBe(newsroom.names.admin)
  })

  it('refuses the verification of a claim by the person who marked it; a fact-checker may verify it', async () => {
    const { newsroom, story } = await desk('Claim desk')
    const claimId = randomUUID()
    const block = await newsroom.admin.post(`/api/investigations/${story.id}/blocks`, { kind: 'prose', content: proseDoc('The admin writes ', { text: 'that half the payments are round', claimId }, '.') })
    expectStatus(block, 201)
    expectStatus(await newsroom.admin.post(`/api/investigations/${story.id}/claims`, { id: claimId, blockId: block.body.id, supportingBlockIds: [story.analysisBlockId] }), 201)
    const refused = await newsroom.admin.post(`/api/claims/${claimId}/verify`)
    expectStatus(refused, 403)
    expect(refused.body.data.message).toMatch(/another fact-checker must verify/)
    const verified = await newsroom['fact-checker'].post(`/api/claims/${claimId}/verify`)
    expectStatus(verified, 200)
    expect(verified.body.decision.by).toBe(newsroom.names['fact-checker'])
  })

  it('is changed only by an admin; off, an author may check their own work; the audit trail keeps the change', async () => {
    const { newsroom, story } = await desk('Setting desk')
    expectStatus(await newsroom['data-editor'].patch(`/api/newsrooms/${newsroom.id}`, { fourEyes: false }), 403)
    const off = await newsroom.admin.patch(`/api/newsrooms/${newsroom.id}`, { fourEyes: false })
    expectStatus(off, 200)
    expect(off.body.fourEyes).toBe(false)
    const own = await newsroom['data-editor'].post(`/api/investigations/${story.id}/blocks`, { kind: 'analysis', settings: story.settings })
    expectStatus(await newsroom['data-editor'].post(`/api/blocks/${own.body.id}/review`, { decision: 'approved' }), 200)
    expectStatus(await newsroom.admin.patch(`/api/newsrooms/${newsroom.id}`, { fourEyes: true }), 200)
    const again = await newsroom['data-editor'].post(`/api/investigations/${story.id}/blocks`, { kind: 'analysis', settings: story.settings })
    expectStatus(await newsroom['data-editor'].post(`/api/blocks/${again.body.id}/review`, { decision: 'approved' }), 403)
  })

  it('the publishing panel shows who wrote each thing and who checked it', async () => {
    const { newsroom, story } = await desk('Panel desk')
    expectStatus(await newsroom.reporter.post(`/api/investigations/${story.id}/claims`, { id: story.claimId, blockId: story.proseBlockId, supportingBlockIds: [story.analysisBlockId] }), 201)
    expectStatus(await newsroom['data-editor'].post(`/api/blocks/${story.analysisBlockId}/review`, { decision: 'approved' }), 200)
    expectStatus(await newsroom['fact-checker'].post(`/api/claims/${story.claimId}/verify`), 200)
    const panel = await newsroom.reporter.get(`/api/investigations/${story.id}/publishing`)
    expect(panel.body.fourEyes).toBe(true)
    expect(panel.body.checks).toEqual([
      expect.objectContaining({ kind: 'method', id: story.analysisBlockId, status: 'approved', author: newsroom.names.reporter, decision: expect.objectContaining({ by: newsroom.names['data-editor'] }) }),
      expect.objectContaining({ kind: 'claim', id: story.claimId, status: 'verified', author: newsroom.names.reporter, decision: expect.objectContaining({ by: newsroom.names['fact-checker'] }) }),
    ])
  })
})

describe('Mantissa\'s own word for a method sent back', () => {
  it('is "sent-back"; the old "changes-requested" is still accepted and answered as "sent-back"', async () => {
    const { newsroom, story } = await desk('Words desk')
    const sent = await newsroom['data-editor'].post(`/api/blocks/${story.analysisBlockId}/review`, { decision: 'sent-back', note: 'Name the year.' })
    expectStatus(sent, 200)
    expect(sent.body.review.status).toBe('sent-back')
    const legacy = await newsroom['data-editor'].post(`/api/blocks/${story.analysisBlockId}/review`, { decision: 'changes-requested', note: 'Name the month too.' })
    expectStatus(legacy, 200)
    expect(legacy.body.review).toMatchObject({ status: 'sent-back', note: 'Name the month too.' })
    expectStatus(await newsroom['data-editor'].post(`/api/blocks/${story.analysisBlockId}/review`, { decision: 'rejected', note: 'x' }), 400)
  })
})
