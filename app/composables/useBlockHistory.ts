import type { BlockDiffDTO, BlockHistoryDTO, RestoredBlockDTO } from '#shared/types/history'

/**
 * A block's kept versions, the difference between the two chosen (by default the newest and the
 * one before it), and restoring one as a new save.
 */
export function useBlockHistory(blockId: Ref<string>) {
  const history = useFetch<BlockHistoryDTO>(() => `/api/blocks/${blockId.value}/versions`, { key: computed(() => `block-history-${blockId.value}`) })
  // The two versions compared are the ones chosen, else the newest and the one before it. They are
  // worked out from the history, not set by a watcher, since watchers do not run while the server
  // renders: the server drew nothing compared and the browser's first render did not match it.
  const numbers = computed(() => history.data.value?.versions.map(v => v.version) ?? [])
  const chosen = ref<{ from: number | null, to: number | null }>({ from: null, to: null })
  const kept = (version: number | null) => version !== null && numbers.value.includes(version) ? version : null
  const from = computed({
    get: () => kept(chosen.value.from) ?? numbers.value[1] ?? numbers.value[0] ?? null,
    set: (version: number | null) => { chosen.value = { ...chosen.value, from: version } },
  })
  const to = computed({
    get: () => kept(chosen.value.to) ?? numbers.value[0] ?? null,
    set: (version: number | null) => { chosen.value = { ...chosen.value, to: version } },
  })
  // One key for the block's comparison, so the server's answer is the browser's first one: a key
  // naming the versions would name none while the server starts, before the history is in.
  const requestFetch = useRequestFetch()
  const diff = useAsyncData(
    computed(() => `block-diff-${blockId.value}`),
    async () => {
      await history
      return from.value !== null && to.value !== null
        ? requestFetch<BlockDiffDTO>(`/api/blocks/${blockId.value}/diff`, { query: { from: from.value, to: to.value } })
        : null
    },
    { watch: [from, to] },
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
      const block = await $fetch<RestoredBlockDTO>(`/api/blocks/${blockId.value}/versions/${version}/restore`, { method: 'POST', body: { version: history.data.value!.version } })
      restored.value = { from: version, version: block.version }
      // The answer names the version the restore added: it heads the list, and the block now stands at it.
      const kept = history.data.value
      if (kept) history.data.value = { ...kept, label: block.label, version: block.version, versions: [block.saved, ...kept.versions.filter(v => v.version !== block.saved.version)] }
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
