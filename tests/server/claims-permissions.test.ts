import { beforeAll, describe, expect, it } from 'vitest'
import { checkCell, openDesk, roleCells } from '../support/roles'
import type { Desk, RoleCase } from '../support/roles'
import { blockOf, CLAIM_TEXT, expectStatus, postClaim } from '../support/stories'
import type { Story } from '../support/stories'

// Who may do what: docs/product-rules.md "Who does what" and the role table in shared/auth/permissions.ts.
const MARKERS = ['admin', 'data-editor', 'owner'] as const
const CHECKERS = ['admin', 'fact-checker'] as const
const LOCK_LIFTERS = ['admin', 'data-editor'] as const

async function posted(desk: Desk, story: Story) {
  expectStatus(await postClaim(desk.as.owner, story), 201)
}

async function verified(desk: Desk, story: Story) {
  await posted(desk, story)
  expectStatus(await desk.as['fact-checker'].post(`/api/claims/${story.claimId}/verify`, { quote: CLAIM_TEXT }), 200)
}

const rows: RoleCase[] = [
  {
    action: 'mark a claim',
    allowed: MARKERS,
    success: 201,
    act: postClaim,
    effect: reply => expect(reply.body).toMatchObject({ quote: CLAIM_TEXT, status: 'open' }),
  },
  {
    action: 'change a claim\'s sources',
    allowed: MARKERS,
    success: 200,
    prepare: posted,
    act: (client, story) => client.patch(`/api/claims/${story.claimId}`, { supportingBlockIds: [] }),
    effect: reply => expect(reply.body.supportingBlockIds).toEqual([]),
  },
  {
    action: 'verify a claim',
    allowed: CHECKERS,
    success: 200,
    prepare: posted,
    act: (client, story) => client.post(`/api/claims/${story.claimId}/verify`, { quote: CLAIM_TEXT }),
    effect: async (reply, story, desk) => {
      expect(reply.body.status).toBe('verified')
      expect((await blockOf(desk.as.owner, story, story.analysisBlockId)).lock).not.toBeNull()
    },
  },
  {
    action: 'dispute a claim',
    allowed: CHECKERS,
    success: 200,
    prepare: posted,
    act: (client, story) => client.post(`/api/claims/${story.claimId}/dispute`, { note: 'The ledger has only five rows.' }),
    effect: reply => expect(reply.body).toMatchObject({ status: 'disputed', note: 'The ledger has only five rows.' }),
  },
  {
    action: 'lift a lock',
    allowed: LOCK_LIFTERS,
    success: 200,
    prepare: verified,
    act: (client, story) => client.post(`/api/claims/${story.claimId}/unlock`, { reason: 'The supplier name was misspelt.' }),
    effect: async (reply, story, desk) => {
      expect(reply.body.status).toBe('open')
      expect((await blockOf(desk.as.owner, story, story.analysisBlockId)).lock).toBeNull()
    },
  },
]

describe('claim routes, for every role', () => {
  let desk: Desk
  beforeAll(async () => {
    desk = await openDesk()
  })

  it.each(roleCells(rows))('%s', async (_label, row, who) => {
    await checkCell(desk, row, who)
  })
})
