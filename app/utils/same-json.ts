/** Deep equality of JSON values whatever their key order (PostgreSQL's jsonb hands keys back in its own). */
export function sameJson(a: unknown, b: unknown): boolean {
  if (a === b) return true
  if (Array.isArray(a) || Array.isArray(b)) {
    return Array.isArray(a) && Array.isArray(b) && a.length === b.length && a.every((item, i) => sameJson(item, b[i]))
  }
  if (!a || !b || typeof a !== 'object' || typeof b !== 'object') return false
  const keys = (value: object) => Object.keys(value).filter(k => (value as Record<string, unknown>)[k] !== undefined).sort()
  const [ka, kb] = [keys(a), keys(b)]
  return ka.length === kb.length && ka.every((k, i) => k === kb[i] && sameJson((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k]))
}
