import { beforeAll, describe, expect, it } from 'vitest'
import { Client } from '../support/api'
import { ownerSql, sql } from '../support/database'
import { createTestNewsroom } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { CLAIM_TEXT, blockOf, expectStatus, postClaim, saveBlock, uploadPayments, writeStory } from '../support/stories'

// Issue 20: "every saved state of each block (prose and settings) is kept; a history view lists them
// by time and person, shows the difference between any two (text differences inline, settings side
// by side), and restores one as a new change (which follows the usual rules: locks, review reset)".
// docs/product-rules.md ("Locks", "Approval follows the method", "Newsroom walls", "History"): a
// locked claim's text and a locked block's settings cannot change (423, who and when); changing an
// approved block's settings sends its approval back to "unreviewed"; another newsroom's ids answer 404. The texts below are written here; each expected word difference
// follows from them word for word.

interface Version { version: number, change: string, restoredFrom: number | null, savedBy: string | null, savedAt: string, summary: string }
interface Piece { text: string, change: 'same' | 'added' | 'removed' }

let newsroom: TestNewsroom
let datasetId: string

beforeAll(async () => {
  newsroom = await createTestNewsroom('History')
  datasetId = await uploadPayments(newsroom.reporter, newsroom.id)
})

async function history(client: Client, blockId: string): Promise<{ version: number, removed: boolean, label: string, versions: Version[] }> {
  const reply = await client.get(`/api/blocks/${blockId}/versions`)
  expectStatus(reply, 200)
  return reply.body
}

const paragraphs = (...texts: string[]) => ({ type: 'doc', content: texts.map(text => ({ type: 'paragraph', content: [{ type: 'text', text }] })) })
const restore = (client: Client, blockId: string, version: number, current: number) => client.post(`/api/blocks/${blockId}/versions/${version}/restore`, { version: current })

describe('every save is a version', () => {
  it('keeps each saved text and settings with who saved it, newest first', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    expectStatus(await saveBlock(newsroom['data-editor'], story, story.proseBlockId, { content: paragraphs('The harbour paid twelve suppliers.') }), 200)
    const prose = await history(newsroom.reporter, story.proseBlockId)
    expect(prose.versions.map(v => [v.version, v.change, v.savedBy])).toEqual([
      [3, 'edited', newsroom.names['data-editor']],
      [2, 'edited', newsroom.names.reporter],
      [1, 'created', newsroom.names.reporter],
    ])
    expect(prose.version).toBe(3)
    expect(prose.label).toBe('Block 1 (text), “The harbour paid twelve suppliers.”')
    const second = await newsroom.reporter.get(`/api/blocks/${story.proseBlockId}/versions/2`)
    expectStatus(second, 200)
    expect(JSON.stringify(second.body.content)).toContain(CLAIM_TEXT)

    expectStatus(await saveBlock(newsroom.reporter, story, story.analysisBlockId, { settings: { ...story.settings, column: 'supplier' } }), 200)
    const analysis = await history(newsroom['fact-checker'], story.analysisBlockId)
    expect(analysis.versions.map(v => [v.version, v.summary])).toEqual([[2, 'First digit of “supplier”'], [1, 'First digit of “amount”']])
  })

  it('writes each version in the save\'s transaction: ten tabs saving at once leave one version per accepted save, none lost', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    const tabs = Array.from({ length: 10 }, () => Object.assign(new Client(), { cookie: newsroom.reporter.cookie }))
    // Each tab saves its own sentence, retrying on 409 from the block it is shown, until it lands.
    const accepted = await Promise.all(tabs.map(async (tab, i) => {
      for (let attempt = 0; attempt < 40; attempt++) {
        const { version } = await blockOf(tab, story, story.proseBlockId)
        const reply = await tab.patch(`/api/blocks/${story.proseBlockId}`, { version, content: paragraphs(`Tab ${i} wrote this.`) })
        if (reply.status === 200) return reply.body.version as number
        expect(reply.status, JSON.stringify(reply.body)).toBe(409)
      }
      throw new Error(`tab ${i} never saved`)
    }))
    const { versions } = await history(newsroom.reporter, story.proseBlockId)
    const numbers = versions.map(v => v.version).reverse()
    // Version 1 is the empty paragraph, 2 writeStory's text, then one per accepted save.
    expect(numbers).toEqual(Array.from({ length: 12 }, (_, i) => i + 1))
    expect([...accepted].sort((a, b) => a - b)).toEqual(numbers.slice(2))
    for (const [i, version] of accepted.entries()) {
      const kept = await newsroom.reporter.get(`/api/blocks/${story.proseBlockId}/versions/${version}`)
      expect(kept.body.content).toEqual(paragraphs(`Tab ${i} wrote this.`))
    }
  })

  it('refuses to change or delete a kept version, even for the schema\'s owner', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    const where = [story.proseBlockId]
    await expect(sql('UPDATE block_versions SET content = NULL WHERE block_id = $1', where)).rejects.toThrow(/permission denied/)
    await expect(sql('DELETE FROM block_versions WHERE block_id = $1', where)).rejects.toThrow(/permission denied/)
    await expect(ownerSql('UPDATE block_versions SET content = NULL WHERE block_id = $1', where)).rejects.toThrow(/append-only/)
    await expect(ownerSql('DELETE FROM block_versions WHERE block_id = $1', where)).rejects.toThrow(/append-only/)
    // The audit trail keeps its own refusal (issue 20: "it stays append-only in the database").
    await expect(ownerSql('UPDATE audit_events SET detail = \'{}\' WHERE investigation_id = $1', [story.id])).rejects.toThrow(/append-only/)
    await expect(ownerSql('DELETE FROM audit_events WHERE investigation_id = $1', [story.id])).rejects.toThrow(/append-only/)
    const kept = await sql('SELECT count(*)::int AS n FROM block_versions WHERE block_id = $1', where)
    expect(kept.rows[0].n).toBe(2)
  })
})

describe('the difference between two versions', () => {
  it('gives a text\'s words as kept, removed and added, in either direction', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    expectStatus(await saveBlock(newsroom.reporter, story, story.proseBlockId, { content: paragraphs('The council paid the quick supplier twice.') }), 200)
    expectStatus(await saveBlock(newsroom.reporter, story, story.proseBlockId, { content: paragraphs('The council paid the slow supplier twice.', 'A second paragraph.') }), 200)
    const reply = await newsroom['fact-checker'].get(`/api/blocks/${story.proseBlockId}/diff?from=3&to=4`)
    expectStatus(reply, 200)
    expect(reply.body.changed).toBe(true)
    const pieces: Piece[] = reply.body.text
    expect(pieces.filter(p => p.change === 'removed').map(p => p.text.trim())).toEqual(['quick'])
    expect(pieces.filter(p => p.change === 'added').map(p => p.text.trim())).toEqual(['slow', 'A second paragraph.'])
    // The pieces put back together give each version's text.
    expect(pieces.filter(p => p.change !== 'added').map(p => p.text).join('')).toBe('The council paid the quick supplier twice.')
    expect(pieces.filter(p => p.change !== 'removed').map(p => p.text).join('')).toBe('The council paid the slow supplier twice.\nA second paragraph.')
    const back = await newsroom.reporter.get(`/api/blocks/${story.proseBlockId}/diff?from=4&to=3`)
    expect(back.body.text.filter((p: Piece) => p.change === 'added').map((p: Piece) => p.text.trim())).toEqual(['quick'])
    expect(back.body.from.version).toBe(4)
    expectStatus(await newsroom.reporter.get(`/api/blocks/${story.proseBlockId}/diff?from=3&to=99`), 404)
    expectStatus(await newsroom.reporter.get(`/api/blocks/${story.proseBlockId}/diff?from=three&to=4`), 400)
  })

  it('lists every setting side by side, the changed ones marked', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    expectStatus(await saveBlock(newsroom.reporter, story, story.analysisBlockId, { settings: { ...story.settings, test: 'second-digit', threshold: 2500 } }), 200)
    const reply = await newsroom.reporter.get(`/api/blocks/${story.analysisBlockId}/diff?from=1&to=2`)
    expectStatus(reply, 200)
    const byField = Object.fromEntries(reply.body.settings.map((s: { field: string }) => [s.field, s]))
    expect(byField.test).toMatchObject({ label: 'Test', before: 'First digit', after: 'Second digit', changed: true })
    expect(byField.threshold).toMatchObject({ before: null, after: '2,500', changed: true })
    expect(byField.column).toMatchObject({ before: 'amount', after: 'amount', changed: false })
    expect(byField.dataset).toMatchObject({ before: 'Invented harbour payments', changed: false })
  })
})

describe('restoring a version', () => {
  it('brings the text back as a new version, written in the trail, against the version the person saw', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    expectStatus(await saveBlock(newsroom.reporter, story, story.proseBlockId, { content: paragraphs('A later draft.') }), 200)
    expectStatus(await restore(newsroom.reporter, story.proseBlockId, 2, 2), 409)
    const restored = await restore(newsroom.reporter, story.proseBlockId, 2, 3)
    expectStatus(restored, 200)
    expect(restored.body.version).toBe(4)
    expect(JSON.stringify(restored.body.content)).toContain(CLAIM_TEXT)
    const now = await history(newsroom.reporter, story.proseBlockId)
    const top = now.versions[0]!
    expect(top).toMatchObject({ version: 4, change: 'restored', restoredFrom: 2, savedBy: newsroom.names.reporter })
    // The answer names the version it added and the block's label as the history reads them, so the page lists them without asking again.
    expect(restored.body.saved).toEqual(top)
    expect(restored.body.label).toBe(now.label)
    expect(restored.body.label).toContain('The ledger lists invented harbour works.')
    const trail = await newsroom.reporter.get(`/api/investigations/${story.id}/audit?kind=block.version-restored`)
    expect(trail.body.events).toHaveLength(1)
    expect(trail.body.events[0].detail).toMatchObject({ restoredFrom: 2, version: 4 })
    // Restoring what the block already reads changes nothing.
    expectStatus(await restore(newsroom.reporter, story.proseBlockId, 2, 4), 400)
  })

  it('is refused with 423 when it would change a verified claim\'s passage, and leaves no version', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    expectStatus(await saveBlock(newsroom.reporter, story, story.analysisBlockId, { settings: { ...story.settings, test: 'second-digit' } }), 200)
    expectStatus(await postClaim(newsroom.reporter, story), 201)
    expectStatus(await newsroom['fact-checker'].post(`/api/claims/${story.claimId}/verify`, { quote: CLAIM_TEXT }), 200)
    const before = await blockOf(newsroom.reporter, story, story.proseBlockId)
    const refused = await restore(newsroom['data-editor'], story.proseBlockId, 1, before.version)
    expectStatus(refused, 423)
    expect(refused.body.data.message).toContain(newsroom.names['fact-checker'])
    expect(refused.body.data.message).toContain('locked')
    expect((await blockOf(newsroom.reporter, story, story.proseBlockId)).version).toBe(before.version)
    expect((await history(newsroom.reporter, story.proseBlockId)).versions).toHaveLength(2)
    // The analysis block the verified claim cites is locked too: its settings cannot be restored.
    const analysis = await blockOf(newsroom.reporter, story, story.analysisBlockId)
    expect(analysis.lock).not.toBeNull()
    expectStatus(await restore(newsroom['data-editor'], story.analysisBlockId, 1, analysis.version), 423)
    expect((await blockOf(newsroom.reporter, story, story.analysisBlockId)).settings.test).toBe('second-digit')
    expect((await history(newsroom.reporter, story.analysisBlockId)).versions).toHaveLength(2)
  })

  it('sends an approved method back for review like any change of settings, and brings the approval back with the approved settings', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    expectStatus(await saveBlock(newsroom.reporter, story, story.analysisBlockId, { settings: { ...story.settings, test: 'last-two-digits' } }), 200)
    expectStatus(await newsroom['data-editor'].post(`/api/blocks/${story.analysisBlockId}/review`, { decision: 'approved' }), 200)
    const reset = await restore(newsroom.reporter, story.analysisBlockId, 1, 2)
    expectStatus(reset, 200)
    expect(reset.body.settings).toEqual(story.settings)
    expect(reset.body.review.status).toBe('unreviewed')
    const back = await restore(newsroom.reporter, story.analysisBlockId, 2, 3)
    expectStatus(back, 200)
    expect(back.body.review.status).toBe('approved')
    expect(back.body.review.stamp.by).toBe(newsroom.names['data-editor'])
    const trail = await newsroom.reporter.get(`/api/investigations/${story.id}/audit?kind=review`)
    expect(trail.body.events.map((e: { action: string }) => e.action)).toEqual(['review.restored', 'review.reset'])
  })

  it('keeps a removed block\'s history readable; its versions come back only with the block', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    const block = await newsroom.reporter.post(`/api/investigations/${story.id}/blocks`, { kind: 'prose', content: paragraphs('Soon gone.') })
    expectStatus(block, 201)
    expectStatus(await newsroom.reporter.delete(`/api/blocks/${block.body.id}`), 200)
    const kept = await history(newsroom['fact-checker'], block.body.id)
    expect(kept.removed).toBe(true)
    expect(kept.label).toBe('Removed text block, “Soon gone.”')
    expectStatus(await newsroom.reporter.get(`/api/blocks/${block.body.id}/versions/1`), 200)
    expectStatus(await restore(newsroom.reporter, block.body.id, 1, 1), 404)
    expectStatus(await newsroom.reporter.post(`/api/blocks/${block.body.id}/restore`), 200)
    expect((await history(newsroom.reporter, block.body.id)).removed).toBe(false)
  })

  it('is refused to a fact-checker (who does not write) with 403, and is 404 to another newsroom and 401 without a session', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    const other = await createTestNewsroom('History elsewhere')
    expectStatus(await restore(newsroom['fact-checker'], story.proseBlockId, 1, 2), 403)
    for (const path of [`/api/blocks/${story.proseBlockId}/versions`, `/api/blocks/${story.proseBlockId}/versions/1`, `/api/blocks/${story.proseBlockId}/diff?from=1&to=2`]) {
      expectStatus(await other.admin.get(path), 404)
      expectStatus(await new Client().get(path), 401)
    }
    expectStatus(await restore(other.admin, story.proseBlockId, 1, 2), 404)
    expectStatus(await restore(new Client(), story.proseBlockId, 1, 2), 401)
  })
})
