import { PassThrough, Transform } from 'node:stream'
import type { Readable } from 'node:stream'
import yauzl from 'yauzl'
import { UnreadableFile } from './sniff'

/**
 * Zip archives in file storage (workbooks, zipped tables), read through their central directory with
 * ranged reads of the store, every entry inflated as a stream and refused past a limit, so a small
 * archive made to inflate into gigabytes (a "zip bomb") never reaches memory.
 */

/** Reads bytes `start` to `end` (inclusive) of the stored file. */
export type RangeOpener = (start: number, end?: number) => Promise<Readable>

/** Entries an archive may list (a workbook has a few dozen). */
export const ARCHIVE_ENTRIES = 10_000

/** Why an archive is refused, worded by the reader that opened it. */
export interface ArchiveWords {
  damaged: string
  tooBig: (what: string) => UnreadableFile
}

/** The stored file as yauzl's random-access source: each read is a ranged read of the store. */
class StoredFile extends yauzl.RandomAccessReader {
  constructor(private readonly open: RangeOpener, private readonly counted: (bytes: number) => void) {
    super()
  }

  override _readStreamForRange(start: number, end: number): Readable {
    const out = new PassThrough()
    this.open(start, end - 1).then((input) => {
      input.on('data', (chunk: Buffer) => this.counted(chunk.length))
      input.on('error', error => out.destroy(error))
      input.pipe(out)
    }, error => out.destroy(error))
    return out
  }
}

/**
 * Counts inflated bytes and refuses past `limit`. With `tagGap`, also refuses a run of more bytes
 * than that without a '<': an XML parser gathers a node's text until its end tag, so a gigabyte
 * without a tag would be held whole.
 */
export function limited(limit: number, refuse: () => UnreadableFile, tagGap?: { bytes: number, refuse: () => UnreadableFile }): Transform {
  let inflated = 0
  let sinceTag = 0
  return new Transform({
    transform(chunk: Buffer, _encoding, done) {
      inflated += chunk.length
      if (inflated > limit) return done(refuse())
      if (tagGap) {
        let at = chunk.indexOf(0x3C)
        if (at < 0) sinceTag += chunk.length
        else {
          if (sinceTag + at > tagGap.bytes) return done(tagGap.refuse())
          let last = at
          while ((at = chunk.indexOf(0x3C, last + 1)) >= 0) {
            if (at - last > tagGap.bytes) return done(tagGap.refuse())
            last = at
          }
          sinceTag = chunk.length - last
        }
        if (sinceTag > tagGap.bytes) return done(tagGap.refuse())
      }
      done(null, chunk)
    },
  })
}

/** An archive opened from file storage, its entries by name; close the zip when done. */
export async function openArchive(open: RangeOpener, size: number, counted: (bytes: number) => void, words: ArchiveWords): Promise<{ zip: yauzl.ZipFile, entries: Map<string, yauzl.Entry> }> {
  let zip: yauzl.ZipFile
  try {
    zip = await yauzl.fromRandomAccessReaderPromise(new StoredFile(open, counted), size, { lazyEntries: true, autoClose: false, validateEntrySizes: true, strictFileNames: false })
  }
  catch {
    throw new UnreadableFile(words.damaged)
  }
  try {
    if (zip.entryCount > ARCHIVE_ENTRIES) throw words.tooBig('list of parts')
    const entries = new Map<string, yauzl.Entry>()
    try {
      for await (const entry of zip.eachEntry()) entries.set(entry.fileName, entry)
    }
    catch {
      throw new UnreadableFile(words.damaged)
    }
    return { zip, entries }
  }
  catch (error) {
    zip.close()
    throw error
  }
}

/**
 * One entry, inflating as it is read, through `limiter` (yauzl also holds it to the size the directory
 * gives). An entry that inflates past that size, or whose deflated bytes are broken, ends the read with
 * `damaged`: an archive that lies about its sizes is refused like any other damaged one, never as a fault of the server.
 */
export async function inflate(zip: yauzl.ZipFile, entry: yauzl.Entry, limiter: Transform, damaged: string): Promise<Readable> {
  const inflating = await zip.openReadStreamPromise(entry)
  inflating.on('error', error => limiter.destroy(error instanceof UnreadableFile ? error : new UnreadableFile(damaged)))
  limiter.on('error', () => inflating.destroy())
  return inflating.pipe(limiter)
}
