import Papa from 'papaparse'
import * as vega from 'vega'
import { compile } from 'vega-lite'
import { describe, expect, it } from 'vitest'
import { powerSeries, runDigitTest } from '../../../shared/digits'
import type { TestName, TestResult } from '../../../shared/digits'
import { axisKeys, chartData, exportChartSpec, screenChartSpec, valueTicks } from '../../../shared/charts/digit-chart'
import { chartText } from '../../../shared/charts/chart-text'
import { chartCsv, CHART_CSV_HEADER } from '../../../shared/export/chart-csv'

// 2^0 … 2^2999 follow Benford's law closely (they are equidistributed in log10, Diaconis 1977), so
// every distribution test has data, and the bins are the tests' own: 9 (first digit), 10 (second),
// 90 (first two), 100 (last two) and 900 (first three).
const powers = powerSeries(2n, 3000)
const resultOf = (test: TestName, values: readonly string[] = powers): TestResult => runDigitTest({ test, input: { values }, column: 'amount' })
// Vega's own number formatter, the one that prints the axis labels (its typings declare no return).
const d3Format = (vega.formatLocale as unknown as () => { format: (spec: string) => (n: number) => string })().format
const SIZES: Array<[TestName, number]> = [['first-digit', 9], ['second-digit', 10], ['first-two-digits', 90], ['last-two-digits', 100], ['first-three-digits', 900]]
const source = { title: 'Council payments 2025', sourceNote: 'Released by the finance office', sha256: 'ab'.repeat(32), obtainedOn: '2026-02-14' }

type Item = { text?: string | string[], bounds: { x1: number, x2: number, y1: number, y2: number } }
type Scene = { marktype?: string, role?: string, items?: Scene[] } & Partial<Item>

/** Every axis label a rendered view shows, per axis, with its box (vega's own layout and text measure). */
async function axisLabels(spec: object): Promise<Item[][]> {
  const view = new vega.View(vega.parse(compile(spec as never).spec), { renderer: 'none' })
  await view.runAsync()
  const axes: Item[][] = []
  const walk = (node: Scene) => {
    if (node.marktype === 'text' && node.role === 'axis-label') axes.push((node.items ?? []).filter(i => i.text !== '' && i.text !== undefined) as Item[])
    for (const child of node.items ?? []) walk(child)
  }
  walk((view.scenegraph() as unknown as { root: Scene }).root)
  view.finalize()
  return axes
}

describe('the chart’s axes (shared/charts/digit-chart.ts)', () => {
  it.each(SIZES)('%s has %i bins, labelled with round keys only, none repeated', (test, bins) => {
    const keys = chartData(resultOf(test)).map(d => d.label)
    expect(keys).toHaveLength(bins)
    const shown = axisKeys(keys)
    expect(new Set(shown).size).toBe(shown.length)
    expect(shown.length).toBeLessThanOrEqual(12)
    expect(shown.length).toBeGreaterThanOrEqual(Math.min(bins, 9))
    // The keys are the tests' definitions (Nigrini 2012, ch. 5): 1–9, 0–9, 10–99, 00–99, 100–999.
    const expected: Record<number, string[]> = {
      9: ['1', '2', '3', '4', '5', '6', '7', '8', '9'],
      10: ['0', '1', '2', '3', '4', '5', '6', '7', '8', '9'],
      90: ['10', '20', '30', '40', '50', '60', '70', '80', '90'],
      100: ['00', '10', '20', '30', '40', '50', '60', '70', '80', '90'],
      900: ['100', '200', '300', '400', '500', '600', '700', '800', '900'],
    }
    expect(shown).toEqual(expected[bins])
  })

  it.each(SIZES.flatMap(([test, bins]) => [320, 720].map(width => [test, bins, width] as const)))('%s (%i bins) at %i px: no two axis labels overlap or read the same', async (test, _bins, width) => {
    const axes = await axisLabels(screenChartSpec(resultOf(test), { width, height: 220 }))
    expect(axes).toHaveLength(2)
    for (const labels of axes) {
      const texts = labels.map(l => String(l.text))
      expect(new Set(texts).size).toBe(texts.length)
      const boxes = labels.map(l => l.bounds).sort((a, b) => a.x1 - b.x1 || a.y1 - b.y1)
      for (let i = 1; i < boxes.length; i++) {
        const [a, b] = [boxes[i - 1]!, boxes[i]!]
        const overlap = a.x2 > b.x1 + 0.5 && b.x2 > a.x1 + 0.5 && a.y2 > b.y1 + 0.5 && b.y2 > a.y1 + 0.5
        expect(overlap, `${texts.join(' ')}`).toBe(false)
      }
      for (const box of boxes) expect(box.x2).toBeLessThanOrEqual(width + 60)
    }
  })

  it('prints share ticks with enough decimals to tell them apart, read by vega’s own formatter', () => {
    for (const max of [0.0034, 0.012, 0.047, 0.3, 0.31, 0.9, 0.00051]) {
      const ticks = valueTicks(max, 'share')
      const texts = ticks.values.map(d3Format(ticks.format))
      expect(new Set(texts).size, texts.join(' ')).toBe(texts.length)
      expect(ticks.top).toBeGreaterThanOrEqual(max)
      expect(ticks.values.length).toBeGreaterThanOrEqual(3)
      expect(ticks.values.length).toBeLessThanOrEqual(7)
    }
  })

  it('the round-amounts axis (three tiny shares) no longer repeats "0.3%"', async () => {
    const values = Array.from({ length: 4000 }, (_, i) => String(1234 + i * 7))
    const axes = await axisLabels(screenChartSpec(resultOf('round-numbers', values), { width: 320 }))
    for (const labels of axes) {
      const texts = labels.map(l => String(l.text))
      expect(new Set(texts).size).toBe(texts.length)
    }
  })
})

describe('deviations are marked by more than colour', () => {
  // 2,000 values that all start with 1 deviate from Benford's law in every bin.
  const skewed = resultOf('first-digit', Array.from({ length: 2000 }, (_, i) => String(100 + (i % 90))))

  it('a bin outside its range is a diamond with a callout naming the bin and its side', async () => {
    const data = chartData(skewed)
    expect(data.find(d => d.key === '1')).toMatchObject({ outside: true, direction: 'above' })
    expect(data.find(d => d.key === '2')).toMatchObject({ outside: true, direction: 'below' })
    const view = new vega.View(vega.parse(compile(screenChartSpec(skewed, { width: 400 }) as never).spec), { renderer: 'none' })
    const svg = await view.toSVG()
    view.finalize()
    expect(svg).toContain('1 ▲')
    expect(svg).toContain('2 ▼')
    const spec = JSON.stringify(screenChartSpec(skewed))
    expect(spec).toContain('"diamond"')
  })
})

describe('exported charts and their numbers', () => {
  const grouped = runDigitTest({
    test: 'first-digit', column: 'amount', input: { values: powers },
    groups: { items: [{ key: 'Works', input: { values: powers.slice(0, 1500) } }, { key: '=cmd', input: { values: powers.slice(1500) } }] },
  })
  const settings = { datasetId: 'x', column: 'amount', test: 'first-digit' as const, groupBy: 'department', filters: [{ column: 'year', op: 'equals' as const, value: '2025' }] }

  it('the SVG carries the title, subtitle, legend, summary, source line with the fingerprint, and the caution', async () => {
    const text = chartText(grouped, settings, source)
    const view = new vega.View(vega.parse(compile(exportChartSpec(grouped, text) as never).spec), { renderer: 'none' })
    const svg = await view.toSVG()
    view.finalize()
    const plain = svg.replace(/<[^>]+>/g, ' ').replace(/&#x27;|&apos;/g, '\'').replace(/&quot;/g, '"').replace(/&amp;/g, '&').replace(/\s+/g, ' ')
    expect(plain).toContain('First digit of “amount”, against Benford’s law')
    expect(plain).toContain('n = 3,000 values tested')
    expect(plain).toContain('grouped by “department”')
    for (const item of text.legend) expect(plain).toContain(item.text.split(' ').slice(0, 3).join(' '))
    expect(plain).toContain(text.summary.split(' ').slice(0, 6).join(' '))
    expect(plain).toContain('Council payments 2025')
    expect(plain).toContain('abababab')
    expect(plain).toContain('screen, not proof')
  })

  it('the CSV names dataset, SHA-256, test, filters and grouping on every row, with every bin and group (read back by papaparse)', () => {
    const rows = Papa.parse<Record<string, string>>(chartCsv(grouped, settings, source), { header: true, skipEmptyLines: true })
    expect(rows.meta.fields).toEqual([...CHART_CSV_HEADER])
    const bins = rows.data.filter(r => r.row_kind === 'bin')
    const groups = rows.data.filter(r => r.row_kind === 'group')
    expect(bins.map(r => Number(r.count))).toEqual(grouped.bins.map(b => b.count))
    expect(groups.map(r => r.group)).toEqual(grouped.groups!.map(g => g.key === '=cmd' ? '\'=cmd' : g.key))
    for (const row of rows.data) {
      expect(row).toMatchObject({ dataset: 'Council payments 2025', dataset_sha256: source.sha256, test: 'first-digit', column: 'amount', grouped_by: 'department', filters: 'year is “2025”', n: '3000' })
    }
  })
})
