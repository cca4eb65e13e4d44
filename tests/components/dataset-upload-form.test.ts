import { describe, expect, it } from 'vitest'
import { mountSuspended } from '@nuxt/test-utils/runtime'
import { flushPromises } from '@vue/test-utils'
import type { VueWrapper } from '@vue/test-utils'
import DatasetUploadForm from '~/components/dataset/DatasetUploadForm.vue'

const NEWSROOM = '11111111-1111-4111-8111-111111111111'

/** The control a label names, as a screen reader finds it: through the label's `for`. */
function fieldOf(wrapper: VueWrapper, label: string) {
  const tag = wrapper.findAll('label').find(l => l.text() === label)
  expect(tag, `a label "${label}"`).toBeDefined()
  const control = wrapper.find(`#${CSS.escape(tag!.attributes('for')!)}`)
  expect(control.exists(), `the control labelled "${label}"`).toBe(true)
  return control
}

/** The text of the element(s) a control's aria-describedby names. */
function descriptionOf(wrapper: VueWrapper, control: ReturnType<typeof fieldOf>) {
  const ids = control.attributes('aria-describedby')
  return ids ? ids.split(' ').map(id => wrapper.find(`#${CSS.escape(id)}`).text()).join(' ') : ''
}

// The upload form's fields: labelled, typed, and refused in words beside each field, tied to it for screen readers.
// The messages are the shared upload schema's (shared/schemas/dataset.ts).
describe('the dataset upload form', () => {
  it('labels each field, types the link and the date, and says what the source note is for', async () => {
    const wrapper = await mountSuspended(DatasetUploadForm, { props: { newsroomId: NEWSROOM } })
    expect(fieldOf(wrapper, 'Title').element.tagName).toBe('INPUT')
    expect(fieldOf(wrapper, 'Source link').attributes('type')).toBe('url')
    expect(fieldOf(wrapper, 'Date obtained').attributes('type')).toBe('date')
    const note = fieldOf(wrapper, 'Source note')
    expect(note.element.tagName).toBe('TEXTAREA')
    expect(descriptionOf(wrapper, note)).toBe('Who supplied it, how, and anything a fact-checker should know.')
  })

  it('refuses a missing title, a link that is not http(s) and a missing file beside their fields, and keeps what was typed', async () => {
    const wrapper = await mountSuspended(DatasetUploadForm, { props: { newsroomId: NEWSROOM } })
    await fieldOf(wrapper, 'Source link').setValue('ftp://archive.example/ledger.csv')
    await fieldOf(wrapper, 'Date obtained').setValue('2026-03-31')
    await wrapper.find('form').trigger('submit')
    await flushPromises()

    const title = fieldOf(wrapper, 'Title')
    expect(title.attributes('aria-invalid')).toBe('true')
    expect(descriptionOf(wrapper, title)).toBe('Give the dataset a title')
    const link = fieldOf(wrapper, 'Source link')
    expect(link.attributes('aria-invalid')).toBe('true')
    expect(descriptionOf(wrapper, link)).toBe('A source link starts with http:// or https://')
    expect((link.element as HTMLInputElement).value).toBe('ftp://archive.example/ledger.csv')
    const date = fieldOf(wrapper, 'Date obtained')
    expect(date.attributes('aria-invalid')).toBe('false')
    expect((date.element as HTMLInputElement).value).toBe('2026-03-31')
    expect(wrapper.text()).toContain('Choose a file, or drop one here.')
  })
})
