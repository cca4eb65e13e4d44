import { mkdtemp, rm, stat, truncate } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { utf8, workbookBytes, writeLargeCsv } from '../support/dataset-files'
import { sql } from '../support/database'
import {
  expectIncomingGone, incomingFiles, orphanPartitionTables, sha256Of, sha256OfFile, storedFileExists, upload, uploadWithLateEnd, type UploadBody,
} from '../support/datasets'
import { createTestNewsroom, type TestNewsroom } from '../support/newsroom'

let newsroom: TestNewsroom
let scratch: string
beforeAll(async () => {
  newsroom = await createTestNewsroom('Bad files desk')
  scratch = await mkdtemp(join(tmpdir(), 'mantissa-bad-files-'))
})
afterAll(async () => {
  if (scratch) await rm(scratch, { recursive: true, force: true })
})

// Every file here is refused, so this newsroom never holds a dataset.
async function expectNothingKept(sha256: string, inFlight: string[]) {
  const list = await newsroom.reporter.get(`/api/datasets?newsroomId=${newsroom.id}`)
  expect(list.body).toEqual([])
  const rows = await sql(`SELECT count(*)::int AS n FROM datasets WHERE newsroom_id = $1`, [newsroom.id])
  expect(rows.rows[0].n).toBe(0)
  expect(await orphanPartitionTables()).toEqual([])
  expect(storedFileExists(sha256)).toBe(false)
  await expectIncomingGone(inFlight)
}

/** Uploads a bad file and checks the one error shape, the status and the reason. */
async function expectRefused(fileName: string, body: UploadBody, status: number, reason: RegExp) {
  const sha256 = body instanceof Uint8Array ? sha256Of(body) : await sha256OfFile(body.path)
  const reply = await upload(newsroom.reporter, fileName, body)
  const inFlight = await incomingFiles()
  expect(reply.status, JSON.stringify(reply.body)).toBe(status)
  // DESIGN.md, "The API that scripts use": errors are { statusCode, statusMessage, data } with a 4xx.
  expect(reply.body).toMatchObject({ statusCode: status, statusMessage: expect.any(String) })
  expect(reply.body.data.message).toMatch(reason)
  await expectNothingKept(sha256, inFlight)
}

/** A CSV header of `n` columns and one row of numbers. */
function wideCsv(n: number): Uint8Array {
  const header = Array.from({ length: n }, (_, i) => `column_${i + 1}`)
  return utf8(`${header.join(',')}\r\n${header.map((_, i) => String(i + 1)).join(',')}\r\n`)
}

/** Bytes no text file holds: every value 0–255, NULs included, in a fixed shuffle. */
function binaryBytes(length: number): Uint8Array {
  const bytes = new Uint8Array(length)
  let state = 7
  for (let i = 0; i < length; i++) {
    state = (state * 1103515245 + 12345) % 2147483648
    bytes[i] = state >> 16 & 0xFF
  }
  return bytes
}

describe('bad files get a clear 4xx and store nothing', () => {
  it('refuses an empty file', async () => {
    await expectRefused('empty.csv', new Uint8Array(0), 422, /empty/i)
  })

  it('refuses a binary file named .csv', async () => {
    await expectRefused('ledger.csv', binaryBytes(8192), 415, /binary/i)
  })

  it('refuses a file named .xlsx that is not a workbook', async () => {
    await expectRefused('ledger.xlsx', utf8('vendor,amount\r\nNot-a-workbook Ltd,10\r\n'), 415, /not an Excel workbook/i)
  })

  it('refuses a workbook renamed .csv', async () => {
    const workbook = await workbookBytes({ header: ['vendor', 'amount'], rows: [['Renamed Workbook Ltd', '12']] })
    await expectRefused('ledger.csv', workbook, 415, /workbook|archive/i)
  })

  it('refuses a file over the size limit (NUXT_UPLOAD_LIMIT_BYTES, 20 MB for the test server)', async () => {
    const limit = Number(process.env.NUXT_UPLOAD_LIMIT_BYTES)
    expect(limit, 'NUXT_UPLOAD_LIMIT_BYTES must be passed to the tests').toBeGreaterThan(0)
    const path = join(scratch, 'too-big.csv')
    await writeLargeCsv(path, ['vendor', 'amount'], n => [`Oversize Vendor ${n}`, `${n}.25`], limit + 1)
    await truncate(path, limit + 1)
    expect((await stat(path)).size).toBe(limit + 1)
    await expectRefused('too-big.csv', { path }, 413, new RegExp(`limit of ${Math.round(limit / 1024 / 1024)} MB`))

    // The same file again, its upload's last bytes arriving a moment after the limit was passed.
    const inFlight = await incomingFiles()
    const late = await uploadWithLateEnd(newsroom.reporter, 'too-big-slow.csv', path, 500)
    expect(late.status).toBe(413)
    await expectNothingKept(await sha256OfFile(path), inFlight)
  })

  it('refuses an upload that declares more bytes than the limit before reading it', async () => {
    const limit = Number(process.env.NUXT_UPLOAD_LIMIT_BYTES)
    const path = join(scratch, 'declared-too-big.csv')
    await writeLargeCsv(path, ['vendor', 'amount'], n => [`Declared Vendor ${n}`, `${n}.75`], limit + 1024 * 1024)
    await expectRefused('declared-too-big.csv', { path }, 413, /limit of/)
  })

  it('refuses a file with no readable columns', async () => {
    await expectRefused('blank-lines.csv', utf8('\r\n\r\n\r\n'), 422, /no readable columns/i)
    await expectRefused('only-separators.csv', utf8(',,\r\n,,\r\n'), 422, /no readable columns/i)
    await expectRefused('no-records.json', utf8('[]'), 422, /no readable columns/i)
    await expectRefused('empty-records.json', utf8('[{}, {}]'), 422, /no readable columns/i)
  })

  it('refuses a file with a header and no rows', async () => {
    await expectRefused('header-only.csv', utf8('vendor,amount\r\n'), 422, /no rows/i)
  })

  it('refuses a wrong extension', async () => {
    await expectRefused('ledger.pdf', utf8('vendor,amount\r\nWrong Extension Ltd,10\r\n'), 415, /\.pdf/)
    await expectRefused('ledger', utf8('vendor,amount\r\nNo Extension Ltd,10\r\n'), 415, /no extension/)
  })

  it('refuses a file that ends inside a quoted cell', async () => {
    await expectRefused('cut-off.csv', utf8('vendor,amount,note\r\nCut Off Ltd,12.50,fine\r\nHalfway Ltd,30.00,"never closed\r\n'), 422, /quoted cell/i)
  })

  it('refuses JSON that is not an array of records', async () => {
    await expectRefused('numbers.json', utf8('[1, 2, 3]'), 422, /array of records/i)
    await expectRefused('cut-off.json', utf8('[{"vendor": "Cut Json Ltd", "amount": 12.5}, {"vendor": "Half'), 422, /cannot be read/i)
  })

  it('refuses a header of 10,000 columns', async () => {
    await expectRefused('wide.csv', wideCsv(10_000), 422, /10000 columns/)
  })
})
