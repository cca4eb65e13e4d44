import { describe, expect, it } from 'vitest'
import { powerSeries, runDigitTest } from '../../../shared/digits'
import { chartText, periodOf, sourceLine } from '../../../shared/charts/chart-text'

// 2^0 … 2^99: 100 values (docs/check-values.md); the words below are Mantissa's own.
const powers = runDigitTest({ test: 'last-two-digits', input: { values: powerSeries(2n, 100) }, column: 'amount' })
const source = { title: 'Harbour grants', sourceNote: 'Sent by the port authority', sha256: 'f'.repeat(64), obtainedOn: '2026-03-01' }

describe('the words around a chart (shared/charts/chart-text.ts)', () => {
  it('says what was tested and against what, on how many values, and which rows', () => {
    const text = chartText(powers, { groupBy: 'harbour', filters: [{ column: 'amount', op: 'between', min: 10 }] }, { ...source, period: { column: 'paid_on', from: '2025-01-02', to: '2025-12-30' } })
    expect(text.title).toBe('Last two digits of “amount”, against an even spread')
    expect(text.subtitle).toBe(`n = ${powers.n.toLocaleString('en-GB')} values tested · dataset dated 2 Jan 2025 to 30 Dec 2025 (“paid_on”) · only rows where amount is at least 10 · grouped by “harbour”`)
    expect(text.legend.map(l => l.mark)).toContain('expected')
    expect(text.legend.find(l => l.mark === 'expected')!.text).toBe('What an even spread of endings expects')
  })

  it('names the dataset, who provided it, when, and its full fingerprint', () => {
    expect(sourceLine(source)).toBe(`Source: “Harbour grants”. Sent by the port authority. Obtained 1 Mar 2026. File SHA-256 ${'f'.repeat(64)}.`)
    expect(sourceLine(null)).toBe('Source: the dataset’s details could not be read.')
  })

  it('keeps a frozen summary as published, and leaves the date range out when no date column was read', () => {
    const text = chartText(powers, {}, source, 'As published.')
    expect(text.summary).toBe('As published.')
    expect(text.subtitle).not.toMatch(/dated/)
    expect(periodOf([{ name: 'paid_on', kind: 'date', dates: { first: null, last: null } }, { name: 'amount', kind: 'amount' }])).toBeNull()
    expect(periodOf([{ name: 'paid_on', kind: 'date', dates: { first: '2025-01-02', last: '2025-03-31' } }])).toEqual({ column: 'paid_on', from: '2025-01-02', to: '2025-03-31' })
  })
})
