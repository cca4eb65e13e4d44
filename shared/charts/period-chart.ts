import type { Period } from '../dates/read-date'
import type { GroupResult } from '../digits'
import { PALETTE } from './palette'
import { CHART_CONFIG } from './digit-chart'

const STANDS_OUT = 0.05

/** The ranked groups of a test grouped by period, back in date order (the texts that read as no date last). */
export function groupsInDateOrder(groups: readonly GroupResult[]): GroupResult[] {
  return [...groups].sort((a, b) => (a.key === '' ? 1 : b.key === '' ? -1 : a.key.localeCompare(b.key)))
}

const label = (key: string) => key || 'no date'

/**
 * A small Vega-Lite chart of the reading per period: each period's excess MAD (its MAD less what a
 * conforming sample of its size shows on average), in date order, in the signal colour where the
 * period stands out (q under 0.05). The line at zero is what the law leads one to expect.
 */
export function periodChartSpec(groups: readonly GroupResult[], period: Period, options: { width?: number | 'container', height?: number } = {}) {
  const data = groupsInDateOrder(groups).map(g => ({ period: label(g.key), n: g.n, mad: g.mad, excess: g.excessMad, q: g.q, out: g.q !== null && g.q < STANDS_OUT }))
  const x = { field: 'period', type: 'ordinal', sort: null, title: period[0]!.toUpperCase() + period.slice(1), axis: { labelAngle: data.length > 4 ? -45 : 0 } }
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    description: `Excess MAD per ${period}`,
    width: options.width ?? 'container',
    height: options.height ?? 120,
    config: CHART_CONFIG,
    data: { values: data },
    layer: [
      {
        mark: { type: 'bar', width: { band: 0.6 } },
        encoding: {
          x,
          y: { field: 'excess', type: 'quantitative', title: 'Excess MAD', axis: { format: '.4f' } },
          color: { condition: { test: 'datum.out', value: PALETTE.signal }, value: PALETTE.ink },
          tooltip: [
            { field: 'period', title: period },
            { field: 'n', title: 'n', format: ',d' },
            { field: 'mad', title: 'MAD', format: '.5f' },
            { field: 'excess', title: 'Excess MAD', format: '.5f' },
            { field: 'q', title: 'q', format: '.3f' },
          ],
        },
      },
      { mark: { type: 'rule', color: PALETTE.expect, strokeWidth: 1.5 }, encoding: { y: { datum: 0 } } },
    ],
  }
}

/** The period chart in one sentence, for readers and screen readers; true of the groups it draws. */
export function summarizePeriods(groups: readonly GroupResult[], period: Period, skipped: number): string {
  const ordered = groupsInDateOrder(groups)
  const out = ordered.filter(g => g.q !== null && g.q < STANDS_OUT).map(g => label(g.key))
  const tooFew = skipped ? ` ${skipped} ${skipped === 1 ? period : `${period}s`} had too few values to test.` : ''
  if (!ordered.length) return `No ${period} has enough values to test.${tooFew}`
  const span = `${ordered.length} ${ordered.length === 1 ? period : `${period}s`} tested, in date order`
  if (!out.length) return `${span}; none stands out (every q is 0.05 or more).${tooFew}`
  return `${span}; ${out.length} ${out.length === 1 ? 'stands' : 'stand'} out (q under 0.05): ${out.join(', ')}.${tooFew}`
}
