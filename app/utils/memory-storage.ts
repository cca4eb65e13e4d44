/**
 * A Web Storage that lives as long as the page: what a page gets in place of a storage the browser
 * refuses to open (see `plugins/storage-fallback.client.ts`).
 */
export function memoryStorage(): Storage {
  const items = new Map<string, string>()
  return {
    get length() {
      return items.size
    },
    key: index => [...items.keys()][index] ?? null,
    getItem: key => items.get(String(key)) ?? null,
    setItem: (key, value) => void items.set(String(key), String(value)),
    removeItem: key => void items.delete(String(key)),
    clear: () => items.clear(),
  }
}
