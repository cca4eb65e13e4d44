import type { AnalysisRunDTO, BlockDTO } from '#shared/types/investigation'

/**
 * The result of one analysis block: the stored one when its settings were run before (no
 * recomputation on reopening), and the action that runs it on the server.
 */
export function useAnalysisBlock(block: Ref<BlockDTO>) {
  const settingsKey = computed(() => JSON.stringify(block.value.settings ?? {}))
  const { data, refresh } = useFetch<AnalysisRunDTO | null>(() => `/api/blocks/${block.value.id}/analysis`, {
    key: computed(() => `analysis-${block.value.id}-${settingsKey.value}`),
    watch: [settingsKey],
  })
  const running = ref(false)
  const error = ref('')
  const fields = ref<Record<string, string>>({})

  async function run() {
    running.value = true
    error.value = ''
    fields.value = {}
    try {
      // The server runs the settings it holds: choices still on their way to it must land first.
      await useDocumentStore().whenSaved(block.value.id)
      data.value = await $fetch<AnalysisRunDTO>(`/api/blocks/${block.value.id}/run`, { method: 'POST' })
    }
    catch (e) {
      ;({ message: error.value, fields: fields.value } = describeApiError(e))
    }
    finally {
      running.value = false
    }
  }
  return { outcome: data, run, running, error, fields, refresh }
}
