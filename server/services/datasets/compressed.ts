import { Transform } from 'node:stream'
import type { Readable } from 'node:stream'
import { createGunzip } from 'node:zlib'
import { UnreadableFile } from './sniff'
import type { DatasetFormat } from './sniff'
import { inflate, limited, openArchive } from './stored-archive'
import type { RangeOpener } from './stored-archive'

/**
 * Tables that come compressed, as official releases often do: one CSV, TSV or JSON file gzipped
 * (ledger.csv.gz) or alone in a zip archive. The stored original stays the file that was sent (its
 * SHA-256 is of those bytes); the import reads the table inflating, never past the upload limit.
 */

export type Compression = 'gzip' | 'zip'

const TABLE_EXTENSIONS: Record<string, Exclude<DatasetFormat, 'xlsx'>> = { csv: 'csv', txt: 'csv', tsv: 'tsv', tab: 'tsv', json: 'json' }

const DAMAGED_ZIP = 'This zip archive cannot be read: it is damaged or cut off. Download it again, or unpack it and upload the table inside.'
const DAMAGED_GZIP = 'This .gz file cannot be read: it is damaged or cut off. Download it again, or unpack it and upload the table inside.'

function inflatesTooFar(limit: number): UnreadableFile {
  return new UnreadableFile(`This file inflates to more than the upload limit of ${Math.round(limit / 1024 / 1024)} MB once unpacked, so Mantissa does not read it (it may be a file made to exhaust the server). Split the table, or ask an admin to raise the limit.`)
}

/** The table format a file's inner name promises (ledger.csv in ledger.csv.gz), or null. */
export function tableFormat(name: string): Exclude<DatasetFormat, 'xlsx'> | null {
  return TABLE_EXTENSIONS[name.toLowerCase().match(/\.([a-z0-9]+)$/)?.[1] ?? ''] ?? null
}

/** Folders and files that archivers add beside the table (a Mac's resource forks, hidden files). */
const isClutter = (path: string) => path.endsWith('/') || path.startsWith('__MACOSX/') || /(^|\/)\./.test(path)

/**
 * The one table a zip archive holds: its entry's name and format. An archive with none, or with
 * several, is refused with the names it holds.
 */
export async function tableInZip(open: RangeOpener, size: number): Promise<{ entry: string, format: Exclude<DatasetFormat, 'xlsx'> }> {
  const { zip, entries } = await openArchive(open, size, () => {}, { damaged: DAMAGED_ZIP, tooBig: () => new UnreadableFile('This zip archive lists more files than Mantissa opens. Unpack it and upload the table inside.') })
  zip.close()
  const names = [...entries.keys()].filter(name => !isClutter(name))
  const tables = names.filter(name => tableFormat(name))
  if (tables.length === 1) return { entry: tables[0]!, format: tableFormat(tables[0]!)! }
  const listed = names.slice(0, 8).map(name => `"${name}"`).join(', ') + (names.length > 8 ? ', …' : '')
  if (!tables.length) throw new UnreadableFile(`This zip archive holds no table Mantissa reads (.csv, .tsv, .txt or .json)${names.length ? `: it holds ${listed}` : ''}. Unpack it and upload the table.`)
  throw new UnreadableFile(`This zip archive holds ${tables.length} tables (${listed}). Upload them one at a time, each as its own dataset.`)
}

/** Skips the first `count` bytes of a stream (a byte-order mark of the inflated text). */
function skipping(count: number): Transform {
  let left = count
  return new Transform({
    transform(chunk: Buffer, _encoding, done) {
      if (left >= chunk.length) {
        left -= chunk.length
        return done()
      }
      const rest = left ? chunk.subarray(left) : chunk
      left = 0
      done(null, rest)
    },
  })
}

/**
 * Opens the inflated table of a stored compressed file from byte `start` of the table; every
 * opening reads the stored file from its beginning (a compressed stream has no offsets).
 */
export function inflatedOpener(open: RangeOpener, size: number, compression: Compression, entry: string | null, limit: number): (start?: number) => Promise<Readable> {
  return async (start = 0) => {
    const counter = limited(limit, () => inflatesTooFar(limit))
    let table: Readable
    if (compression === 'gzip') {
      const gunzip = createGunzip()
      const raw = await open(0)
      raw.on('error', error => gunzip.destroy(error))
      gunzip.on('error', error => counter.destroy(error instanceof UnreadableFile ? error : new UnreadableFile(DAMAGED_GZIP)))
      counter.on('error', () => raw.destroy())
      table = raw.pipe(gunzip).pipe(counter)
    }
    else {
      const { zip, entries } = await openArchive(open, size, () => {}, { damaged: DAMAGED_ZIP, tooBig: () => new UnreadableFile(DAMAGED_ZIP) })
      const found = entry === null ? undefined : entries.get(entry)
      if (!found) {
        zip.close()
        throw new UnreadableFile(DAMAGED_ZIP)
      }
      if (found.uncompressedSize > limit) {
        zip.close()
        throw inflatesTooFar(limit)
      }
      table = (await inflate(zip, found, counter, DAMAGED_ZIP)).on('close', () => zip.close())
    }
    if (!start) return table
    const skipped = skipping(start)
    table.on('error', error => skipped.destroy(error))
    skipped.on('close', () => table.destroy())
    return table.pipe(skipped)
  }
}

/** The first `bytes` of an inflated table (for the format and encoding checks an upload gets). */
export async function inflatedHead(opened: Readable, bytes = 64 * 1024): Promise<Buffer> {
  const chunks: Buffer[] = []
  let length = 0
  try {
    for await (const chunk of opened) {
      chunks.push(chunk as Buffer)
      length += (chunk as Buffer).length
      if (length >= bytes) break
    }
  }
  finally {
    opened.destroy()
  }
  return Buffer.concat(chunks).subarray(0, bytes)
}
