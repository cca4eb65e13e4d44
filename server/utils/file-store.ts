import { createHash, randomUUID } from 'node:crypto'
import { createWriteStream } from 'node:fs'
import { mkdir, rename, rm, stat } from 'node:fs/promises'
import { dirname, join, resolve } from 'node:path'
import type { Readable } from 'node:stream'
import { pipeline } from 'node:stream/promises'
import { Transform } from 'node:stream'

export class TooLarge extends Error {}

export interface StoredFile {
  key: string
  sha256: string
  byteSize: number
  head: Buffer
}

const HEAD_BYTES = 64 * 1024

/**
 * Original uploads, kept byte for byte under their SHA-256 (identical files are stored once).
 * The folder comes from runtime config (NUXT_STORAGE_BASE); several app servers share it
 * through a network file system.
 */
export function useFileStore() {
  const base = resolve(useRuntimeConfig().storage.base)
  const pathOf = (key: string) => join(base, key)

  /** Streams `input` to storage while hashing it; refuses more than `limit` bytes. */
  async function save(input: Readable, limit: number): Promise<StoredFile> {
    const incoming = pathOf(`incoming/${randomUUID()}`)
    await mkdir(dirname(incoming), { recursive: true })
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
      await pipeline(input, meter, createWriteStream(incoming))
    }
    catch (error) {
      await rm(incoming, { force: true })
      throw error
    }
    const sha256 = hash.digest('hex')
    const key = `datasets/${sha256.slice(0, 2)}/${sha256}`
    const target = pathOf(key)
    await mkdir(dirname(target), { recursive: true })
    if (await stat(target).then(() => true, () => false)) await rm(incoming, { force: true })
    else await rename(incoming, target)
    return { key, sha256, byteSize, head: Buffer.concat(heads) }
  }

  return { save, pathOf, remove: (key: string) => rm(pathOf(key), { force: true }) }
}
