import type { TestResult } from '../digits'
import type { AnalysisSettings } from '../types/investigation'
import { chartData } from '../charts/digit-chart'
import { describeFilter } from '../charts/filters'
import type { ChartSource } from '../charts/chart-text'
import { toCsv } from './csv'

export const CHART_CSV_HEADER = [
  'dataset', 'dataset_sha256', 'test', 'column', 'sign', 'filters', 'grouped_by', 'n',
  'row_kind', 'bin', 'count', 'share', 'expected_share', 'expected_count', 'range_low', 'range_high', 'z', 'outside_range',
  'group', 'group_n', 'group_mad', 'group_p', 'group_q',
] as const

/**
 * The numbers behind a chart as CSV. Every row names the dataset, its SHA-256, the test and the
 * settings that selected the values, so a row still says where it came from once it is pasted
 * elsewhere. Bin rows come first; a grouped test adds one row per ranked group.
 */
export function chartCsv(result: TestResult, settings: AnalysisSettings, source: ChartSource | null): string {
  const context = [
    source?.title ?? '', source?.sha256 ?? '', result.test, result.column ?? '', result.sign,
    (settings.filters ?? []).map(describeFilter).join(' and '), settings.groupBy ?? '', result.n,
  ]
  const none = ['', '', '', '', '']
  const bins = chartData(result).map(r => [...context, 'bin', r.key, r.count, r.share, r.expectedShare, r.expectedCount, r.low, r.high, r.z, r.outside ? 'yes' : 'no', ...none])
  const groups = (result.groups ?? []).map(g => [...context, 'group', '', '', '', '', '', '', '', '', '', g.key, g.n, g.mad, g.p, g.q])
  return toCsv([[...CHART_CSV_HEADER], ...bins, ...groups])
}
