import { beforeAll, describe, expect, it } from 'vitest'
import { ownerSql, sql } from '../support/database'
import { createTestNewsroom } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { CLAIM_TEXT, expectStatus, postClaim, uploadPayments, writeStory } from '../support/stories'
import type { Story } from '../support/stories'

// docs/product-rules.md: every lock, unlock and review is written to an append-only audit trail with who, when and what.

const WORKFLOW = ['review.requested', 'block.approved', 'block.sent-back', 'claim.marked', 'claim.disputed', 'claim.verified', 'lock.lifted']

let newsroom: TestNewsroom
let story: Story
let secondBlockId: string

/** The whole checking workflow on one story, each step by the role that does it. */
beforeAll(async () => {
  newsroom = await createTestNewsroom('Audit')
  story = await writeStory(newsroom.reporter, newsroom.id, await uploadPayments(newsroom.reporter, newsroom.id))
  const second = await newsroom.reporter.post(`/api/investigations/${story.id}/blocks`, { kind: 'analysis', settings: { ...story.settings, test: 'round-numbers' } })
  expectStatus(second, 201)
  secondBlockId = second.body.id
  const steps = [
    () => newsroom.reporter.post(`/api/investigations/${story.id}/review-request`),
    () => newsroom['data-editor'].post(`/api/blocks/${story.analysisBlockId}/review`, { decision: 'approved' }),
    () => newsroom['data-editor'].post(`/api/blocks/${secondBlockId}/review`, { decision: 'sent-back', note: 'Round numbers need a threshold.' }),
    () => postClaim(newsroom.reporter, story),
    () => newsroom['fact-checker'].post(`/api/claims/${story.claimId}/dispute`, { note: 'Cite the count, not a share.' }),
    () => newsroom['fact-checker'].post(`/api/claims/${story.claimId}/verify`, { quote: CLAIM_TEXT }),
    () => newsroom['data-editor'].post(`/api/claims/${story.claimId}/unlock`, { reason: 'The supplier list was updated.' }),
  ]
  for (const step of steps) expect([200, 201]).toContain((await step()).status)
})

async function workflowEvents() {
  const trail = await newsroom['fact-checker'].get(`/api/investigations/${story.id}/audit`)
  expectStatus(trail, 200)
  const ids = trail.body.events.map((e: { id: string }) => Number(e.id))
  expect(ids, 'the trail reads newest first').toEqual([...ids].sort((a, b) => b - a))
  // Listed here in the order the steps were done.
  return trail.body.events.filter((e: { action: string }) => WORKFLOW.includes(e.action)).reverse()
}

describe('the investigation\'s audit trail', () => {
  it('lists each review, mark, dispute, verification and lift, with who and what', async () => {
    const events = await workflowEvents()
    expect(events.map((e: { action: string }) => e.action)).toEqual(WORKFLOW)
    const [requested, approved, sentBack, marked, disputed, verified, lifted] = events
    expect(requested).toMatchObject({ actor: newsroom.names.reporter, subjectType: 'investigation', subjectId: story.id })
    expect(approved).toMatchObject({ actor: newsroom.names['data-editor'], subjectId: story.analysisBlockId, detail: { note: null, settings: story.settings } })
    expect(sentBack).toMatchObject({ actor: newsroom.names['data-editor'], subjectId: secondBlockId, detail: { note: 'Round numbers need a threshold.' } })
    expect(marked).toMatchObject({ actor: newsroom.names.reporter, subjectId: story.claimId, detail: { quote: CLAIM_TEXT, supportingBlockIds: [story.analysisBlockId] } })
    expect(disputed).toMatchObject({ actor: newsroom.names['fact-checker'], detail: { quote: CLAIM_TEXT, note: 'Cite the count, not a share.' } })
    expect(verified).toMatchObject({ actor: newsroom.names['fact-checker'], detail: { lockedBlockIds: [story.analysisBlockId] } })
    expect(lifted).toMatchObject({ actor: newsroom.names['data-editor'], detail: { reason: 'The supplier list was updated.', unlockedBlockIds: [story.analysisBlockId] } })
    const times = events.map((e: { at: string }) => Date.parse(e.at))
    expect(times).toEqual([...times].sort((a, b) => a - b))
  })

  it('cannot be rewritten or cut at the database', async () => {
    const ids = (await workflowEvents()).map((e: { id: string }) => e.id)
    for (const id of ids) {
      await expect(ownerSql(`UPDATE audit_events SET detail = '{}'::jsonb, actor_id = NULL WHERE id = $1`, [id])).rejects.toThrow(/append-only/)
      await expect(ownerSql(`DELETE FROM audit_events WHERE id = $1`, [id])).rejects.toThrow(/append-only/)
    }
    const kept = await sql(`SELECT action, detail FROM audit_events WHERE id = ANY($1::bigint[]) ORDER BY id`, [ids])
    expect(kept.rows.map(r => r.action)).toEqual(WORKFLOW)
    expect(kept.rows.at(-1).detail.reason).toBe('The supplier list was updated.')
  })
})
