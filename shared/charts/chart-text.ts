import type { TestResult } from '../digits'
import type { AnalysisSettings } from '../types/investigation'
import { TEST_LABELS } from './labels'
import { expectation, legendItems } from './legend'
import type { LegendItem } from './legend'
import { summarize } from './summary'
import { describeFilters, describeGrouping } from './filters'

/** The dataset a chart was drawn from, as far as a reader needs it to find the same file. */
export interface ChartSource {
  title: string
  /** Who provided it and how (the dataset's source note). */
  sourceNote: string | null
  sha256: string
  obtainedOn: string | null
  /** The earliest and latest date in the dataset's date column, when it has one. */
  period?: { column: string, from: string, to: string } | null
}

/** Every word that travels with a chart: on the page, in its image files and in its embed. */
export interface ChartText {
  title: string
  subtitle: string
  legend: LegendItem[]
  summary: string
  source: string
  caution: string
}

/** A column as far as its dates go; `dates` is the import's reading of a date column, where it has one. */
interface DatedColumn {
  name: string
  kind: string
  dates?: { first: string | null, last: string | null } | null
}

/** The dataset's date range: the first and last date of its first date column that was read as dates. */
export function periodOf(columns: readonly DatedColumn[]): ChartSource['period'] {
  const column = columns.find(c => c.kind === 'date' && c.dates?.first && c.dates.last)
  return column ? { column: column.name, from: column.dates!.first!, to: column.dates!.last! } : null
}

const count = (n: number) => n.toLocaleString('en-GB')

function day(iso: string): string {
  const date = new Date(`${iso.slice(0, 10)}T00:00:00Z`)
  return Number.isNaN(date.getTime()) ? iso : date.toLocaleDateString('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' })
}

/** The settings that narrowed or split the tested values, in words ("" when none did). */
export function describeSelection(settings: AnalysisSettings, result: TestResult): string {
  const parts: string[] = []
  if (settings.filters?.length) parts.push(`only rows where ${describeFilters(settings.filters)}`)
  if (settings.groupBy) parts.push(`grouped by ${describeGrouping(settings.groupBy, settings.period)}`)
  if (result.sign === 'negative') parts.push('negative amounts, tested apart')
  if (result.threshold) parts.push(`limit ${result.threshold.limit}`)
  return parts.join(' · ')
}

/** The source line: dataset title, who provided it, when it was obtained, and its fingerprint. */
export function sourceLine(source: ChartSource | null): string {
  if (!source) return 'Source: the dataset’s details could not be read.'
  const provided = source.sourceNote?.trim() ? ` ${source.sourceNote.trim().replace(/\.?$/, '.')}` : ''
  const obtained = source.obtainedOn ? ` Obtained ${day(source.obtainedOn)}.` : ''
  return `Source: “${source.title}”.${provided}${obtained} File SHA-256 ${source.sha256}.`
}

/**
 * The words around a chart. The summary is issue-14's `summarize` unless a frozen one is given
 * (a published page keeps the sentence it was published with).
 */
export function chartText(result: TestResult, settings: AnalysisSettings, source: ChartSource | null, frozenSummary?: string): ChartText {
  const values = result.test === 'summation' || result.test === 'duplicates' || result.test === 'round-numbers' || result.test === 'threshold' ? 'amounts' : 'values'
  const subtitle = [
    `n = ${count(result.n)} ${values} tested`,
    source?.period ? `dataset dated ${day(source.period.from)} to ${day(source.period.to)} (“${source.period.column}”)` : '',
    describeSelection(settings, result),
  ].filter(Boolean).join(' · ')
  return {
    title: [`${TEST_LABELS[result.test]} of “${result.column ?? 'the column'}”`, expectation(result.test).against].filter(Boolean).join(', '),
    subtitle,
    legend: legendItems(result),
    summary: frozenSummary ?? summarize(result),
    source: sourceLine(source),
    caution: result.caution,
  }
}
