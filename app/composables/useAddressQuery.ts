/**
 * What a list keeps in the address (page and its choices), so that Back and reload come back to it:
 * `text(name)` reads one value, `setQuery` changes some (undefined removes one), `page` is from 1.
 */
export function useAddressQuery() {
  const route = useRoute()
  const router = useRouter()
  const text = (name: string) => (typeof route.query[name] === 'string' ? route.query[name] as string : undefined)
  const setQuery = (changes: Record<string, string | undefined>) => router.replace({ query: { ...route.query, ...changes } })
  const page = computed(() => Math.max(1, Number(text('page')) || 1))
  /** The page as the address writes it: the first page is no page at all. */
  const pageText = (next: number) => (next > 1 ? String(next) : undefined)
  return { text, setQuery, page, pageText }
}
