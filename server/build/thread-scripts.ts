import { dirname, resolve } from 'node:path'
import { build } from 'esbuild'
import type { Plugin } from 'rollup'

const PREFIX = 'thread-script:'

/**
 * `import source from 'thread-script:./file'` gives the file, bundled with everything it imports,
 * as one CommonJS script for `new Worker(source, { eval: true })`. A worker file inside Nitro's
 * own bundle would share chunks with the server and start a second copy of it in the thread;
 * bundled apart, the thread holds only the code it runs (pure TypeScript and Node's built-ins).
 */
export function threadScripts(sharedDir: string): Plugin {
  return {
    name: 'mantissa-thread-scripts',
    resolveId(source, importer) {
      if (!source.startsWith(PREFIX) || !importer) return null
      return `\0${PREFIX}${resolve(dirname(importer), source.slice(PREFIX.length))}`
    },
    async load(id) {
      if (!id.startsWith(`\0${PREFIX}`)) return null
      const entry = id.slice(PREFIX.length + 1)
      const result = await build({
        entryPoints: [entry], resolveExtensions: ['.ts', '.js', '.mjs'],
        bundle: true, write: false, metafile: true, format: 'cjs', platform: 'node', target: 'node20',
        alias: { '#shared': sharedDir }, logLevel: 'silent',
      })
      for (const input of Object.keys(result.metafile.inputs)) this.addWatchFile(resolve(input))
      // As base64: the server bundle's own replacements (`typeof window`, `process.env.NODE_ENV`…)
      // would otherwise rewrite the thread's code inside a plain string literal and could break it.
      return `export default Buffer.from(${JSON.stringify(Buffer.from(result.outputFiles[0]!.text).toString('base64'))}, 'base64').toString()`
    },
  }
}
