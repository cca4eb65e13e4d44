import { randomUUID } from 'node:crypto'
import { readdir, readlink } from 'node:fs/promises'
import { request } from 'node:http'
import { join } from 'node:path'
import ExcelJS from 'exceljs'
import { beforeAll, describe, expect, it } from 'vitest'
import { baseUrl, Client } from '../support/api'
import { expectIncomingGone, incomingFiles, storageBase, upload, uploadCsv } from '../support/datasets'
import { createTestNewsroom } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { expectStatus, postClaim, uploadPayments, writeStory } from '../support/stories'

// The outside probe found these; each answer below is what a newsroom tool owes its users.

let newsroom: TestNewsroom

beforeAll(async () => {
  newsroom = await createTestNewsroom('Smaller')
})

/** Every open file descriptor of this machine's processes (that this user may read) pointing into `folder`. */
async function descriptorsInto(folder: string): Promise<string[]> {
  const found: string[] = []
  for (const pid of (await readdir('/proc')).filter(name => /^\d+$/.test(name))) {
    const fds = await readdir(`/proc/${pid}/fd`).catch(() => [])
    for (const fd of fds) {
      const target = await readlink(`/proc/${pid}/fd/${fd}`).catch(() => '')
      if (target.startsWith(folder)) found.push(target)
    }
  }
  return found
}

describe('an upload the client abandons', () => {
  it('leaves no staging file and no open file descriptor behind', async () => {
    const before = new Set(await incomingFiles())
    const boundary = `----abandoned-${randomUUID()}`
    const url = new URL('/api/datasets', baseUrl)
    const sending = request(url, { method: 'POST', headers: { 'cookie': newsroom.reporter.cookie, 'content-type': `multipart/form-data; boundary=${boundary}`, 'content-length': String(5 * 1024 * 1024) } })
    sending.on('error', () => { /* the socket is destroyed on purpose */ })
    sending.write(`--${boundary}\r\nContent-Disposition: form-data; name="title"\r\n\r\nAbandoned\r\n--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="abandoned.csv"\r\nContent-Type: text/csv\r\n\r\nsupplier,amount\n`)
    sending.write('Quay Lighting,1215.50\n'.repeat(20_000))
    // Wait until the server stages it, then go away mid-file.
    let staged: string[] = []
    for (let i = 0; i < 100 && !staged.length; i++) {
      await new Promise(r => setTimeout(r, 50))
      staged = (await incomingFiles()).filter(name => !before.has(name))
    }
    expect(staged.length, 'the upload reached the staging folder').toBeGreaterThan(0)
    sending.destroy()
    await expectIncomingGone(staged, 10)
    const incoming = join(storageBase, 'incoming')
    let open = await descriptorsInto(incoming)
    for (let i = 0; i < 50 && open.some(path => staged.some(name => path.includes(name))); i++) {
      await new Promise(r => setTimeout(r, 100))
      open = await descriptorsInto(incoming)
    }
    expect(open.filter(path => staged.some(name => path.includes(name)))).toEqual([])
  })
})

describe('a grouped test by a column of nearly unique texts', () => {
  it('refuses more than 10,000 groups with a clear message, and still groups a column of few values', async () => {
    // Invented rows: a reference per row (10,050 of them) and one of three invented suppliers.
    const rows = Array.from({ length: 10_050 }, (_, i) => `REF-${String(i).padStart(6, '0')},${['Quay Lighting', 'Northgate Paving', 'Willow Drains'][i % 3]},${(1000 + i * 7.31).toFixed(2)}`)
    const id = await uploadCsv(newsroom.reporter, newsroom.id, `reference,supplier,amount\n${rows.join('\n')}\n`, 'Unique references')
    const grouped = await newsroom.reporter.post(`/api/datasets/${id}/digit-tests`, { column: 'amount', test: 'first-digit', groupBy: 'reference' })
    expectStatus(grouped, 400)
    expect(grouped.body.data[0].path).toBe('groupBy')
    expect(grouped.body.data[0].message).toMatch(/more than 10,000 different values/)
    const bySupplier = await newsroom.reporter.post(`/api/datasets/${id}/digit-tests`, { column: 'amount', test: 'first-digit', groupBy: 'supplier' })
    expectStatus(bySupplier, 200)
    expect(bySupplier.body.groups).toHaveLength(3)
  })
})

describe('a JSON body past the size cap', () => {
  it('answers 413, whether the body says its length or streams without one', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, await uploadPayments(newsroom.reporter, newsroom.id))
    const huge = { version: 1, content: { type: 'doc', content: [{ type: 'paragraph', content: [{ type: 'text', text: 'x'.repeat(5 * 1024 * 1024) }] }] } }
    const declared = await newsroom.reporter.patch(`/api/blocks/${story.proseBlockId}`, huge)
    expectStatus(declared, 413)
    const text = new TextEncoder().encode(JSON.stringify(huge))
    const streamed = await newsroom.reporter.request('PATCH', `/api/blocks/${story.proseBlockId}`, new ReadableStream({
      start(controller) {
        for (let at = 0; at < text.length; at += 1 << 16) controller.enqueue(text.subarray(at, at + (1 << 16)))
        controller.close()
      },
    }), { 'content-type': 'application/json' })
    expectStatus(streamed, 413)
    expect(streamed.body.data.message).toMatch(/4 MB/)
  })
})

describe('titles and source notes with new lines', () => {
  it('are one line in the record and in the published methodology', async () => {
    const created = await newsroom.reporter.post('/api/investigations', { newsroomId: newsroom.id, title: 'Harbour works\n## Added heading\n- and an item' })
    expectStatus(created, 201)
    expect(created.body.title).toBe('Harbour works ## Added heading - and an item')
    const note = 'From the council\'s records office.\n# Not a heading\n## Nor this'
    const dataset = await upload(newsroom.reporter, 'notes.csv', new TextEncoder().encode('supplier,amount\nQuay Lighting,1215.50\nWillow Drains,143.20\n'), { title: 'Ledger\n### with a heading', sourceNote: note }, `?newsroomId=${newsroom.id}`)
    expectStatus(dataset, 201)
    const block = await newsroom.reporter.post(`/api/investigations/${created.body.id}/blocks`, { kind: 'analysis', settings: { datasetId: dataset.body.id, column: 'amount', test: 'first-digit' } })
    expectStatus(block, 201)
    const published = await newsroom['data-editor'].post(`/api/investigations/${created.body.id}/publish`, { reason: 'Testing the methodology\'s lines.' })
    expectStatus(published, 201)
    const view = await new Client().get(`/api/public/${published.body.url.split('/p/')[1]}`)
    expectStatus(view, 200)
    const lines: string[] = view.body.methodology.split('\n')
    expect(lines.filter(line => /^(#+|-) *(Added heading|and an item|Not a heading|Nor this|with a heading)/.test(line))).toEqual([])
    expect(lines).toContainEqual(expect.stringContaining('From the council\'s records office. # Not a heading ## Nor this'))
    expect(lines[0]).toBe('# Methodology: Harbour works ## Added heading - and an item')
  })
})

describe('a title given to another sheet of a workbook', () => {
  it('is one line too, as an uploaded dataset\'s title', async () => {
    const workbook = new ExcelJS.Workbook()
    workbook.addWorksheet('2023').addRows([['supplier', 'amount'], ['Quay Lighting', 1215.5]])
    workbook.addWorksheet('2024').addRows([['supplier', 'amount'], ['Willow Drains', 143.2]])
    const stored = await upload(newsroom.reporter, 'ledger.xlsx', new Uint8Array(await workbook.xlsx.writeBuffer()), { title: 'Ledger' }, `?newsroomId=${newsroom.id}`)
    expectStatus(stored, 201)
    const sheet = await newsroom.reporter.post(`/api/datasets/${stored.body.id}/sheets`, { sheet: '2024', title: 'Ledger 2024\n## Slipped heading\r\n- and an item' })
    expectStatus(sheet, 201)
    expect((await newsroom.reporter.get(`/api/datasets/${sheet.body.id}`)).body.title).toBe('Ledger 2024 ## Slipped heading - and an item')
    expectStatus(await newsroom.reporter.post(`/api/datasets/${stored.body.id}/sheets`, { sheet: '2024', title: ' \n ' }), 400)
  })
})

describe('a file that starts as UTF-8 and turns Latin-1 further on', () => {
  it('reads each part as its bytes say and says so', async () => {
    // Past the first 64 KB the file sniffing reads: an accent in UTF-8 first, one in Latin-1 later.
    const early = Buffer.from(`supplier,amount\nCafé du Port,1840.00\n${'Quay Lighting,1215.50\n'.repeat(4000)}`, 'utf8')
    const late = Buffer.from('M\u00FCller & S\u00F6hne,215.50\n', 'latin1')
    const reply = await upload(newsroom.reporter, 'mixed.csv', Buffer.concat([early, late]), { title: 'Two systems' }, `?newsroomId=${newsroom.id}`)
    expectStatus(reply, 201)
    const dataset = await newsroom.reporter.get(`/api/datasets/${reply.body.id}`)
    expect(dataset.body.encoding).toBe('utf-8+windows-1252')
    const first = await newsroom.reporter.get(`/api/datasets/${reply.body.id}/preview?page=1`)
    expect(JSON.stringify(first.body.items[0])).toContain('Café du Port')
    const pages = Math.ceil(first.body.total / first.body.pageSize)
    const last = await newsroom.reporter.get(`/api/datasets/${reply.body.id}/preview?page=${pages}`)
    expect(JSON.stringify(last.body.items.at(-1))).toContain('Müller & Söhne')
  })
})

describe('a file that starts as Latin-1 and turns UTF-8 further on', () => {
  it('reads the later UTF-8 as UTF-8 too, instead of spelling its accents as two letters each', async () => {
    // The other way round: a Latin-1 accent on the first row, a UTF-8 one past the first 64 KB.
    const early = Buffer.from(`supplier,amount\nM\u00FCller & S\u00F6hne,215.50\n${'Quay Lighting,1215.50\n'.repeat(4000)}`, 'latin1')
    const late = Buffer.from('Café du Port,1840.00\n', 'utf8')
    const reply = await upload(newsroom.reporter, 'reversed.csv', Buffer.concat([early, late]), { title: 'Two systems, reversed' }, `?newsroomId=${newsroom.id}`)
    expectStatus(reply, 201)
    expect((await newsroom.reporter.get(`/api/datasets/${reply.body.id}`)).body.encoding).toBe('utf-8+windows-1252')
    const first = await newsroom.reporter.get(`/api/datasets/${reply.body.id}/preview?page=1`)
    expect(first.body.items[0].cells[0]).toBe('Müller & Söhne')
    const last = await newsroom.reporter.get(`/api/datasets/${reply.body.id}/preview?page=${Math.ceil(first.body.total / first.body.pageSize)}`)
    expect(last.body.items.at(-1).cells[0]).toBe('Café du Port')
    // A file that is Latin-1 throughout stays Latin-1.
    const plain = await upload(newsroom.reporter, 'latin.csv', Buffer.from('supplier,amount\nM\u00FCller & S\u00F6hne,215.50\nCaf\u00E9 du Port,1840.00\n', 'latin1'), { title: 'One system' }, `?newsroomId=${newsroom.id}`)
    expectStatus(plain, 201)
    expect((await newsroom.reporter.get(`/api/datasets/${plain.body.id}`)).body.encoding).toBe('windows-1252')
  })
})

describe('a visitor without a session', () => {
  it('gets the same 401 for ids that exist and ids that do not', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, await uploadPayments(newsroom.reporter, newsroom.id))
    expectStatus(await postClaim(newsroom.reporter, story), 201)
    const anonymous = new Client()
    for (const [path, method] of [['/api/investigations/', 'GET'], ['/api/investigations/', 'PATCH'], ['/api/blocks/', 'PATCH'], ['/api/datasets/', 'GET'], ['/api/claims/', 'PATCH']] as const) {
      const real = path === '/api/blocks/' ? story.proseBlockId : path === '/api/datasets/' ? story.settings.datasetId : path === '/api/claims/' ? story.claimId : story.id
      const [existing, missing] = await Promise.all([real, randomUUID()].map(id => anonymous.request(method, `${path}${id}`, method === 'GET' ? undefined : {})))
      expect([existing!.status, missing!.status], `${method} ${path}`).toEqual([401, 401])
      const shape = (body: { statusCode: number, statusMessage: string, data?: unknown }) => [body.statusCode, body.statusMessage, body.data]
      expect(shape(existing!.body)).toEqual(shape(missing!.body))
    }
  })
})
