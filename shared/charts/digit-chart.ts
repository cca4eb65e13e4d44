import type { TestResult } from '../digits'
import { PALETTE } from './palette'
import { TEST_LABELS } from './labels'
import { legendItems } from './legend'
import type { ChartText } from './chart-text'
import { wrapText } from './wrap-text'

export interface ChartDatum {
  key: string
  /** What the axis and the callouts print for the bin ("ends in 00" for a round-amounts bin). */
  label: string
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
  /** Which side of its range an outside bin falls on. */
  direction: 'above' | 'below' | null
}

function binLabel(test: TestResult['test'], key: string): string {
  if (test === 'round-numbers') return `ends in ${key}`
  return key
}

/** The numbers behind a chart, one row per bin: what the chart draws and the CSV export holds. */
export function chartData(result: TestResult): ChartDatum[] {
  const denominator = result.n || 1
  return result.bins.map((bin) => {
    const ranged = bin.low !== null && bin.high !== null
    const direction = ranged && bin.count > bin.high! ? 'above' : ranged && bin.count < bin.low! ? 'below' : null
    return {
      key: bin.key,
      label: binLabel(result.test, bin.key),
      count: bin.count,
      share: bin.share,
      expectedShare: bin.expectedShare,
      expectedCount: bin.expected,
      low: bin.low,
      high: bin.high,
      lowShare: bin.low === null ? null : bin.low / denominator,
      highShare: bin.high === null ? null : bin.high / denominator,
      z: bin.z,
      outside: direction !== null,
      direction,
    }
  })
}

/** About how many labels an axis carries before they crowd at phone width. */
const AXIS_LABELS = 10
const STEPS = [1, 2, 5, 10, 20, 25, 50, 100, 200, 250, 500, 1000]

/**
 * The bins that get a tick and a label: every bin up to a dozen; for digit keys (10–99, 100–999,
 * 00–99) the round ones at a step that keeps about ten labels (10, 20 … 90; 100, 200 … 900); for
 * other keys every k-th. Each label is printed once, so none repeats and none overlaps.
 */
export function axisKeys(labels: readonly string[]): string[] {
  if (labels.length <= 12) return [...labels]
  const values = labels.map(l => (/^\d+$/.test(l) ? Number(l) : Number.NaN))
  const consecutive = values.every((v, i) => Number.isInteger(v) && (i === 0 || v === values[i - 1]! + 1))
  if (consecutive) {
    const step = STEPS.find(s => values.filter(v => v % s === 0).length <= AXIS_LABELS) ?? values.length
    return labels.filter((_, i) => values[i]! % step === 0)
  }
  // Amounts (repeated amounts, bands): each names its own bar, so up to two dozen all get a label.
  if (labels.length <= 24) return [...labels]
  const every = Math.ceil(labels.length / AXIS_LABELS)
  return labels.filter((_, i) => i % every === 0)
}

/**
 * Tick values for a share or count axis from 0: a nice step, about four ticks, each printed with just
 * enough decimals that no two read the same ("0.3%, 0.3%" was the old failure).
 */
export function valueTicks(max: number, kind: 'share' | 'count'): { values: number[], format: string, top: number } {
  const target = max > 0 ? max : kind === 'share' ? 0.01 : 1
  const rough = target / 4
  const power = 10 ** Math.floor(Math.log10(rough))
  const step = ([1, 2, 2.5, 5, 10].map(m => m * power).find(s => s >= rough) ?? 10 * power)
  const effective = kind === 'count' ? Math.max(1, Math.round(step)) : step
  const count = Math.ceil(target / effective - 1e-9)
  const values = Array.from({ length: count + 1 }, (_, i) => Number((i * effective).toPrecision(12)))
  // Just enough decimals to print the step exactly: 2.5% needs one, 0.25% two.
  const stepPercent = effective * 100
  const decimals = [0, 1, 2, 3, 4].find(d => Math.abs(Math.round(stepPercent * 10 ** d) - stepPercent * 10 ** d) < 1e-6) ?? 4
  const format = kind === 'share' ? `.${decimals}%` : ',d'
  return { values, format, top: values[values.length - 1]! }
}

/** Mark sizes that stay readable from 9 bins to 900. */
function density(bins: number) {
  if (bins <= 12) return { dot: 70, flag: 120, capsule: 0.5, tick: 0.66, radius: 5, callouts: 12 }
  if (bins <= 30) return { dot: 30, flag: 70, capsule: 0.6, tick: 0.8, radius: 3, callouts: 8 }
  if (bins <= 120) return { dot: 24, flag: 60, capsule: 0.7, tick: 0.9, radius: 2, callouts: 6 }
  return { dot: 8, flag: 34, capsule: 1, tick: 1, radius: 0, callouts: 4 }
}

/**
 * Callouts for the bins furthest outside their range (by |z|), at most `limit`. A callout close to
 * the previous one on the same side is lifted a line (up to two), so neighbours never print on top
 * of each other; `calloutAt` is where it is drawn, in the axis's units.
 */
function withCallouts(data: ChartDatum[], limit: number, top: number) {
  const chosen = new Set(data.filter(d => d.outside).sort((a, b) => Math.abs(b.z ?? 0) - Math.abs(a.z ?? 0)).slice(0, limit).map(d => d.key))
  const gap = Math.max(1, Math.ceil(data.length / 18))
  const last: Record<string, { index: number, level: number }> = {}
  return data.map((d, index) => {
    if (!chosen.has(d.key) || !d.direction) return { ...d, callout: null, calloutAt: d.share, placement: null }
    const previous = last[d.direction]
    const level = previous && index - previous.index <= gap ? (previous.level + 1) % 3 : 0
    last[d.direction] = { index, level }
    const lift = level * top * 0.07 * (d.direction === 'above' ? 1 : -1)
    const placement = d.direction === 'above' ? 'over' : data.length <= 30 && d.share > top * 0.15 ? 'under' : 'beside'
    return { ...d, callout: `${d.label} ${d.direction === 'above' ? '▲' : '▼'}`, calloutAt: Math.min(top, Math.max(0, d.share + lift)), placement }
  })
}

export interface ChartSize {
  width?: number | 'container'
  height?: number
}

/**
 * Mantissa's chart of a result. Each bin gets a capsule: the range a sample of this size that
 * follows the expected distribution shows 95% of the time, with a bar across it where the
 * expectation lies. The data are dots; a bin outside its capsule becomes a diamond in the signal
 * colour with a stem to the expectation and a callout naming the bin and its side (▲ above,
 * ▼ below), so the mark never rests on colour alone. Tests without a range (repeated amounts)
 * draw stems from zero. The words (title, legend, summary, source, caution) go around it.
 */
export function digitChartSpec(result: TestResult, options: ChartSize & { interactive?: boolean, valueAxis?: 'left' | 'right' } = {}) {
  const data = chartData(result)
  const size = density(data.length)
  const isCount = result.test === 'duplicates'
  const valueField = isCount ? 'count' : 'share'
  const top = Math.max(0, ...data.map(d => (isCount ? d.count : Math.max(d.share, d.highShare ?? 0, d.expectedShare ?? 0))))
  const ticks = valueTicks(top, isCount ? 'count' : 'share')
  const numericKeys = data.every(d => /^\d+$/.test(d.label))
  const longKeys = !numericKeys && data.some(d => d.label.length > 4)
  const x = {
    field: 'label', type: 'ordinal', sort: null,
    title: result.test === 'threshold' ? 'Amount band (from)' : isCount ? 'Amount' : TEST_LABELS[result.test],
    // The bins' own order: a layer that draws only some bins (the threshold test ranges two) would otherwise put those first.
    scale: { domain: data.map(d => d.label), paddingInner: data.length > 120 ? 0 : 0.15, paddingOuter: 0.2 },
    axis: { values: axisKeys(data.map(d => d.label)), labelAngle: longKeys && data.length > 6 ? -40 : 0, labelAlign: longKeys && data.length > 6 ? 'right' : 'center', labelOverlap: true, labelPadding: 4, ticks: true, tickSize: 4, domain: true },
  }
  const y = {
    type: 'quantitative',
    title: isCount ? 'Rows with this amount' : result.test === 'summation' ? 'Share of the total amount' : 'Share of values',
    scale: { domain: [0, ticks.top], nice: false, zero: true },
    axis: { orient: options.valueAxis ?? 'left', values: ticks.values, format: ticks.format, grid: true, gridDash: [1, 3], domain: false, ticks: false, labelPadding: 6 },
  }
  const yOf = (field: string) => ({ field, ...y })
  const hasRange = data.some(d => d.lowShare !== null)
  const hasExpectation = data.some(d => d.expectedShare !== null)
  const values = withCallouts(data, size.callouts, ticks.top)
  const tooltip = [
    { field: 'label', title: 'Bin' },
    { field: 'count', title: 'Count', format: ',d' },
    { field: 'share', title: 'Share', format: '.2%' },
    { field: 'expectedShare', title: 'Expected share', format: '.2%' },
    { field: 'low', title: '95% range from', format: ',d' },
    { field: 'high', title: '95% range to', format: ',d' },
    { field: 'z', title: 'Z', format: '.2f' },
  ]
  const layers: object[] = []
  if (options.interactive) {
    // An invisible full-height target per bin, so a bin is easy to point at even when its dot is small.
    layers.push({ mark: { type: 'bar', fill: PALETTE.paper, opacity: 0.001, cursor: 'pointer' }, encoding: { x, y: { datum: ticks.top, ...y }, y2: { datum: 0 }, tooltip } })
  }
  if (hasRange) {
    layers.push({
      transform: [{ filter: 'datum.lowShare !== null' }],
      mark: { type: 'bar', fill: PALETTE.expectSoft, stroke: PALETTE.expect, strokeWidth: data.length > 120 ? 0 : 1, strokeOpacity: 0.7, cornerRadius: size.radius, width: { band: size.capsule } },
      encoding: { x, y: yOf('lowShare'), y2: { field: 'highShare' } },
    })
  }
  if (hasExpectation) {
    layers.push({
      transform: [{ filter: 'datum.expectedShare !== null' }],
      mark: { type: 'tick', color: PALETTE.expect, thickness: data.length > 120 ? 1 : 2, bandSize: size.tick },
      encoding: { x, y: yOf('expectedShare') },
    })
  }
  else {
    layers.push({ mark: { type: 'rule', color: PALETTE.ink, strokeWidth: 1.5 }, encoding: { x, y: yOf(valueField), y2: { datum: 0 } } })
  }
  layers.push({
    transform: [{ filter: 'datum.outside && datum.expectedShare !== null' }],
    mark: { type: 'rule', color: PALETTE.signal, strokeWidth: data.length > 120 ? 1 : 1.5 },
    encoding: { x, y: yOf('expectedShare'), y2: { field: 'share' } },
  })
  layers.push({
    mark: { type: 'point', filled: true, opacity: 1, strokeWidth: 1.2, stroke: PALETTE.paper },
    encoding: {
      x,
      y: yOf(valueField),
      shape: { condition: { test: 'datum.outside', value: 'diamond' }, value: 'circle' },
      color: { condition: { test: 'datum.outside', value: PALETTE.signal }, value: PALETTE.ink },
      size: { condition: { test: 'datum.outside', value: size.flag }, value: size.dot },
      ...(options.interactive ? { tooltip } : {}),
    },
  })
  if (values.some(v => v.callout)) {
    // Above its range the callout sits over the diamond; below, under it, or beside it when under
    // would reach the axis or crowd the next bin. Each is drawn twice, first as a paper-coloured
    // outline, so it reads over the marks behind it.
    const placements = { over: { dy: -9, baseline: 'bottom', align: 'center' }, under: { dy: 9, baseline: 'top', align: 'center' }, beside: { dx: 7, baseline: 'middle', align: 'left' } }
    for (const [placement, position] of Object.entries(placements)) {
      for (const halo of [true, false]) {
        layers.push({
          transform: [{ filter: `datum.callout !== null && datum.placement === '${placement}'` }],
          mark: {
            type: 'text', color: halo ? PALETTE.paper : PALETTE.signal, fontSize: 10, fontWeight: 600, ...position,
            ...(halo ? { stroke: PALETTE.paper, strokeWidth: 3, strokeJoin: 'round' } : {}),
          },
          encoding: { x, y: yOf('calloutAt'), text: { field: 'callout' } },
        })
      }
    }
  }
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    description: `${TEST_LABELS[result.test]} of ${result.column ?? 'the column'}`,
    width: options.width ?? 'container',
    height: options.height ?? 240,
    data: { values },
    layer: layers,
  }
}

const FONT = 'Inter, system-ui, sans-serif'
const SERIF = 'Merriweather, Georgia, serif'

/** The look every Mantissa chart shares, on screen and in files. */
export const CHART_CONFIG = {
  font: FONT,
  background: PALETTE.paper,
  view: { stroke: null },
  axis: { labelColor: PALETTE.inkSoft, titleColor: PALETTE.inkSoft, labelFontSize: 10, titleFontSize: 11, titleFontWeight: 500, gridColor: PALETTE.rule, domainColor: PALETTE.graphite, tickColor: PALETTE.graphite },
  title: { font: SERIF, fontSize: 17, fontWeight: 700, color: PALETTE.ink, anchor: 'start', subtitleFont: FONT, subtitleFontSize: 11, subtitleColor: PALETTE.inkSoft, subtitlePadding: 6, offset: 12 },
} as const

/** The specification a chart is drawn from on screen: the chart alone, as wide as its box. */
export function screenChartSpec(result: TestResult, options: ChartSize = {}) {
  return { ...digitChartSpec(result, { ...options, interactive: true }), background: null, config: { ...CHART_CONFIG, background: null } }
}

interface TextLine { x: number, y: number, text: string, size: number, weight: number, color: string }

/** Lines of text at given pixel positions; one layer per style, as Vega-Lite sets size and weight per mark. */
function textBlock(lines: TextLine[], width: number, height: number) {
  const styles = [...new Map(lines.map(l => [`${l.size}/${l.weight}/${l.color}`, l])).values()]
  return {
    width, height,
    data: { values: lines },
    layer: styles.map(style => ({
      transform: [{ filter: `datum.size === ${style.size} && datum.weight === ${style.weight} && datum.color === '${style.color}'` }],
      mark: { type: 'text', align: 'left', baseline: 'top', font: FONT, fontSize: style.size, fontWeight: style.weight, color: style.color },
      encoding: {
        x: { field: 'x', type: 'quantitative', scale: null },
        y: { field: 'y', type: 'quantitative', scale: null },
        text: { field: 'text' },
      },
    })),
  }
}

/** The legend as marks: a sample of each mark with its words, wrapped to the width. */
function legendBlock(result: TestResult, width: number) {
  const items = legendItems(result)
  const samples = items.map((item, i) => ({ ...item, x: 0, y: i * 20 + 8 }))
  const height = items.length * 20 + 2
  const at = (filter: string, mark: object, extra: object = {}) => ({
    transform: [{ filter }],
    mark,
    encoding: { x: { field: 'x', type: 'quantitative', scale: null }, y: { field: 'y', type: 'quantitative', scale: null }, ...extra },
  })
  return {
    width, height,
    data: { values: samples },
    layer: [
      at('datum.mark === \'range\'', { type: 'rect', fill: PALETTE.expectSoft, stroke: PALETTE.expect, strokeOpacity: 0.7, cornerRadius: 3 }, { x: { field: 'x', type: 'quantitative', scale: null, axis: null }, x2: { field: 'x2' }, y: { field: 'yTop', type: 'quantitative', scale: null }, y2: { field: 'yBottom' } }),
      at('datum.mark === \'expected\'', { type: 'rule', stroke: PALETTE.expect, strokeWidth: 2 }, { x: { field: 'x', type: 'quantitative', scale: null }, x2: { field: 'x2' } }),
      at('datum.mark === \'observed\'', { type: 'point', filled: true, opacity: 1, shape: 'circle', size: 60, color: PALETTE.ink }, { x: { field: 'xMid', type: 'quantitative', scale: null } }),
      at('datum.mark === \'stem\'', { type: 'rule', stroke: PALETTE.ink, strokeWidth: 1.5 }, { x: { field: 'xMid', type: 'quantitative', scale: null }, y: { field: 'yTop', type: 'quantitative', scale: null }, y2: { field: 'yBottom' } }),
      at('datum.mark === \'outside\'', { type: 'point', filled: true, opacity: 1, shape: 'diamond', size: 100, color: PALETTE.signal }, { x: { field: 'xMid', type: 'quantitative', scale: null } }),
      {
        mark: { type: 'text', align: 'left', baseline: 'middle', fontSize: 11, color: PALETTE.ink, limit: width - 30 },
        encoding: { x: { field: 'xText', type: 'quantitative', scale: null }, y: { field: 'y', type: 'quantitative', scale: null }, text: { field: 'text' } },
      },
    ],
    transform: [{ calculate: 'datum.x + 20', as: 'x2' }, { calculate: 'datum.x + 10', as: 'xMid' }, { calculate: 'datum.x + 28', as: 'xText' }, { calculate: 'datum.y - 7', as: 'yTop' }, { calculate: 'datum.y + 7', as: 'yBottom' }],
  }
}

/**
 * The chart as a file for a graphics desk (PNG or SVG): title, subtitle, legend, the chart, the
 * summary, the source line and the caution, all drawn into the image so none is lost on the way
 * into a story.
 */
export function exportChartSpec(result: TestResult, text: ChartText, width = 720) {
  const lineHeight = (size: number) => Math.round(size * 1.45)
  const lines: TextLine[] = []
  let y = 0
  const add = (content: string, size: number, weight: number, color: string, gapAfter = 4) => {
    for (const line of wrapText(content, width, size)) {
      lines.push({ x: 0, y, text: line, size, weight, color })
      y += lineHeight(size)
    }
    y += gapAfter
  }
  add(text.summary, 12, 400, PALETTE.ink, 8)
  add(text.source, 10, 400, PALETTE.inkSoft, 6)
  add(text.caution, 10, 600, PALETTE.inkSoft, 0)
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    description: text.title,
    background: PALETTE.paper,
    padding: 20,
    config: CHART_CONFIG,
    title: { text: wrapText(text.title, width, 17, 0.6), subtitle: wrapText(text.subtitle, width, 11) },
    spacing: 14,
    vconcat: [
      legendBlock(result, width),
      // The value axis on the right, so the chart, its words and the title share one left edge.
      digitChartSpec(result, { width, height: 300, valueAxis: 'right' }),
      textBlock(lines, width, y),
    ],
  }
}
