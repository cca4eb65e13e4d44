import { mkdir, open, rename, rm, stat } from 'node:fs/promises'
import { dirname, join } from 'node:path'
import type { FileDriver } from './store'

/** Files under one folder, which several app servers share through a network file system. */
export function fsDriver(base: string): FileDriver {
  const pathOf = (key: string) => join(base, key)
  const exists = (key: string) => stat(pathOf(key)).then(() => true, () => false)
  return {
    async put(stagedPath, key) {
      if (await exists(key)) return
      await mkdir(dirname(pathOf(key)), { recursive: true })
      // The staging folder sits inside `base`, so this is a rename on one file system.
      await rename(stagedPath, pathOf(key))
    },
    async open(key, start = 0, end) {
      const handle = await open(pathOf(key))
      return handle.createReadStream({ start, end, highWaterMark: 1 << 20 })
    },
    exists,
    remove: key => rm(pathOf(key), { force: true }),
  }
}
