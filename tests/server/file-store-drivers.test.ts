import { createHash, randomBytes } from 'node:crypto'
import { createReadStream } from 'node:fs'
import { mkdtemp, readdir, rm, writeFile } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { buffer } from 'node:stream/consumers'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { fsDriver } from '../../server/utils/file-drivers/fs'
import { s3Driver } from '../../server/utils/file-drivers/s3'
import { TooLarge, createFileStore } from '../../server/utils/file-drivers/store'
import type { FileDriver, FileStore } from '../../server/utils/file-drivers/store'
import { startFakeS3 } from '../support/fake-s3'
import type { FakeS3 } from '../support/fake-s3'

// Past lib-storage's 5 MiB part size, so the s3 driver sends it as a multipart upload.
const SIZE = 6 * 1024 * 1024 + 12_345
const sha256 = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex')

let scratch: string
let bytes: Buffer
let source: string
let fake: FakeS3
beforeAll(async () => {
  scratch = await mkdtemp(join(tmpdir(), 'mantissa-file-store-'))
  bytes = randomBytes(SIZE)
  source = join(scratch, 'upload.bin')
  await writeFile(source, bytes)
  fake = await startFakeS3('store-test/')
})
afterAll(async () => {
  await fake?.stop()
  if (scratch) await rm(scratch, { recursive: true, force: true })
})

/** Where each driver really keeps a key, looked at from outside the driver. */
const drivers: { name: string, make: (staging: string) => FileDriver, storedKeys: () => Promise<string[]> }[] = [
  {
    name: 's3 (against s3rver)',
    make: () => s3Driver(fake.settings),
    storedKeys: () => fake.keys(),
  },
  {
    name: 'fs',
    make: () => fsDriver(join(scratch, 'fs-base')),
    storedKeys: async () => (await readdir(join(scratch, 'fs-base', 'datasets'), { recursive: true }).catch(() => []))
      .filter(path => path.includes('/')).map(path => `datasets/${path}`),
  },
]

describe.each(drivers)('file store, $name driver', ({ name, make, storedKeys }) => {
  let store: FileStore
  let staging: string
  const expectedKey = () => `datasets/${sha256(bytes).slice(0, 2)}/${sha256(bytes)}`
  const inStore = (key: string) => (name.startsWith('s3') ? `store-test/${key}` : key)

  beforeAll(async () => {
    staging = join(scratch, `staging-${name.slice(0, 2)}`)
    store = createFileStore(make(staging), staging)
  })

  it('saves a streamed file under its SHA-256 and reads it back whole and from an offset', async () => {
    const stored = await store.save(createReadStream(source, { highWaterMark: 64 * 1024 }), SIZE + 1)
    // Source: node:crypto over the same bytes, hashed here in one piece.
    expect(stored.sha256).toBe(sha256(bytes))
    expect(stored.byteSize).toBe(SIZE)
    expect(stored.key).toBe(expectedKey())
    expect(stored.head.equals(bytes.subarray(0, 64 * 1024))).toBe(true)
    expect(await storedKeys()).toEqual([inStore(stored.key)])
    expect(await readdir(staging), 'nothing left in staging').toEqual([])
    expect(await store.exists(stored.key)).toBe(true)

    expect(sha256(await buffer(await store.open(stored.key)))).toBe(sha256(bytes))
    const tail = await buffer(await store.open(stored.key, 3))
    expect(tail.length).toBe(SIZE - 3)
    expect(tail.equals(bytes.subarray(3))).toBe(true)
    expect((await buffer(await store.open(stored.key, 1000, 1099))).equals(bytes.subarray(1000, 1100))).toBe(true)
    // A file that is only a byte-order mark is read from just past its end.
    expect((await buffer(await store.open(stored.key, SIZE))).length).toBe(0)
  })

  it('keeps identical bytes once', async () => {
    const again = await store.save(createReadStream(source), SIZE)
    expect(again.key).toBe(expectedKey())
    expect(await storedKeys()).toEqual([inStore(expectedKey())])
  })

  it('refuses a file past the limit and keeps none of it', async () => {
    const other = Buffer.concat([bytes, Buffer.from('more')])
    const path = join(scratch, 'too-large.bin')
    await writeFile(path, other)
    await expect(store.save(createReadStream(path), SIZE)).rejects.toBeInstanceOf(TooLarge)
    expect(await storedKeys()).toEqual([inStore(expectedKey())])
    expect(await readdir(staging)).toEqual([])
  })

  it('fails to open a key it does not hold', async () => {
    const missing = `datasets/00/${'0'.repeat(64)}`
    expect(await store.exists(missing)).toBe(false)
    await expect(store.open(missing)).rejects.toThrow()
  })

  it('removes a stored file, and removing it again is no error', async () => {
    await store.remove(expectedKey())
    expect(await store.exists(expectedKey())).toBe(false)
    expect(await storedKeys()).toEqual([])
    await store.remove(expectedKey())
  })
})
