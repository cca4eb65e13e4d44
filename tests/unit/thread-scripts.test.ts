import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { threadScripts } from '../../server/build/thread-scripts'

describe('thread scripts', () => {
  it('hands the bundled thread code over in a form the server build cannot rewrite', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'thread-script-'))
    const entry = join(dir, 'entry.ts')
    writeFileSync(entry, 'export const where: string = typeof window === "undefined" ? "node" : "browser"\n')
    const plugin = threadScripts(dir)
    const id = (plugin.resolveId as (s: string, i: string) => string)(`thread-script:./entry`, join(dir, 'importer.ts'))
    const module = await (plugin.load as (this: unknown, id: string) => Promise<string>).call({ addWatchFile() {} }, id)
    // Nitro replaces `typeof window` in the server bundle; it must not find it here.
    expect(module).not.toContain('typeof window')
    const source = new Function('Buffer', `${module.replace('export default', 'return')}`)(Buffer) as string
    expect(source).toContain('typeof window === "undefined"')
    const loaded = { exports: {} as Record<string, unknown> }
    new Function('exports', 'module', source)(loaded.exports, loaded)
    expect(loaded.exports.where).toBe('node')
  })
})
