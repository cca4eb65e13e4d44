import Papa from 'papaparse'
import { beforeAll, describe, expect, it } from 'vitest'
import { Client } from '../support/api'
import type { Reply } from '../support/api'
import { createTestNewsroom } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { expectStatus, proseDoc, saveBlock, uploadPayments, writeStory } from '../support/stories'
import type { Story } from '../support/stories'

// Issue 20 and docs/product-rules.md ("The trail in words"): "the audit trail names the block, the
// claim and what changed (old → new for settings), can be filtered by person and kind, and
// downloads as CSV". The CSV is read back with papaparse
// (a general-purpose CSV parser) and must say what the JSON trail says. RFC 4180 (CSV): a header
// row, CRLF line ends, fields holding a comma, a double quote or a line break in double quotes,
// a quote inside doubled. OWASP's "CSV Injection" advice: a cell starting with =, +, - or @ is
// prefixed with an apostrophe so a spreadsheet shows it as text.

interface Event { id: string, action: string, actor: string | null, at: string, block: string | null, claim: string | null, changes: { label: string, from: string | null, to: string | null }[] }

let newsroom: TestNewsroom
let datasetId: string
let story: Story
const TRICKY = '=HYPERLINK("http://invented.example","paid, twice")'

beforeAll(async () => {
  newsroom = await createTestNewsroom('Download')
  datasetId = await uploadPayments(newsroom.reporter, newsroom.id)
  story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
  expectStatus(await saveBlock(newsroom.reporter, story, story.analysisBlockId, { settings: { ...story.settings, column: 'supplier', test: 'second-digit' } }), 200)
  const current = await newsroom.reporter.get(`/api/investigations/${story.id}`)
  expectStatus(await newsroom.reporter.patch(`/api/investigations/${story.id}`, { title: 'Harbour payments, second look', titleVersion: current.body.titleVersion }), 200)
  // A claim whose words a spreadsheet would run as a formula, with a comma and quotes in it.
  const claimId = crypto.randomUUID()
  const block = await newsroom.reporter.post(`/api/investigations/${story.id}/blocks`, { kind: 'prose', content: proseDoc({ text: TRICKY, claimId }) })
  expectStatus(block, 201)
  expectStatus(await newsroom.reporter.post(`/api/investigations/${story.id}/claims`, { id: claimId, blockId: block.body.id, supportingBlockIds: [] }), 201)
  expectStatus(await newsroom['fact-checker'].post(`/api/claims/${claimId}/dispute`, { note: 'Where is the second payment?' }), 200)
})

async function trail(query = ''): Promise<Event[]> {
  const events: Event[] = []
  let before: string | null = null
  do {
    const reply: Reply<{ events: Event[], next: string | null }> = await newsroom['fact-checker'].get(`/api/investigations/${story.id}/audit?limit=3${query}${before ? `&before=${before}` : ''}`)
    expectStatus(reply, 200)
    events.push(...reply.body.events)
    before = reply.body.next
  } while (before)
  return events
}

async function download(query = '') {
  const reply = await newsroom['fact-checker'].get(`/api/investigations/${story.id}/audit.csv${query ? `?${query}` : ''}`)
  expectStatus(reply, 200)
  expect(reply.headers.get('content-type')).toMatch(/^text\/csv/)
  expect(reply.headers.get('content-disposition')).toMatch(/^attachment; filename="audit-trail-harbour-payments-second-look\.csv"$/)
  const text = reply.body as string
  const parsed = Papa.parse<string[]>(text, { skipEmptyLines: true })
  expect(parsed.errors).toEqual([])
  return { text, header: parsed.data[0]!, rows: parsed.data.slice(1) }
}

describe('the audit trail names what each event concerns', () => {
  it('names the block, the claim and the change old → new', async () => {
    const events = await trail()
    const edit = events.find(e => e.action === 'block.edited' && e.changes.length)!
    expect(edit.block).toBe('Block 2 (analysis), Second digit of “supplier”')
    expect(edit.changes).toEqual([{ label: 'Column', from: 'amount', to: 'supplier' }, { label: 'Test', from: 'First digit', to: 'Second digit' }])
    const renamed = events.find(e => e.action === 'investigation.renamed')!
    expect(renamed.changes).toEqual([{ label: 'Title', from: story.title, to: 'Harbour payments, second look' }])
    const disputed = events.find(e => e.action === 'claim.disputed')!
    expect(disputed.claim).toBe(TRICKY)
    expect(disputed.block).toMatch(/^Block 3 \(text\), /)
  })
})

describe('the trail as CSV', () => {
  it('holds every event of the JSON trail, in its order and words, with a header row and CRLF line ends', async () => {
    const events = await trail()
    const { text, header, rows } = await download()
    expect(header).toEqual(['Event', 'When (UTC)', 'Who', 'What happened', 'Action', 'Block', 'Claim', 'Changed (old → new)', 'Details'])
    expect(text.split('\r\n').length).toBeGreaterThan(events.length)
    expect(text.replaceAll('\r\n', '')).not.toMatch(/(?<!")\n/)
    expect(rows.map(r => r[0])).toEqual(events.map(e => e.id))
    expect(rows.map(r => [r[1], r[2], r[4]])).toEqual(events.map(e => [e.at, e.actor ?? 'Mantissa', e.action]))
    const edit = rows.find(r => r[4] === 'block.edited' && r[7])!
    expect(edit[5]).toBe('Block 2 (analysis), Second digit of “supplier”')
    expect(edit[7]).toBe('Column: amount → supplier; Test: First digit → Second digit')
  })

  it('writes a formula-like cell as text, quoted as RFC 4180 asks', async () => {
    const { text, rows } = await download()
    const disputed = rows.find(r => r[4] === 'claim.disputed')!
    expect(disputed[6]).toBe(`'${TRICKY}`)
    expect(text).toContain(`"'=HYPERLINK(""http://invented.example"",""paid, twice"")"`)
  })

  it('keeps the filters of the page: a kind, a person, both', async () => {
    const claims = await download('kind=claim')
    expect(claims.rows.map(r => r[0])).toEqual((await trail('&kind=claim')).map(e => e.id))
    expect(new Set(claims.rows.map(r => r[4]))).toEqual(new Set(['claim.marked', 'claim.disputed']))
    const checkerId = (await newsroom.admin.get(`/api/newsrooms/${newsroom.id}/members`)).body
      .find((m: { name: string }) => m.name === newsroom.names['fact-checker'])?.userId
    expect(checkerId).toBeTruthy()
    const checker = await download(`actor=${checkerId}`)
    expect(checker.rows.map(r => r[0])).toEqual((await trail(`&actor=${checkerId}`)).map(e => e.id))
    expect(checker.rows.every(r => r[2] === newsroom.names['fact-checker'])).toBe(true)
    expect(checker.rows.length).toBeGreaterThan(0)
  })

  it('is 404 to another newsroom and 401 without a session', async () => {
    const other = await createTestNewsroom('Download elsewhere')
    expectStatus(await other.admin.get(`/api/investigations/${story.id}/audit.csv`), 404)
    expectStatus(await new Client().get(`/api/investigations/${story.id}/audit.csv`), 401)
  })
})
