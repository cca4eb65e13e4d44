import type { TestResult } from '../digits'
import { PALETTE } from './palette'
import { TEST_LABELS } from './labels'

export interface ChartDatum {
  key: string
  count: number
  share: number
  expectedShare: number | null
  expectedCount: number | null
  low: number | null
  high: number | null
  lowShare: number | null
  highShare: number | null
  z: number | null
  outside: boolean
}

/** The numbers behind a chart, one row per bin: what the chart draws and the CSV export holds. */
export function chartData(result: TestResult): ChartDatum[] {
  const denominator = result.n || 1
  return result.bins.map(bin => ({
    key: bin.key,
    count: bin.count,
    share: bin.share,
    expectedShare: bin.expectedShare,
    expectedCount: bin.expected,
    low: bin.low,
    high: bin.high,
    lowShare: bin.low === null ? null : bin.low / denominator,
    highShare: bin.high === null ? null : bin.high / denominator,
    z: bin.z,
    outside: bin.low !== null && bin.high !== null && (bin.count < bin.low || bin.count > bin.high),
  }))
}

function axisLabelEvery(bins: number): string | undefined {
  if (bins <= 20) return undefined
  const every = bins > 200 ? 100 : 10
  return `(datum.index * ${bins - 1}) % ${every} < 1 || datum.index === 0 ? datum.label : ''`
}

/**
 * A Vega-Lite specification of a result: observed shares as bars (the signal colour where a bin
 * falls outside its range), the range a conforming sample of this size shows 95% of the time as
 * a band, and what the law expects as a line. The summary in words goes beside it, never in it.
 */
export function digitChartSpec(result: TestResult, options: { width?: number | 'container', height?: number } = {}) {
  const data = chartData(result)
  const shareAxis = result.test === 'duplicates' ? { field: 'count', title: 'Rows with this amount', format: ',d' } : { field: 'share', title: result.test === 'summation' ? 'Share of the total amount' : 'Share of values', format: '.1%' }
  const labelExpr = axisLabelEvery(data.length)
  const x = {
    field: 'key', type: 'ordinal', sort: null,
    title: result.test === 'threshold' ? 'Amount band (from)' : result.test === 'duplicates' ? 'Amount' : TEST_LABELS[result.test],
    axis: { labelAngle: data.length > 12 || result.test === 'duplicates' || result.test === 'threshold' ? -45 : 0, ...(labelExpr ? { labelExpr } : {}) },
  }
  const tooltip = [
    { field: 'key', title: 'Bin' },
    { field: 'count', title: 'Count', format: ',d' },
    { field: 'share', title: 'Share', format: '.2%' },
    { field: 'expectedShare', title: 'Expected share', format: '.2%' },
    { field: 'low', title: '95% range from', format: ',d' },
    { field: 'high', title: '95% range to', format: ',d' },
    { field: 'z', title: 'Z', format: '.2f' },
  ]
  const hasExpectation = data.some(d => d.expectedShare !== null)
  const hasRange = data.some(d => d.lowShare !== null)
  const layers: object[] = []
  if (hasRange) {
    layers.push({
      mark: { type: 'bar', color: PALETTE.expect, opacity: 0.18 },
      encoding: { x, y: { field: 'lowShare', type: 'quantitative' }, y2: { field: 'highShare' } },
    })
  }
  layers.push({
    mark: { type: 'bar', width: { band: 0.6 } },
    encoding: {
      x,
      y: { ...shareAxis, type: 'quantitative', axis: { format: shareAxis.format } },
      color: { condition: { test: 'datum.outside', value: PALETTE.signal }, value: PALETTE.observed },
      tooltip,
    },
  })
  if (hasExpectation) {
    layers.push({
      mark: { type: 'line', color: PALETTE.expect, strokeWidth: 2, point: { color: PALETTE.expect, size: data.length > 100 ? 0 : 24 } },
      encoding: { x, y: { field: 'expectedShare', type: 'quantitative' }, tooltip },
    })
  }
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    description: `${TEST_LABELS[result.test]} of ${result.column ?? 'the column'}`,
    width: options.width ?? 'container',
    height: options.height ?? 240,
    background: PALETTE.paper,
    config: {
      font: 'Inter, system-ui, sans-serif',
      axis: { labelColor: PALETTE.inkSoft, titleColor: PALETTE.inkSoft, gridColor: PALETTE.rule, domainColor: PALETTE.graphite, tickColor: PALETTE.graphite },
      view: { stroke: null },
    },
    data: { values: data },
    layer: layers,
  }
}
