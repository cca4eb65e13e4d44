import { createReadStream } from 'node:fs'

export const FORMATS = ['csv', 'tsv', 'xlsx', 'json'] as const
export type DatasetFormat = typeof FORMATS[number]
export type TextEncoding = 'utf-8' | 'utf-16le' | 'utf-16be' | 'windows-1252'

const EXTENSIONS: Record<string, DatasetFormat> = { csv: 'csv', txt: 'csv', tsv: 'tsv', tab: 'tsv', xlsx: 'xlsx', json: 'json' }

export class UnreadableFile extends Error {
  constructor(message: string, readonly status: 415 | 422 = 422) {
    super(message)
  }
}

/** The format a file name promises; refuses names Mantissa cannot read. */
export function formatFromName(name: string): DatasetFormat {
  const extension = name.toLowerCase().match(/\.([a-z0-9]+)$/)?.[1] ?? ''
  const format = EXTENSIONS[extension]
  if (!format) {
    throw new UnreadableFile(`Mantissa reads .csv, .tsv, .txt, .xlsx and .json files; "${extension ? `.${extension}` : 'no extension'}" is not one of them.`, 415)
  }
  return format
}

function startsWith(head: Uint8Array, bytes: number[]) {
  return bytes.every((b, i) => head[i] === b)
}

/** Text encoding from the byte-order mark, else UTF-8 when the start decodes cleanly, else Latin-1 (Windows-1252). */
export function detectEncoding(head: Uint8Array): { encoding: TextEncoding, bomLength: number } {
  if (startsWith(head, [0xEF, 0xBB, 0xBF])) return { encoding: 'utf-8', bomLength: 3 }
  if (startsWith(head, [0xFF, 0xFE])) return { encoding: 'utf-16le', bomLength: 2 }
  if (startsWith(head, [0xFE, 0xFF])) return { encoding: 'utf-16be', bomLength: 2 }
  // A multi-byte character may be cut at the end of the sample: leave its last bytes out of the check.
  const sample = head.subarray(0, Math.max(0, head.length - 3))
  try {
    new TextDecoder('utf-8', { fatal: true }).decode(sample)
    return { encoding: 'utf-8', bomLength: 0 }
  }
  catch {
    return { encoding: 'windows-1252', bomLength: 0 }
  }
}

/**
 * The encoding of a whole stored text file: detectEncoding on its first bytes, except that a file
 * whose start reads as UTF-8 but holds invalid bytes further on (a Latin-1 accent first met on
 * row 5,000) is Latin-1. One streamed pass over the file, never held in memory.
 */
export async function detectFileEncoding(path: string, head: Uint8Array): Promise<{ encoding: TextEncoding, bomLength: number }> {
  const detected = detectEncoding(head)
  if (detected.encoding !== 'utf-8' || detected.bomLength > 0) return detected
  const decoder = new TextDecoder('utf-8', { fatal: true })
  try {
    for await (const chunk of createReadStream(path, { highWaterMark: 1 << 20 })) decoder.decode(chunk as Buffer, { stream: true })
    decoder.decode()
    return detected
  }
  catch {
    return { encoding: 'windows-1252', bomLength: 0 }
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
  const { encoding } = detectEncoding(head)
  if (encoding.startsWith('utf-16')) return
  const controls = head.reduce((n, b) => n + (b === 0 || (b < 0x09) || (b > 0x0D && b < 0x20 && b !== 0x1B) ? 1 : 0), 0)
  if (controls > Math.max(2, head.length * 0.01)) {
    throw new UnreadableFile('This file looks binary, not text. Export the data as CSV, TSV, JSON or an Excel workbook.', 415)
  }
}
