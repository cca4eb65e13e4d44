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

/** A published story of one chart: its public link's token and the chart's place among the snapshot's blocks. */
export interface PublishedChart {
  storyId: string
  title: string
  analysisBlockId: string
  token: string
  index: number
}

/**
 * A story holding one first-digit test of `column` on `datasetId`, written and run by the reporter and
 * published by the data editor (with a reason, as the method is not approved): what the reader's link opens.
 */
export async function publishChart(reporter: Client, editor: Client, newsroomId: string, datasetId: string, title: string, column = 'amount'): Promise<PublishedChart> {
  const created = await reporter.post('/api/investigations', { newsroomId, title })
  expectStatus(created, 201)
  const analysis = await reporter.post(`/api/investigations/${created.body.id}/blocks`, { kind: 'analysis', settings: { datasetId, column, test: 'first-digit' } })
  expectStatus(analysis, 201)
  expectStatus(await reporter.post(`/api/blocks/${analysis.body.id}/run`), 200)
  const published = await editor.post(`/api/investigations/${created.body.id}/publish`, { reason: 'Browser test of a published chart; its method was not reviewed.' })
  expectStatus(published, 201)
  const token = new URL(published.body.url).pathname.split('/p/')[1]!
  const snapshot = await editor.get(`/api/public/${token}`)
  expectStatus(snapshot, 200)
  const index = snapshot.body.blocks.findIndex((b: { kind: string, result: unknown }) => b.kind === 'analysis' && b.result)
  expect(index, 'the published chart among the snapshot’s blocks').toBeGreaterThanOrEqual(0)
  return { storyId: created.body.id, title, analysisBlockId: analysis.body.id, token, index }
}

/**
 * An invented ledger of 120 payments with a `paid_on` column written day first (DD/MM/YYYY; days past
 * the 12th settle the order). Its earliest payment sits in row 40 and its latest in row 80, so the
 * range cannot come from the first and last rows: 3 Feb 2024 and 28 Nov 2025; every other row is paid
 * between 10 Feb 2024 and 10 Nov 2025.
 */
export function datedPaymentsCsv(): string {
  const day = (date: Date) => `${String(date.getUTCDate()).padStart(2, '0')}/${String(date.getUTCMonth() + 1).padStart(2, '0')}/${date.getUTCFullYear()}`
  const lines = ['supplier,paid_on,amount']
  for (let i = 0; i < 120; i++) {
    const paid = i === 40 ? new Date(Date.UTC(2024, 1, 3)) : i === 80 ? new Date(Date.UTC(2025, 10, 28)) : new Date(Date.UTC(2024, 1, 10) + ((i * 7) % 640) * 86_400_000)
    // Spread over four orders of magnitude by the golden ratio's fractions, so the digits are not all alike.
    const amount = (Math.round(10 ** (1 + ((i * 0.6180339887) % 1) * 4) * 100) / 100).toFixed(2)
    lines.push(`${['Northgate Paving', 'Quay Lighting', 'Willow Drains'][i % 3]},${day(paid)},${amount}`)
  }
  return `${lines.join('\n')}\n`
}
/** The range `datedPaymentsCsv` holds, as Mantissa writes dates (shared/format/dates.ts: "3 Dec 2026"). */
export const DATED_PAYMENTS_RANGE = 'dataset dated 3 Feb 2024 to 28 Nov 2025 (“paid_on”)'
