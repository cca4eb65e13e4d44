import { isAscii, isUtf8 } from 'node:buffer'
import type { Readable } from 'node:stream'
import { utf8Length } from './mixed-text'

export const FORMATS = ['csv', 'tsv', 'xlsx', 'json'] as const
export type DatasetFormat = typeof FORMATS[number]
/** 'utf-8+windows-1252': UTF-8 where the bytes are UTF-8, Windows-1252 where they are not (mixed-text.ts). */
export type TextEncoding = 'utf-8' | 'utf-16le' | 'utf-16be' | 'windows-1252' | 'utf-8+windows-1252'

const EXTENSIONS: Record<string, DatasetFormat> = { csv: 'csv', txt: 'csv', tsv: 'tsv', tab: 'tsv', xlsx: 'xlsx', json: 'json' }

export class UnreadableFile extends Error {
  constructor(message: string, readonly status: 415 | 422 = 422) {
    super(message)
  }
}

const READS = 'Mantissa reads .csv, .tsv, .txt, .xlsx and .json files, and tables gzipped (.csv.gz) or alone in a .zip'

/**
 * The format a file name promises, and how it is compressed: "ledger.csv.gz" is gzipped CSV, a
 * .zip holds a table whose format its entry names (null here). Refuses names Mantissa cannot read.
 */
export function formatFromName(name: string): { format: DatasetFormat | null, compression: 'gzip' | 'zip' | null } {
  const lower = name.toLowerCase()
  const extension = lower.match(/\.([a-z0-9]+)$/)?.[1] ?? ''
  if (extension === 'zip') return { format: null, compression: 'zip' }
  if (extension === 'gz') {
    const inner = EXTENSIONS[lower.slice(0, -3).match(/\.([a-z0-9]+)$/)?.[1] ?? '']
    if (!inner || inner === 'xlsx') throw new UnreadableFile(`${READS}; "${name}" does not say which table it holds (name it like ledger.csv.gz).`, 415)
    return { format: inner, compression: 'gzip' }
  }
  const format = EXTENSIONS[extension]
  if (!format) throw new UnreadableFile(`${READS}; "${extension ? `.${extension}` : 'no extension'}" is not one of them.`, 415)
  return { format, compression: null }
}

function startsWith(head: Uint8Array, bytes: number[]) {
  return bytes.every((b, i) => head[i] === b)
}

const UTF32_MARKS = [[0xFF, 0xFE, 0x00, 0x00], [0x00, 0x00, 0xFE, 0xFF]]

/**
 * UTF-16 without a byte-order mark (some database and PowerShell exports): text of Latin letters
 * and digits has a NUL in every other byte, on one side only. Null when the bytes do not say so.
 */
function unmarkedUtf16(head: Uint8Array): 'utf-16le' | 'utf-16be' | null {
  const pairs = Math.floor(Math.min(head.length, 4096) / 2)
  if (pairs < 4) return null
  const text = (b: number) => b === 0x09 || b === 0x0A || b === 0x0D || (b >= 0x20 && b < 0x7F)
  let little = 0
  let big = 0
  let zeros = 0
  for (let i = 0; i < pairs; i++) {
    const [a, b] = [head[2 * i]!, head[2 * i + 1]!]
    if (a === 0 && b === 0) zeros++
    else if (b === 0 && text(a)) little++
    else if (a === 0 && text(b)) big++
  }
  if (zeros > 0.02 * pairs) return null
  if (little >= 0.5 * pairs && big === 0) return 'utf-16le'
  if (big >= 0.5 * pairs && little === 0) return 'utf-16be'
  return null
}

/**
 * Text encoding from the byte-order mark, else UTF-16 when its NULs show, else UTF-8 when the
 * start decodes cleanly, else Latin-1 (Windows-1252).
 */
export function detectEncoding(head: Uint8Array): { encoding: TextEncoding, bomLength: number } {
  if (startsWith(head, [0xEF, 0xBB, 0xBF])) return { encoding: 'utf-8', bomLength: 3 }
  if (startsWith(head, [0xFF, 0xFE])) return { encoding: 'utf-16le', bomLength: 2 }
  if (startsWith(head, [0xFE, 0xFF])) return { encoding: 'utf-16be', bomLength: 2 }
  const utf16 = unmarkedUtf16(head)
  if (utf16) return { encoding: utf16, bomLength: 0 }
  try {
    // Streaming: a multi-byte character cut at the end of the sample is not an error, and one
    // that ends the file is still checked (cutting bytes off the end read "Café\r\n" as Latin-1).
    new TextDecoder('utf-8', { fatal: true }).decode(head, { stream: true })
    return { encoding: 'utf-8', bomLength: 0 }
  }
  catch {
    return { encoding: 'windows-1252', bomLength: 0 }
  }
}

/**
 * The encoding of a whole stored text file: detectEncoding on its first bytes, except that a file
 * whose start reads as UTF-8 but holds invalid bytes further on (a Latin-1 accent first met on
 * row 5,000) is not UTF-8 throughout. If its UTF-8 part already held accented characters, it was
 * written by two systems and is read as the bytes say ('utf-8+windows-1252'); if that part was
 * plain ASCII, it is Latin-1. The other way round, a file that starts as Latin-1 but spells a
 * character in UTF-8 further on is read as the bytes say too. One streamed pass over the file,
 * never held in memory.
 */
export async function detectFileEncoding(open: () => Promise<Readable>, head: Uint8Array): Promise<{ encoding: TextEncoding, bomLength: number }> {
  const detected = detectEncoding(head)
  if (detected.encoding === 'windows-1252') return await spellsUtf8(open) ? { encoding: 'utf-8+windows-1252', bomLength: 0 } : detected
  if (detected.encoding !== 'utf-8' || detected.bomLength > 0) return detected
  // A character cut between two chunks waits for the rest of its bytes in the next one.
  let carry: Buffer = Buffer.alloc(0)
  let accented = false
  const notUtf8 = (valid: Uint8Array) => ({ encoding: accented || !isAscii(valid) ? 'utf-8+windows-1252' as const : 'windows-1252' as const, bomLength: 0 })
  for await (const chunk of await open()) {
    const bytes = carry.length ? Buffer.concat([carry, chunk as Buffer]) : chunk as Buffer
    const cut = completeUpTo(bytes)
    if (!isUtf8(bytes.subarray(0, cut))) return notUtf8(bytes.subarray(0, utf8Length(bytes)))
    accented ||= !isAscii(bytes.subarray(0, cut))
    carry = bytes.subarray(cut)
  }
  return carry.length ? notUtf8(Buffer.alloc(0)) : detected
}

/**
 * Whether a file holds a character written as UTF-8: a lead byte with its continuation bytes. In
 * Latin-1 text such a pair is an accented capital followed by a symbol (as "Ã©"), which prose and
 * tables almost never hold; where it stands, the mixed reading matches Latin-1 everywhere else.
 */
async function spellsUtf8(open: () => Promise<Readable>): Promise<boolean> {
  // The last bytes of a chunk wait for the next, in case a character is cut between them.
  let carry: Buffer = Buffer.alloc(0)
  for await (const chunk of await open()) {
    const bytes = carry.length ? Buffer.concat([carry, chunk as Buffer]) : chunk as Buffer
    for (let at = 0; at < bytes.length; at++) {
      const lead = bytes[at]!
      if (lead < 0xC2 || lead > 0xF4) continue
      const length = lead >= 0xF0 ? 4 : lead >= 0xE0 ? 3 : 2
      if (at + length <= bytes.length && isUtf8(bytes.subarray(at, at + length))) return true
    }
    carry = bytes.subarray(Math.max(0, bytes.length - 3))
  }
  return false
}

/** Where the last UTF-8 character of `bytes` starts if its bytes are not all there yet, else the length. */
function completeUpTo(bytes: Buffer): number {
  for (let back = 1; back <= 3 && back <= bytes.length; back++) {
    const byte = bytes[bytes.length - back]!
    if (byte < 0x80) return bytes.length
    if (byte >= 0xC0) {
      const length = byte >= 0xF0 ? 4 : byte >= 0xE0 ? 3 : 2
      return length > back ? bytes.length - back : bytes.length
    }
  }
  return bytes.length
}

/** Checks that a compressed file's first bytes are of its kind (gzip's or zip's signature). */
export function checkCompressed(compression: 'gzip' | 'zip', head: Uint8Array) {
  if (compression === 'gzip' && !startsWith(head, [0x1F, 0x8B])) throw new UnreadableFile('This file is named .gz but is not gzip-compressed. Upload the table itself, or compress it again.', 415)
  if (compression === 'zip' && !startsWith(head, [0x50, 0x4B, 0x03, 0x04]) && !startsWith(head, [0x50, 0x4B, 0x05, 0x06])) {
    throw new UnreadableFile('This file is named .zip but is not a zip archive. Upload the table itself, or compress it again.', 415)
  }
}

/** Checks that the first bytes fit the promised format; a spreadsheet renamed .csv or a binary file is refused. */
export function checkContent(format: DatasetFormat, head: Uint8Array) {
  const isZip = startsWith(head, [0x50, 0x4B, 0x03, 0x04])
  if (format === 'xlsx') {
    if (!isZip) throw new UnreadableFile('This file is named .xlsx but is not an Excel workbook. Save it again from the spreadsheet program as .xlsx, or export it as CSV.', 415)
    return
  }
  if (isZip) throw new UnreadableFile('This file is a compressed archive or a workbook, not text. Upload workbooks with the .xlsx extension.', 415)
  // Checked before UTF-16, whose mark begins UTF-32 little-endian's.
  if (UTF32_MARKS.some(mark => startsWith(head, mark))) {
    throw new UnreadableFile('This file is UTF-32 text, which Mantissa does not read. Save it again as UTF-8 (or UTF-16) and upload it.', 415)
  }
  const { encoding } = detectEncoding(head)
  if (encoding.startsWith('utf-16')) return
  const controls = head.reduce((n, b) => n + (b === 0 || (b < 0x09) || (b > 0x0D && b < 0x20 && b !== 0x1B) ? 1 : 0), 0)
  if (controls > Math.max(2, head.length * 0.01)) {
    throw new UnreadableFile('This file looks binary, not text. Export the data as CSV, TSV, JSON or an Excel workbook.', 415)
  }
}
