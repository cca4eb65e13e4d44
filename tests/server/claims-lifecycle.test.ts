import { describe, expect, it } from 'vitest'
import { createTestNewsroom } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { AFTER_CLAIM, BEFORE_CLAIM, CLAIM_TEXT, blockOf, expectStatus, postClaim, proseDoc, readStory, saveBlock, uploadPayments, writeStory } from '../support/stories'
import type { Story } from '../support/stories'

async function marked(label: string) {
  const newsroom = await createTestNewsroom(label)
  const datasetId = await uploadPayments(newsroom.reporter, newsroom.id)
  const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
  expectStatus(await postClaim(newsroom.reporter, story), 201)
  // In review, so that the queues list it.
  expectStatus(await newsroom.reporter.post(`/api/investigations/${story.id}/review-request`), 200)
  return { newsroom, story }
}

/** Where a claim can show up: the investigation's claims (the margin), the fact-check queue, the publishing checklist and its checks. */
async function appearances(newsroom: TestNewsroom, story: Story) {
  const investigation = await readStory(newsroom['fact-checker'], story)
  const queue = await newsroom['fact-checker'].get(`/api/newsrooms/${newsroom.id}/queue`)
  const panel = await newsroom['data-editor'].get(`/api/investigations/${story.id}/publishing`)
  const quoted = (list: { label: string }[]) => list.some(item => item.label.includes(CLAIM_TEXT.slice(0, 12)))
  return {
    margin: investigation.claims.some((c: { id: string }) => c.id === story.claimId),
    queue: queue.body.factCheck.some((item: { investigationId: string }) => item.investigationId === story.id),
    checklist: quoted(panel.body.blockers),
    checks: panel.body.checks.some((c: { id: string }) => c.id === story.claimId),
  }
}
const everywhere = { margin: true, queue: true, checklist: true, checks: true }
const nowhere = { margin: false, queue: false, checklist: false, checks: false }

const auditOf = async (newsroom: TestNewsroom, story: Story) => (await newsroom.admin.get(`/api/investigations/${story.id}/audit`)).body as { action: string, actor: string, detail: Record<string, unknown> }[]

describe('claims stay attached to their words', () => {
  it('a claim whose words are deleted leaves the margin, the queue and the checklist; undoing the deletion brings it back', async () => {
    const { newsroom, story } = await marked('Orphan desk')
    expect(await appearances(newsroom, story)).toEqual(everywhere)
    expectStatus(await saveBlock(newsroom.reporter, story, story.proseBlockId, { content: proseDoc(BEFORE_CLAIM, AFTER_CLAIM) }), 200)
    expect(await appearances(newsroom, story)).toEqual(nowhere)
    // A late request about it is refused rather than acted on.
    expectStatus(await newsroom['fact-checker'].post(`/api/claims/${story.claimId}/dispute`, { note: 'Gone?' }), 409)
    expectStatus(await saveBlock(newsroom.reporter, story, story.proseBlockId, { content: proseDoc(BEFORE_CLAIM, { text: CLAIM_TEXT, claimId: story.claimId }, AFTER_CLAIM) }), 200)
    expect(await appearances(newsroom, story)).toEqual(everywhere)
  })

  it('shows the claim\'s words as they now stand, not as first marked', async () => {
    const { newsroom, story } = await marked('Rewording desk')
    expectStatus(await saveBlock(newsroom.reporter, story, story.proseBlockId, { content: proseDoc(BEFORE_CLAIM, { text: 'One in three payments starts with 1', claimId: story.claimId }, AFTER_CLAIM) }), 200)
    const claim = (await readStory(newsroom.reporter, story)).claims.find((c: { id: string }) => c.id === story.claimId)
    expect(claim.quote).toBe('One in three payments starts with 1')
  })
})

describe('unmarking and removing claims', () => {
  it('a reporter unmarks an open claim: the words stay, the mark and the claim go, the audit trail keeps it', async () => {
    const { newsroom, story } = await marked('Unmark desk')
    const before = await blockOf(newsroom.reporter, story, story.proseBlockId)
    expectStatus(await newsroom.reporter.delete(`/api/claims/${story.claimId}`), 200)
    const after = await blockOf(newsroom.reporter, story, story.proseBlockId)
    expect(after.version).toBe(before.version + 1)
    expect(JSON.stringify(after.content)).toContain(CLAIM_TEXT)
    expect(JSON.stringify(after.content)).not.toContain(story.claimId)
    expect(await appearances(newsroom, story)).toEqual(nowhere)
    expect((await auditOf(newsroom, story)).find(e => e.action === 'claim.unmarked')).toMatchObject({ actor: newsroom.names.reporter, detail: { quote: CLAIM_TEXT, status: 'open' } })
  })

  it('a disputed claim is removed only by a data editor, with a reason', async () => {
    const { newsroom, story } = await marked('Remove desk')
    expectStatus(await newsroom['fact-checker'].post(`/api/claims/${story.claimId}/dispute`, { note: 'No source.' }), 200)
    expectStatus(await newsroom.reporter.delete(`/api/claims/${story.claimId}`), 403)
    const noReason = await newsroom['data-editor'].delete(`/api/claims/${story.claimId}`)
    expectStatus(noReason, 400)
    expect(noReason.body.data[0].path).toBe('reason')
    expectStatus(await newsroom['data-editor'].delete(`/api/claims/${story.claimId}`, { reason: 'The sentence is opinion, not a claim.' }), 200)
    expect(await appearances(newsroom, story)).toEqual(nowhere)
    expect((await auditOf(newsroom, story)).find(e => e.action === 'claim.removed')).toMatchObject({
      actor: newsroom.names['data-editor'], detail: { reason: 'The sentence is opinion, not a claim.', status: 'disputed', note: 'No source.' },
    })
  })

  it('a verified claim cannot be removed until its lock is lifted', async () => {
    const { newsroom, story } = await marked('Locked removal desk')
    expectStatus(await newsroom['fact-checker'].post(`/api/claims/${story.claimId}/verify`), 200)
    expectStatus(await newsroom['data-editor'].delete(`/api/claims/${story.claimId}`, { reason: 'Try.' }), 423)
    expect((await appearances(newsroom, story)).margin).toBe(true)
  })
})
