import { createHash, randomUUID } from 'node:crypto'
import { createWriteStream } from 'node:fs'
import { mkdir, rm } from 'node:fs/promises'
import { join } from 'node:path'
import type { Readable } from 'node:stream'
import { Transform } from 'node:stream'
import { pipeline } from 'node:stream/promises'

export class TooLarge extends Error {}

export interface StoredFile {
  key: string
  sha256: string
  byteSize: number
  head: Buffer
}

/** Where the bytes live once their key is known: the file system or an S3 bucket. */
export interface FileDriver {
  /** Keeps a staged local file under `key`; leaves the staged file for the caller to remove. */
  put: (stagedPath: string, key: string) => Promise<void>
  /** The stored bytes from `start` to `end` (inclusive, or the end of the file). */
  open: (key: string, start?: number, end?: number) => Promise<Readable>
  exists: (key: string) => Promise<boolean>
  /** Removes the stored bytes; a missing key is not an error. */
  remove: (key: string) => Promise<void>
}

/** The file store the rest of the server sees, whichever driver keeps the bytes. */
export interface FileStore extends Omit<FileDriver, 'put'> {
  /** Streams `input` to storage while hashing it; refuses more than `limit` bytes (TooLarge). */
  save: (input: Readable, limit: number) => Promise<StoredFile>
}

const HEAD_BYTES = 64 * 1024

/** Content-addressed: identical files are stored once. */
export function keyOf(sha256: string): string {
  return `datasets/${sha256.slice(0, 2)}/${sha256}`
}

/**
 * Uploads stage in `stagingDir` on local disk while they are hashed and measured (the key is
 * their SHA-256, known only at the end), then go to the driver under that key.
 */
export function createFileStore(driver: FileDriver, stagingDir: string): FileStore {
  async function save(input: Readable, limit: number): Promise<StoredFile> {
    await mkdir(stagingDir, { recursive: true })
    const staged = join(stagingDir, randomUUID())
    const hash = createHash('sha256')
    let byteSize = 0
    const heads: Buffer[] = []
    let headLength = 0
    const meter = new Transform({
      transform(chunk: Buffer, _encoding, done) {
        byteSize += chunk.length
        if (byteSize > limit) return done(new TooLarge())
        if (headLength < HEAD_BYTES) {
          heads.push(chunk.subarray(0, HEAD_BYTES - headLength))
          headLength += Math.min(chunk.length, HEAD_BYTES - headLength)
        }
        hash.update(chunk)
        done(null, chunk)
      },
    })
    try {
      await pipeline(input, meter, createWriteStream(staged))
      const sha256 = hash.digest('hex')
      const key = keyOf(sha256)
      await driver.put(staged, key)
      return { key, sha256, byteSize, head: Buffer.concat(heads) }
    }
    finally {
      await rm(staged, { force: true })
    }
  }

  return { save, open: driver.open, exists: driver.exists, remove: driver.remove }
}
