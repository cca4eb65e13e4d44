import { TEST_LABELS } from '../charts/labels'
import { describeFilters, describeGrouping } from '../charts/filters'
import type { SettingChange } from '../types/history'
import type { AnalysisSettings } from '../types/investigation'

/** The number shown as people write it, whole digits grouped ("10,000"). */
const formatNumber = (value: number) => value.toLocaleString('en-GB', { maximumFractionDigits: 10 })

const SIGN_WORDS: Record<NonNullable<AnalysisSettings['sign']>, string> = { positive: 'amounts above zero', negative: 'amounts below zero' }

/**
 * An analysis block's settings as a list of fields in words, in the order the settings form shows
 * them; `datasetTitles` names datasets by their title (an id nobody can read otherwise).
 */
export function settingsFields(settings: AnalysisSettings | null | undefined, datasetTitles: ReadonlyMap<string, string>): Omit<SettingChange, 'after' | 'changed'>[] {
  const s = settings ?? {}
  return [
    { field: 'dataset', label: 'Dataset', before: s.datasetId ? datasetTitles.get(s.datasetId) ?? 'a dataset no longer kept' : null },
    { field: 'column', label: 'Column', before: s.column ?? null },
    { field: 'test', label: 'Test', before: s.test ? TEST_LABELS[s.test] : null },
    { field: 'sign', label: 'Amounts', before: s.sign ? SIGN_WORDS[s.sign] : null },
    { field: 'filters', label: 'Rows kept', before: describeFilters(s.filters) },
    { field: 'grouping', label: 'Grouped by', before: describeGrouping(s.groupBy, s.period) },
    { field: 'threshold', label: 'Limit', before: s.threshold === undefined ? null : formatNumber(s.threshold) },
  ]
}

/** Every setting of two states side by side, each marked changed or not. */
export function settingsDiff(before: AnalysisSettings | null | undefined, after: AnalysisSettings | null | undefined, datasetTitles: ReadonlyMap<string, string>): SettingChange[] {
  const afterFields = settingsFields(after, datasetTitles)
  return settingsFields(before, datasetTitles).map((field, i) => {
    const next = afterFields[i]!.before
    return { ...field, after: next, changed: field.before !== next }
  })
}

/** Only the fields that changed, as "old → new" pairs (the audit trail's words). */
export function changedSettings(before: AnalysisSettings | null | undefined, after: AnalysisSettings | null | undefined, datasetTitles: ReadonlyMap<string, string>): SettingChange[] {
  return settingsDiff(before, after, datasetTitles).filter(field => field.changed)
}
