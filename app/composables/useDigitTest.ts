import type { TestResult } from '#shared/digits'
import type { AnalysisSettings } from '#shared/types/investigation'

/** A digit test of a dataset run as `settings` say, outside any block (one group's own test, drilled into from a ranking). */
export function useDigitTest(settings: Ref<AnalysisSettings>) {
  const requestFetch = useRequestFetch()
  const { data, error, status } = useAsyncData<TestResult>(
    () => `group-result-${JSON.stringify(settings.value)}`,
    () => requestFetch<TestResult>(`/api/datasets/${settings.value.datasetId}/digit-tests`, {
      method: 'POST',
      body: { column: settings.value.column, test: settings.value.test, filters: settings.value.filters, threshold: settings.value.threshold, sign: settings.value.sign },
    }),
    { watch: [settings] },
  )
  return { result: data, error, pending: computed(() => status.value === 'pending') }
}
