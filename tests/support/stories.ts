import { randomUUID } from 'node:crypto'
import { expect } from 'vitest'
import type { Client, Reply } from './api'
import { uploadCsv } from './datasets'

/** A run of text in a prose block; with `claimId` it carries the claim mark the editor puts on a marked passage. */
export type Run = string | { text: string, claimId: string }

/** A Tiptap document of one paragraph made of `runs`. */
export function proseDoc(...runs: Run[]) {
  return {
    type: 'doc',
    content: [{
      type: 'paragraph',
      content: runs.map(run => typeof run === 'string'
        ? { type: 'text', text: run }
        : { type: 'text', text: run.text, marks: [{ type: 'claim', attrs: { claimId: run.claimId } }] }),
    }],
  }
}

// Invented figures for an invented council's payments; only the settings that point at them matter here.
const PAYMENTS_CSV = 'supplier,amount\nNorthgate Paving,1840.00\nQuay Lighting,1215.50\nNorthgate Paving,2990.00\nWillow Drains,143.20\nQuay Lighting,1099.99\n'

/** Uploads a small invented payments table and returns its dataset id. */
export function uploadPayments(client: Client, newsroomId: string): Promise<string> {
  return uploadCsv(client, newsroomId, PAYMENTS_CSV, 'Invented harbour payments')
}

export const CLAIM_TEXT = 'Two in five payments to Northgate Paving start with the digit 1'
export const BEFORE_CLAIM = 'The ledger lists invented harbour works. '
export const AFTER_CLAIM = ' according to the desk\'s first-digit test.'

/** A draft with prose holding one claim-marked passage and one analysis block that supports it. */
export interface Story {
  id: string
  title: string
  proseBlockId: string
  analysisBlockId: string
  claimId: string
  settings: { datasetId: string, column: string, test: 'first-digit' }
}

/** `owner` writes a draft: an analysis block, then the prose with the marked passage, saved. The claim itself is not posted yet. */
export async function writeStory(owner: Client, newsroomId: string, datasetId: string, title = `Harbour works ${randomUUID().slice(0, 6)}`): Promise<Story> {
  const created = await owner.post('/api/investigations', { newsroomId, title })
  expect(created.status, JSON.stringify(created.body)).toBe(201)
  const proseBlockId = created.body.blocks[0].id
  const settings = { datasetId, column: 'amount', test: 'first-digit' as const }
  const analysis = await owner.post(`/api/investigations/${created.body.id}/blocks`, { kind: 'analysis', settings })
  expect(analysis.status, JSON.stringify(analysis.body)).toBe(201)
  const claimId = randomUUID()
  const saved = await owner.patch(`/api/blocks/${proseBlockId}`, { version: 1, content: proseDoc(BEFORE_CLAIM, { text: CLAIM_TEXT, claimId }, AFTER_CLAIM) })
  expect(saved.status, JSON.stringify(saved.body)).toBe(200)
  return { id: created.body.id, title, proseBlockId, analysisBlockId: analysis.body.id, claimId, settings }
}

/** POST the story's claim, citing its analysis block. */
export function postClaim(client: Client, story: Story): Promise<Reply> {
  return client.post(`/api/investigations/${story.id}/claims`, { id: story.claimId, blockId: story.proseBlockId, supportingBlockIds: [story.analysisBlockId] })
}

/** Expects `reply` to have the status, showing the body when it does not. */
export function expectStatus(reply: Reply, status: number) {
  expect(reply.status, JSON.stringify(reply.body)).toBe(status)
}

/** The investigation as `client` reads it. */
export async function readStory(client: Client, story: Story) {
  const reply = await client.get(`/api/investigations/${story.id}`)
  expectStatus(reply, 200)
  return reply.body
}

/** One block of the story as the API shows it now (its version is what the next save must name). */
export async function blockOf(client: Client, story: Story, blockId: string) {
  const block = (await readStory(client, story)).blocks.find((b: { id: string }) => b.id === blockId)
  expect(block, `block ${blockId} in the investigation`).toBeDefined()
  return block
}

/** Saves a block against its current version. */
export async function saveBlock(client: Client, story: Story, blockId: string, change: { content?: unknown, settings?: unknown }): Promise<Reply> {
  const { version } = await blockOf(client, story, blockId)
  return client.patch(`/api/blocks/${blockId}`, { version, ...change })
}
