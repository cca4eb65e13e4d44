import { describe, expect, it } from 'vitest'
import { mountSuspended } from '@nuxt/test-utils/runtime'
import { powerSeries, runDigitTest } from '#shared/digits'
import AnalysisResult from '~/components/analysis/AnalysisResult.vue'
import AnalysisStatistics from '~/components/analysis/AnalysisStatistics.vue'

// 2^0 … 2^99: MAD 0.003879 and chi-square 0.2210 (docs/check-values.md, exact integer arithmetic).
const powers = runDigitTest({ test: 'first-digit', input: { values: powerSeries(2n, 100) }, column: 'amount' })

describe('the analysis result', () => {
  it('shows the caution, the summary in words and every statistic', async () => {
    const wrapper = await mountSuspended(AnalysisResult, {
      props: { result: powers, settings: { datasetId: '00000000-0000-4000-8000-000000000000', column: 'amount', test: 'first-digit' } },
      global: { stubs: { AnalysisChart: true } },
    })
    const text = wrapper.text()
    expect(text).toContain('A screen, not proof.')
    expect(text).toContain('First digit of 100 values of “amount”: MAD 0.0039')
    expect(text).toContain('0.00388')
    expect(text).toContain('0.22')
    // 100 values: above the first-digit minimum (98), far below the 5,000 from which Nigrini's ranges are read.
    expect(text).toContain('within what chance gives when 100 values follow Benford’s law')
    expect(text).not.toContain('close conformity')
  })

  it('marks a suitability finding with words, not colour alone', async () => {
    const few = runDigitTest({ test: 'first-digit', input: { values: ['12', '13', '250', '31', '47'] }, column: 'amount' })
    const wrapper = await mountSuspended(AnalysisResult, {
      props: { result: few, settings: { column: 'amount', test: 'first-digit' } },
      global: { stubs: { AnalysisChart: true } },
    })
    expect(few.suitability.length).toBeGreaterThan(0)
    expect(wrapper.text()).toMatch(/Does not apply:|Read with care:/)
  })

  it('lists every excluded count', async () => {
    const mixed = runDigitTest({ test: 'first-two-digits', input: { values: ['', 'n/a', '0', '-40', '5', '120', '35'] } })
    const wrapper = await mountSuspended(AnalysisStatistics, { props: { result: mixed } })
    const rows = wrapper.findAll('tr').map(row => row.text())
    expect(rows.find(r => r.startsWith('Values tested'))).toContain('2')
    expect(rows.find(r => r.startsWith('Left out: blank'))).toContain('1')
    expect(rows.find(r => r.startsWith('Left out: unreadable'))).toContain('1')
    expect(rows.find(r => r.startsWith('Left out: zero'))).toContain('1')
    expect(rows.find(r => r.startsWith('Left out: negative'))).toContain('1')
    expect(rows.find(r => r.startsWith('Left out: outside'))).toContain('1')
  })
})
