import type { DatasetFilter } from '../schemas/dataset'
import { periodRange } from '../dates/read-date'
import type { Period } from '../dates/read-date'

const quoted = (values: readonly string[]) => values.map(v => `“${v}”`).join(', ')

/** One filter in words, as the settings line, the methodology appendix and a CSV download give it. */
export function describeFilter(filter: DatasetFilter): string {
  switch (filter.op) {
    case 'equals': return `${filter.column} is “${filter.value}”`
    case 'one-of': return filter.values.length === 1 ? `${filter.column} is “${filter.values[0]}”` : `${filter.column} is one of ${quoted(filter.values)}`
    case 'not-one-of': return filter.values.length === 1 ? `${filter.column} is not “${filter.values[0]}”` : `${filter.column} is none of ${quoted(filter.values)}`
    case 'between':
      if (filter.min !== undefined && filter.max !== undefined) return `${filter.column} is from ${filter.min} to ${filter.max}`
      return filter.min !== undefined ? `${filter.column} is at least ${filter.min}` : `${filter.column} is at most ${filter.max}`
    case 'dates':
      if (filter.from && filter.to) return `${filter.column} is from ${filter.from} to ${filter.to}`
      return filter.from ? `${filter.column} is on or after ${filter.from}` : `${filter.column} is on or before ${filter.to}`
  }
}

/** Every filter in words, joined as they apply: all at once. */
export function describeFilters(filters: readonly DatasetFilter[] | undefined): string | null {
  return filters?.length ? filters.map(describeFilter).join(' and ') : null
}

export const PERIOD_LABELS: Record<Period, string> = { year: 'year', quarter: 'quarter', month: 'month' }

/** The grouping in words: "vendor", or "month of paid_on". */
export function describeGrouping(groupBy: string | undefined, period: Period | undefined): string | null {
  if (!groupBy) return null
  return period ? `${PERIOD_LABELS[period]} of “${groupBy}”` : `“${groupBy}”`
}

/**
 * The settings of one group's own test, drilled into from a ranking: the same test without the
 * grouping, with one more filter that keeps the group's rows. Null for the group of texts that read
 * as no date, which no date range holds.
 */
export function settingsOfGroup<T extends { groupBy?: string, period?: Period, filters?: DatasetFilter[] }>(settings: T, group: string): T | null {
  if (!settings.groupBy) return null
  let filter: DatasetFilter
  if (settings.period) {
    const range = periodRange(group)
    if (!range) return null
    filter = { column: settings.groupBy, op: 'dates', ...range }
  }
  else filter = { column: settings.groupBy, op: 'one-of', values: [group] }
  return { ...settings, groupBy: undefined, period: undefined, filters: [...(settings.filters ?? []), filter] }
}
