import type { BlockDiffDTO, BlockHistoryDTO } from '#shared/types/history'
import type { BlockDTO } from '#shared/types/investigation'

/**
 * A block's kept versions, the difference between the two chosen (by default the newest and the
 * one before it), and restoring one as a new save.
 */
export function useBlockHistory(blockId: Ref<string>) {
  const history = useFetch<BlockHistoryDTO>(() => `/api/blocks/${blockId.value}/versions`, { key: computed(() => `block-history-${blockId.value}`) })
  const from = ref<number | null>(null)
  const to = ref<number | null>(null)
  watch(history.data, (dto) => {
    if (!dto) return
    const numbers = dto.versions.map(v => v.version)
    if (to.value === null || !numbers.includes(to.value)) to.value = numbers[0] ?? null
    if (from.value === null || !numbers.includes(from.value)) from.value = numbers[1] ?? numbers[0] ?? null
  }, { immediate: true })
  // Two versions to compare exist only once the history is in: until then there is nothing to ask.
  const requestFetch = useRequestFetch()
  const diff = useAsyncData(
    computed(() => `block-diff-${blockId.value}-${from.value}-${to.value}`),
    () => (from.value !== null && to.value !== null
      ? requestFetch<BlockDiffDTO>(`/api/blocks/${blockId.value}/diff`, { query: { from: from.value, to: to.value } })
      : Promise.resolve(null)),
  )

  /** Shows what one version changed: it against the version before it. */
  function showChangesOf(version: number) {
    const numbers = history.data.value?.versions.map(v => v.version) ?? []
    const earlier = numbers.find(n => n < version)
    from.value = earlier ?? version
    to.value = version
  }

  const { error, fields, busy, run } = useApiAction()
  const restored = ref<{ from: number, version: number } | null>(null)
  async function restore(version: number) {
    restored.value = null
    await run(async () => {
      const block = await $fetch<BlockDTO>(`/api/blocks/${blockId.value}/versions/${version}/restore`, { method: 'POST', body: { version: history.data.value!.version } })
      restored.value = { from: version, version: block.version }
      await history.refresh()
      showChangesOf(block.version)
    })
  }
  /** A removed block comes back through the document's own restore, with every version it had. */
  async function bringBack() {
    restored.value = null
    await run(async () => {
      await $fetch(`/api/blocks/${blockId.value}/restore`, { method: 'POST' })
      await history.refresh()
    })
  }
  const restoreError = computed(() => fields.value.version ?? error.value)

  return {
    history: history.data, historyError: history.error, diff: diff.data, diffPending: computed(() => diff.status.value === 'pending'),
    from, to, showChangesOf, restore, bringBack, restoring: busy, restoreError, restored,
  }
}
