import type { DatasetFilter } from '../schemas/dataset'
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
