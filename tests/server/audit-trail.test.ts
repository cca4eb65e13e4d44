import { beforeAll, describe, expect, it } from 'vitest'
import { sql } from '../support/database'
import { createTestNewsroom, invite } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { blockOf, expectStatus, postClaim, proseDoc, saveBlock, uploadPayments, writeStory } from '../support/stories'
import type { Story } from '../support/stories'
import type { Client } from '../support/api'

// docs/product-rules.md ("Audit trail"), after the team's rule: "Every lock, unlock, review, publish, revoke, role change and dataset import is written
// to an append-only audit trail with who, when and what." The issue adds: every change a reader of
// the trail would ask about, and a trail that shows its newest events however long it grows.

interface Event { id: string, action: string, actor: string | null, actorId: string | null, subjectId: string | null, detail: Record<string, any> }

let newsroom: TestNewsroom
let datasetId: string

beforeAll(async () => {
  newsroom = await createTestNewsroom('Trail')
  datasetId = await uploadPayments(newsroom.reporter, newsroom.id)
})

async function page(client: Client, story: Story, query = ''): Promise<{ events: Event[], next: string | null }> {
  const reply = await client.get(`/api/investigations/${story.id}/audit${query}`)
  expectStatus(reply, 200)
  return reply.body
}

/** Every event of the trail, walking its pages of `limit`. */
async function walk(story: Story, filter = '', limit = 7): Promise<Event[]> {
  const events: Event[] = []
  let before: string | null = null
  do {
    const { events: more, next }: { events: Event[], next: string | null } = await page(newsroom['fact-checker'], story, `?limit=${limit}${filter}${before ? `&before=${before}` : ''}`)
    expect(more.length).toBeLessThanOrEqual(limit)
    events.push(...more)
    before = next
  } while (before)
  return events
}

describe('reading a long trail', () => {
  it('pages through every event newest first, and the newest is on the first page', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    for (let i = 0; i < 20; i++) expectStatus(await newsroom.reporter.post(`/api/investigations/${story.id}/blocks`, { kind: 'prose' }), 201)
    expectStatus(await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, { reason: 'Checks still open: testing the trail.' }), 201)

    const first = await page(newsroom['fact-checker'], story, '?limit=5')
    expect(first.events[0]!.action).toBe('investigation.published')
    expect(first.next).not.toBeNull()
    const all = await walk(story)
    const ids = all.map(e => Number(e.id))
    expect(ids).toEqual([...new Set(ids)].sort((a, b) => b - a))
    // The same events a single read of the whole trail gives.
    expect((await page(newsroom['fact-checker'], story, '?limit=500')).events.map(e => e.id)).toEqual(all.map(e => e.id))
    expect(all.filter(e => e.action === 'block.added')).toHaveLength(21)
  })

  it('filters by person and by kind (an action, or its family)', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    for (let i = 0; i < 3; i++) expectStatus(await newsroom['data-editor'].post(`/api/investigations/${story.id}/blocks`, { kind: 'prose' }), 201)
    const editorId = (await newsroom['data-editor'].get('/api/me')).body.user.id
    const byEditor = await walk(story, `&actor=${editorId}`, 2)
    // The editor's joining the newsroom is theirs too, and the trail shows it.
    expect(byEditor.map(e => e.action)).toEqual(['block.added', 'block.added', 'block.added', 'member.joined'])
    expect(new Set(byEditor.map(e => e.actor))).toEqual(new Set([newsroom.names['data-editor']]))
    const added = await walk(story, '&kind=block.added', 3)
    expect(added).toHaveLength(4)
    const blocks = await walk(story, '&kind=block')
    expect(blocks.every(e => e.action.startsWith('block.'))).toBe(true)
    expect(blocks.length).toBeGreaterThan(added.length)
    expectStatus(await newsroom.reporter.get(`/api/investigations/${story.id}/audit?kind=${encodeURIComponent('x%')}`), 400)
  })
})

describe('what the trail records', () => {
  it('records text edits (one event for a burst of saves), method changes, removal and restore', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    for (const words of ['A first draft.', 'A second draft.', 'A third draft.']) {
      expectStatus(await saveBlock(newsroom.reporter, story, story.proseBlockId, { content: proseDoc(words) }), 200)
    }
    expectStatus(await saveBlock(newsroom.reporter, story, story.analysisBlockId, { settings: { ...story.settings, test: 'second-digit' } }), 200)
    const { version } = await blockOf(newsroom.reporter, story, story.analysisBlockId)
    expectStatus(await newsroom.reporter.delete(`/api/blocks/${story.analysisBlockId}`), 200)
    expectStatus(await newsroom.reporter.post(`/api/blocks/${story.analysisBlockId}/restore`), 200)
    const events = (await walk(story)).reverse()
    const edits = events.filter(e => e.action === 'block.edited')
    // writeStory's own save of the marked passage opened the reporter's burst of text edits.
    expect(edits.filter(e => e.subjectId === story.proseBlockId)).toHaveLength(1)
    expect(edits.filter(e => e.subjectId === story.analysisBlockId)).toEqual([
      expect.objectContaining({ actor: newsroom.names.reporter, detail: expect.objectContaining({ settings: { ...story.settings, test: 'second-digit' } }) }),
    ])
    expect(events.filter(e => e.subjectId === story.analysisBlockId).map(e => e.action).slice(-2)).toEqual(['block.removed', 'block.restored'])
    expect(version).toBeGreaterThan(1)
  })

  it('records the investigation\'s start, a claim\'s change of sources, a rename, archiving and a withdrawn invitation', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    expectStatus(await postClaim(newsroom.reporter, story), 201)
    expectStatus(await newsroom.reporter.patch(`/api/claims/${story.claimId}`, { supportingBlockIds: [] }), 200)
    const renamed = await newsroom.reporter.patch(`/api/investigations/${story.id}`, { title: 'Harbour works, renamed', titleVersion: 1 })
    expectStatus(renamed, 200)
    expectStatus(await newsroom.reporter.patch(`/api/investigations/${story.id}`, { archived: true }), 200)
    const { id: invitationId } = await invite(newsroom.admin, newsroom.id, `withdrawn-${story.id.slice(0, 8)}@test.example`, 'reporter')
    expectStatus(await newsroom.admin.delete(`/api/newsrooms/${newsroom.id}/invitations/${invitationId}`), 200)

    const events = await walk(story)
    // The investigation's own events begin where it does.
    expect(events.filter(e => e.subjectId === story.id).at(-1)).toMatchObject({ action: 'investigation.created', actor: newsroom.names.reporter, subjectId: story.id, detail: { title: story.title } })
    expect(events.find(e => e.action === 'claim.sources-changed')).toMatchObject({ actor: newsroom.names.reporter, subjectId: story.claimId, detail: { from: [story.analysisBlockId], to: [] } })
    expect(events.find(e => e.action === 'investigation.renamed')).toMatchObject({ detail: { from: story.title, to: 'Harbour works, renamed' } })
    expect(events.find(e => e.action === 'investigation.archived')).toMatchObject({ actor: newsroom.names.reporter })
    expect(events.find(e => e.action === 'member.invitation-revoked')).toMatchObject({ actor: newsroom.names.admin, subjectId: invitationId, detail: { role: 'reporter' } })
  })
})

describe('one public link withdrawn ten times at once', () => {
  it('is one withdrawal in the trail, as it is one in the record', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    const published = await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, { reason: 'Checks still open: testing the trail.' })
    expectStatus(published, 201)
    const replies = await Promise.all(Array.from({ length: 10 }, () => newsroom['data-editor'].post(`/api/share-links/${published.body.link.id}/revoke`)))
    expect(replies.map(r => r.status)).toEqual(Array(10).fill(200))
    const withdrawals = (await walk(story)).filter(e => e.action === 'investigation.unpublished')
    expect(withdrawals).toHaveLength(1)
  })
})

describe('the app\'s database role', () => {
  // Each statement runs in a transaction that is rolled back, so a role that may do it changes nothing.
  const attempt = (statement: string) => sql(`BEGIN; ${statement}; ROLLBACK;`)

  it('cannot alter the audit trail, switch off its trigger, empty, rewrite or drop it', async () => {
    await expect(attempt('ALTER TABLE audit_events DISABLE TRIGGER audit_events_append_only')).rejects.toThrow(/must be owner/)
    await expect(attempt('ALTER TABLE audit_events DISABLE TRIGGER ALL')).rejects.toThrow(/must be owner/)
    await expect(attempt('TRUNCATE audit_events')).rejects.toThrow(/permission denied/)
    await expect(attempt('UPDATE audit_events SET detail = \'{}\'')).rejects.toThrow(/permission denied/)
    await expect(attempt('DELETE FROM audit_events')).rejects.toThrow(/permission denied/)
    await expect(attempt('DROP TABLE audit_events')).rejects.toThrow(/must be owner/)
    await expect(attempt('DROP FUNCTION audit_events_refuse_change() CASCADE')).rejects.toThrow(/must be owner/)
    // Nor replace what the trigger runs, add a rule that swallows writes, or rename the table away.
    await expect(attempt('CREATE OR REPLACE FUNCTION audit_events_refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$ BEGIN RETURN OLD; END $$')).rejects.toThrow(/must be owner/)
    await expect(attempt('CREATE RULE keep_nothing AS ON INSERT TO audit_events DO INSTEAD NOTHING')).rejects.toThrow(/must be owner/)
    await expect(attempt('ALTER TABLE audit_events RENAME TO audit_events_old')).rejects.toThrow(/must be owner/)
    await expect(attempt('SET session_replication_role = replica')).rejects.toThrow(/permission denied/)
    // Rewinding the ids would make new events collide with old ones (every change then fails) or
    // sort among them; the app draws the next id and nothing else. (A sequence ignores ROLLBACK, so
    // the attempt sets it to the id it has just drawn: harmless if it were ever allowed.)
    await expect(attempt('SELECT setval(\'audit_events_id_seq\', nextval(\'audit_events_id_seq\'))')).rejects.toThrow(/permission denied/)
    expect((await sql('SELECT has_sequence_privilege(\'audit_events_id_seq\', \'UPDATE\') AS rewinds')).rows[0]).toEqual({ rewinds: false })
    const role = await sql('SELECT current_user AS me, pg_has_role(current_user, relowner, \'USAGE\') AS owns FROM pg_class WHERE oid = \'audit_events\'::regclass')
    expect(role.rows[0]).toMatchObject({ owns: false })
  })
})
