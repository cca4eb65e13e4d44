import { createHash } from 'node:crypto'

/** JSON with object keys sorted and undefined keys left out: equal values give equal text, whatever order jsonb hands keys back in. */
export function canonicalJson(value: unknown): string {
  const canonical = (v: unknown): unknown => {
    if (Array.isArray(v)) return v.map(canonical)
    if (v && typeof v === 'object') {
      return Object.fromEntries(Object.keys(v).sort().filter(k => (v as Record<string, unknown>)[k] !== undefined)
        .map(k => [k, canonical((v as Record<string, unknown>)[k])]))
    }
    return v
  }
  return JSON.stringify(canonical(value) ?? null)
}

/** SHA-256 of the canonical JSON: the cache key of a result, and what an approval keeps of the settings it approved. */
export function fingerprintOf(value: unknown): string {
  return createHash('sha256').update(canonicalJson(value)).digest('hex')
}
