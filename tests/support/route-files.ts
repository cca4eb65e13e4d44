import { readdirSync } from 'node:fs'
import { fileURLToPath } from 'node:url'

export const apiFolder = fileURLToPath(new URL('../../server/api/', import.meta.url))

// Nitro's file routing: `name.<method>.ts` answers that method only; a file without a method answers all.
const METHOD_SUFFIX = /^(.*)\.(get|post|put|patch|delete|head|options)$/

/**
 * A route file's path under server/api/ as the route Nitro serves from it, in the files' own
 * spelling: `datasets/[id]/archive.post.ts` → `POST /api/datasets/[id]/archive`,
 * `datasets/index.get.ts` → `GET /api/datasets`, the catch-all `[...].ts` → `ANY /api/[...]`.
 */
export function routeOf(file: string): string {
  const segments = file.replaceAll('\\', '/').replace(/\.ts$/, '').split('/')
  const last = segments.pop()!
  const match = METHOD_SUFFIX.exec(last)
  const [name, method] = match ? [match[1]!, match[2]!.toUpperCase()] : [last, 'ANY']
  if (name !== 'index') segments.push(name)
  return `${method} /api${segments.map(s => `/${s}`).join('')}`
}

/** Every route the files under server/api/ define, sorted. */
export function apiRoutes(): string[] {
  return readdirSync(apiFolder, { recursive: true, encoding: 'utf8' })
    .filter(file => file.endsWith('.ts'))
    .map(routeOf)
    .sort()
}
