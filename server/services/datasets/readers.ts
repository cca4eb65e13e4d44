import { Transform } from 'node:stream'
import { StringDecoder } from 'node:string_decoder'
import { pipeline } from 'node:stream/promises'
import type { Readable } from 'node:stream'
import Papa from 'papaparse'
import Parser from 'stream-json/Parser.js'
import StreamArray from 'stream-json/streamers/StreamArray.js'
import { UnreadableFile } from './sniff'
import { storable } from './storable-text'
import { workbookRows } from './workbook'
import type { RangeOpener } from './workbook'
import type { DatasetFormat, TextEncoding } from './sniff'
import { MixedTextDecoder } from './mixed-text'

/** Rows of a file as text cells, header first, in batches; streams, never holds the file. */
export interface RowSource {
  rows: AsyncIterable<string[][]>
  /** Known once the first rows were read; `sheets`: a workbook's sheets, in its order. */
  meta: { delimiter: string | null, sheets: string[] | null }
  /** How far into the file reading has come. */
  bytesRead: () => number
}

const PAUSE_AT = 2000
const PIECE = 1 << 16
const JSON_HEADER_SAMPLE = 1000

/**
 * Node's StringDecoder reads UTF-8 and UTF-16LE about twice as fast as a streaming TextDecoder,
 * which remains for the encodings it lacks (its "latin1" is not windows-1252).
 */
function textDecoder(encoding: TextEncoding): { write: (chunk: Buffer) => string, end: () => string } {
  if (encoding === 'utf-8' || encoding === 'utf-16le') return new StringDecoder(encoding === 'utf-8' ? 'utf8' : 'utf16le')
  if (encoding === 'utf-8+windows-1252') return new MixedTextDecoder()
  const decoder = new TextDecoder(encoding)
  return { write: chunk => decoder.decode(chunk, { stream: true }), end: () => decoder.decode() }
}

/**
 * Decodes bytes to strings, so a character split between two chunks is never cut in half. With
 * `oneLineEnd`, CRLF becomes LF: the CSV parser takes the line end of the first row for the whole
 * file, and a file edited on two systems (CRLF rows, then LF rows) read its LF rows as one cell.
 * A CR at the end of a chunk waits for the next, which may start with its LF.
 */
function decoding(encoding: TextEncoding, oneLineEnd: boolean) {
  const decoder = textDecoder(encoding)
  let held = ''
  const lines = (text: string) => (oneLineEnd ? text.replaceAll('\r\n', '\n') : text)
  return new Transform({
    readableObjectMode: true,
    transform(chunk: Buffer, _encoding, done) {
      let text = held + storable(decoder.write(chunk))
      held = ''
      if (oneLineEnd && text.endsWith('\r')) {
        held = '\r'
        text = text.slice(0, -1)
      }
      // The parser hands over the rows of each piece at once: small pieces keep the rows waiting
      // for the import few, and young enough to be collected cheaply (1 MB pieces cost a third more time).
      text = lines(text)
      for (let at = 0; at < text.length; at += PIECE) this.push(text.slice(at, at + PIECE))
      done()
    },
    flush(done) {
      done(null, lines(held + storable(decoder.end())))
    },
  })
}

async function* delimitedRows(input: Readable, format: 'csv' | 'tsv', meta: RowSource['meta']) {
  const queue: string[][] = []
  let finished = false
  let failure: Error | null = null
  let wake: (() => void) | null = null
  let read = 0
  const notify = () => wake?.()

  // Rows come a decoded chunk at a time: a callback per row costs the parser a result object and a
  // filter call for each. The text stream itself is paused while the import catches up.
  Papa.parse<string[]>(input as unknown as File, {
    delimiter: format === 'tsv' ? '\t' : '',
    skipEmptyLines: true,
    chunk(result, handle) {
      meta.delimiter ??= result.meta.delimiter
      const quoteError = result.errors.find(e => e.code === 'MissingQuotes')
      if (quoteError) {
        failure = new UnreadableFile(`The file ends inside a quoted cell that is never closed (row ${read + (quoteError.row ?? result.data.length) + 1}). It may have been cut off during download or export.`)
        handle.abort()
      }
      else {
        for (const row of result.data) queue.push(row)
        read += result.data.length
        if (queue.length >= PAUSE_AT) input.pause()
      }
      notify()
    },
    complete() {
      finished = true
      notify()
    },
    error(error) {
      failure = error
      notify()
    },
  })

  while (true) {
    if (queue.length) {
      const batch = queue.splice(0)
      if (input.isPaused() && !failure) input.resume()
      yield batch
      continue
    }
    if (failure) throw failure
    if (finished) return
    await new Promise<void>((resolve) => {
      wake = resolve
    })
    wake = null
  }
}

/**
 * A number's text as the file wrote it, kept apart from strings: the parser's number tokens become
 * strings that start with this mark (and a string that starts with it gets it twice), so 12.50 stays
 * 12.50, 1e400 is not Infinity, and a number inside a nested value is not written back as a string.
 */
const NUMBER_MARK = '\0'

function markingNumbers(): Transform {
  return new Transform({
    objectMode: true,
    transform(token: { name: string, value?: string }, _encoding, done) {
      if (token.name === 'numberValue') done(null, { name: 'stringValue', value: NUMBER_MARK + token.value })
      else if (token.name === 'stringValue' && token.value!.startsWith(NUMBER_MARK)) done(null, { name: 'stringValue', value: NUMBER_MARK + token.value })
      else done(null, token)
    },
  })
}

/** A parsed string: a number's text (marked), or a string as the file had it. */
function unmarked(text: string): { number: boolean, text: string } {
  if (!text.startsWith(NUMBER_MARK)) return { number: false, text }
  const rest = text.slice(1)
  return rest.startsWith(NUMBER_MARK) ? { number: false, text: rest } : { number: true, text: rest }
}

/** A nested value as JSON, its numbers as the file wrote them. */
function nestedJson(value: unknown): string {
  if (typeof value === 'string') {
    const { number, text } = unmarked(value)
    return number ? text : JSON.stringify(text)
  }
  if (Array.isArray(value)) return `[${value.map(nestedJson).join(',')}]`
  if (value && typeof value === 'object') return `{${Object.entries(value).map(([key, item]) => `${JSON.stringify(key)}:${nestedJson(item)}`).join(',')}}`
  return JSON.stringify(value)
}

/** A value as a cell's text: a string or a number as written, a nested value as JSON. */
function jsonCellText(value: unknown): string {
  if (value === null || value === undefined) return ''
  if (typeof value === 'string') return storable(unmarked(value).text)
  if (typeof value === 'boolean') return String(value)
  try {
    return storable(nestedJson(value))
  }
  catch (error) {
    if (!(error instanceof RangeError)) throw error
    throw new UnreadableFile('A value in this JSON file is nested too deeply to show as a cell. A JSON dataset must be an array of flat records, like [{"vendor": "…", "amount": 120.5}, …].')
  }
}

async function* jsonRows(input: Readable) {
  const records = StreamArray.make()
  // pipeline hands a failure of any stage (a parse error) to the records being read.
  pipeline(input, new Parser({ streamValues: false }), markingNumbers(), records).catch(error => records.destroy(error))
  const sample: Record<string, unknown>[] = []
  let header: string[] | null = null
  let index: Map<string, number> = new Map()
  // A key that is not a column (the columns are the keys of the first records) is kept past them as
  // "key: value", so the import stores the record as a ragged row: listed by number, nothing dropped.
  const toCells = (record: Record<string, unknown>) => {
    const cells = Array.from({ length: header!.length }, () => '')
    for (const [key, value] of Object.entries(record)) {
      const at = index.get(key)
      if (at === undefined) cells.push(`${storable(key)}: ${jsonCellText(value)}`)
      else cells[at] = jsonCellText(value)
    }
    return cells
  }
  const start = function* () {
    const keys = new Set<string>()
    for (const record of sample) for (const key of Object.keys(record)) keys.add(key)
    header = [...keys]
    index = new Map(header.map((key, i) => [key, i]))
    yield header.map(storable)
    for (const record of sample) yield toCells(record)
  }
  try {
    for await (const { value } of records as AsyncIterable<{ value: unknown }>) {
      if (!value || typeof value !== 'object' || Array.isArray(value)) {
        throw new UnreadableFile('A JSON dataset must be an array of records, like [{"vendor": "…", "amount": 120.5}, …].')
      }
      if (header) yield toCells(value as Record<string, unknown>)
      else {
        sample.push(value as Record<string, unknown>)
        if (sample.length === JSON_HEADER_SAMPLE) yield* start()
      }
    }
  }
  catch (error) {
    if (error instanceof UnreadableFile) throw error
    throw new UnreadableFile(`This JSON file cannot be read: ${(error as Error).message.split('\n')[0]!.replace(/\.$/, '')}. A JSON dataset must be one complete array of records.`)
  }
  if (!header) yield* start()
}

const BATCH = 1000

/** Groups rows so that the import awaits once per batch, not once per row. */
async function* inBatches(rows: AsyncIterable<string[]>): AsyncIterable<string[][]> {
  let batch: string[][] = []
  for await (const row of rows) {
    batch.push(row)
    if (batch.length === BATCH) {
      yield batch
      batch = []
    }
  }
  if (batch.length) yield batch
}

/**
 * Ends the rows with the stored file's error (a dropped connection to the store) instead of
 * waiting for the parser, which does not hear of it, and lets go of the file once the rows stop.
 */
async function* untilFailure<T>(file: Readable, rows: AsyncIterable<T>): AsyncIterable<T> {
  let failure: Error | null = null
  let stop: ((error: Error) => void) | null = null
  file.once('error', (error: Error) => {
    failure = error
    stop?.(error)
  })
  const iterator = rows[Symbol.asyncIterator]()
  try {
    while (true) {
      if (failure) throw failure
      // A fresh promise per batch: racing each batch against one long-lived promise kept every
      // batch reachable from it until the import ended (a 1M-row import grew by 480 MB).
      const next = await new Promise<IteratorResult<T>>((resolve, reject) => {
        stop = reject
        iterator.next().then(resolve, reject)
      })
      stop = null
      if (next.done) return
      yield next.value
    }
  }
  finally {
    file.destroy()
  }
}

/** Where a stored file is read from: ranged reads of its bytes, its size, and for a workbook the sheet to read. */
export interface StoredSource {
  open: RangeOpener
  byteSize: number
  /** The sheet of a workbook; null reads the first visible one. */
  sheet: string | null
}

/** Opens a stored file as rows of text cells, whatever its format. */
export function openRows(format: DatasetFormat, stored: StoredSource, encoding: TextEncoding, bomLength: number): RowSource {
  const meta: RowSource['meta'] = { delimiter: null, sheets: null }
  let bytesRead = 0
  if (format === 'xlsx') {
    // The workbook reader makes ranged reads of its own (the archive's directory is at its end).
    const rows = workbookRows(stored.open, stored.byteSize, stored.sheet, (bytes) => {
      bytesRead += bytes
    }, (sheets) => {
      meta.sheets = sheets
    })
    return { rows, meta, bytesRead: () => bytesRead }
  }
  const file = new Transform({
    highWaterMark: 1 << 20,
    transform(chunk: Buffer, _encoding, done) {
      bytesRead += chunk.length
      done(null, chunk)
    },
  })
  stored.open(bomLength).then(input => pipeline(input, file)).catch(error => file.destroy(error))
  const text = () => file.pipe(decoding(encoding, format !== 'json'))
  const rows = format === 'json' ? inBatches(jsonRows(text())) : delimitedRows(text(), format, meta)
  return { rows: untilFailure(file, rows), meta, bytesRead: () => bytesRead }
}
