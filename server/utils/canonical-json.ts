/**
 * The JSON text that equal values share whatever order their keys were written in: object keys
 * sorted by code unit (the same on every machine, unlike a locale's order; integer-like keys come
 * first, in numeric order, as JavaScript orders them), keys whose value is undefined left out (as
 * JSON.stringify does, so an absent setting and an undefined one are the same), arrays in their order.
 * The analysis cache keys hash it, and a save compares settings with it.
 */
export function canonicalJson(value: unknown): string {
  return JSON.stringify(value, (_key, v: unknown) => v && typeof v === 'object' && !Array.isArray(v)
    ? Object.fromEntries(Object.keys(v).sort().map(key => [key, (v as Record<string, unknown>)[key]]))
    : v)
}
