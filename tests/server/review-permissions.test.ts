import { beforeAll, describe, expect, it } from 'vitest'
import { checkCell, openDesk, roleCells } from '../support/roles'
import type { Desk, RoleCase } from '../support/roles'
import { readStory } from '../support/stories'

// Who may do what: docs/product-rules.md "Who does what" and the role table in shared/auth/permissions.ts.
const EDITORS = ['admin', 'data-editor', 'owner'] as const
const REVIEWERS = ['admin', 'data-editor'] as const
const MEMBERS = ['admin', 'data-editor', 'fact-checker', 'owner', 'other-reporter'] as const

const rows: RoleCase[] = [
  {
    action: 'ask for review',
    allowed: EDITORS,
    success: 200,
    act: (client, story) => client.post(`/api/investigations/${story.id}/review-request`),
    effect: async (reply, story, desk) => {
      expect(reply.body.status).toBe('in-review')
      expect((await readStory(desk.as.owner, story)).status).toBe('in-review')
    },
  },
  {
    action: 'approve a method',
    allowed: REVIEWERS,
    success: 200,
    act: (client, story) => client.post(`/api/blocks/${story.analysisBlockId}/review`, { decision: 'approved' }),
    effect: reply => expect(reply.body.review).toMatchObject({ status: 'approved', note: null }),
  },
  {
    action: 'send a method back',
    allowed: REVIEWERS,
    success: 200,
    act: (client, story) => client.post(`/api/blocks/${story.analysisBlockId}/review`, { decision: 'sent-back', note: 'Exclude the refunds first.' }),
    effect: reply => expect(reply.body.review).toMatchObject({ status: 'sent-back', note: 'Exclude the refunds first.' }),
  },
  {
    action: 'change an analysis block\'s settings',
    allowed: EDITORS,
    success: 200,
    act: (client, story) => client.patch(`/api/blocks/${story.analysisBlockId}`, { version: 1, settings: { ...story.settings, test: 'second-digit' } }),
    effect: reply => expect(reply.body.settings.test).toBe('second-digit'),
  },
  {
    action: 'remove an analysis block',
    allowed: EDITORS,
    success: 200,
    act: (client, story) => client.delete(`/api/blocks/${story.analysisBlockId}`),
    effect: async (_reply, story, desk) => {
      const ids = (await readStory(desk.as.owner, story)).blocks.map((b: { id: string }) => b.id)
      expect(ids).not.toContain(story.analysisBlockId)
    },
  },
  {
    action: 'read the queues',
    allowed: MEMBERS,
    success: 200,
    act: (client, _story, desk) => client.get(`/api/newsrooms/${desk.newsroom.id}/queue`),
    effect: reply => expect(Object.keys(reply.body).sort()).toEqual(['factCheck', 'review']),
  },
  {
    action: 'read the audit trail',
    allowed: MEMBERS,
    success: 200,
    act: (client, story) => client.get(`/api/investigations/${story.id}/audit`),
    // The trail always holds the newsroom's own joins, made when the desk was set up.
    effect: reply => expect(reply.body.events.map((e: { action: string }) => e.action)).toContain('member.joined'),
  },
]

describe('review routes, for every role', () => {
  let desk: Desk
  beforeAll(async () => {
    desk = await openDesk()
  })

  it.each(roleCells(rows))('%s', async (_label, row, who) => {
    await checkCell(desk, row, who)
  })
})
