import { describe, expect, it } from 'vitest'
import { mountSuspended, registerEndpoint } from '@nuxt/test-utils/runtime'
import { flushPromises } from '@vue/test-utils'
import AnalysisSettingsForm from '~/components/analysis/AnalysisSettingsForm.vue'

const NEWSROOM = '11111111-1111-4111-8111-111111111111'
const DATASET = '22222222-2222-4222-8222-222222222222'
const column = (name: string, position: number, numeric: boolean) => ({ name, position, numeric, kind: numeric ? 'amount' : 'text', samples: [] })

// Summaries as GET /api/datasets answers them (DatasetSummaryDTO).
const summary = (id: string, title: string, status: 'ready' | 'importing') => ({
  id, title, status, progress: status === 'ready' ? 1 : 0.4, error: null, rowCount: status === 'ready' ? 1200 : null, byteSize: 48_000,
  originalName: `${title.toLowerCase().replace(/ /g, '-')}.csv`, createdAt: '2026-11-30T09:00:00.000Z', createdBy: 'A Reporter',
  archived: false, obtainedOn: '2026-11-28', sha256: 'ab'.repeat(32), sheet: null, readingGroup: id, readingNo: 1,
})
registerEndpoint('/api/datasets', () => [summary(DATASET, 'Ledger', 'ready'), summary('33333333-3333-4333-8333-333333333333', 'Still importing', 'importing')])
registerEndpoint(`/api/datasets/${DATASET}`, () => ({
  id: DATASET, title: 'Ledger', status: 'ready',
  columns: [column('supplier', 0, false), column('amount', 1, true), column('vat', 2, true)],
}))

describe('setting up an analysis block', () => {
  it('offers ready datasets, only number columns to test, and text columns to group by', async () => {
    const wrapper = await mountSuspended(AnalysisSettingsForm, {
      props: { settings: { datasetId: DATASET, test: 'first-digit' }, newsroomId: NEWSROOM, errors: {} },
    })
    await flushPromises()
    const selects = wrapper.findAll('select')
    const options = (i: number) => selects[i]!.findAll('option').map(o => o.text())
    expect(options(0)).toEqual(['Choose a dataset…', 'Ledger'])
    expect(options(1)).toEqual(['Choose a column…', 'amount (amount)', 'vat (amount)'])
    expect(wrapper.text()).toContain('Rank groups by')
    expect(selects.find(s => s.findAll('option').some(o => o.text() === 'No grouping'))!.findAll('option').map(o => o.text())).toEqual(['No grouping', 'supplier'])
  })

  it('emits the new settings when the test changes, dropping a grouping the test cannot use', async () => {
    const wrapper = await mountSuspended(AnalysisSettingsForm, {
      props: { settings: { datasetId: DATASET, column: 'amount', test: 'first-digit', groupBy: 'supplier' }, newsroomId: NEWSROOM, errors: {} },
    })
    await flushPromises()
    await wrapper.findAll('select')[2]!.setValue('duplicates')
    expect(wrapper.emitted('change')!.at(-1)![0]).toEqual({ datasetId: DATASET, column: 'amount', test: 'duplicates' })
  })
})
