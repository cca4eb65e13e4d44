import { join, resolve } from 'node:path'
import { createFileStore } from './file-drivers/store'
import type { FileStore } from './file-drivers/store'
import { fsDriver } from './file-drivers/fs'
import { s3Driver } from './file-drivers/s3'

let store: FileStore | undefined

/**
 * Original uploads, kept byte for byte under their SHA-256 (identical files are stored once).
 * Runtime config chooses where (NUXT_STORAGE_DRIVER): a folder (`fs`, NUXT_STORAGE_BASE), which
 * several app servers share through a network file system, or an S3 bucket (`s3`). Uploads stage
 * in the folder's `incoming/` either way.
 */
export function useFileStore(): FileStore {
  if (store) return store
  const { driver, base, ...s3 } = useRuntimeConfig().storage
  const folder = resolve(base)
  if (driver !== 'fs' && driver !== 's3') throw new Error(`NUXT_STORAGE_DRIVER must be "fs" or "s3", not "${driver}".`)
  store = createFileStore(driver === 's3' ? s3Driver(s3) : fsDriver(folder), join(folder, 'incoming'))
  return store
}
