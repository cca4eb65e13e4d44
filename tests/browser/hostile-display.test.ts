import { readFile } from 'node:fs/promises'
import Papa from 'papaparse'
import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { FORMULA_PAYLOADS as F, MARKUP_PAYLOADS as M } from '../fixtures/hostile/payloads'
import { baseUrl } from '../support/api'
import { launchBrowser, screenshot, signInThroughPage } from '../support/browser'
import { delimitedText, utf8 } from '../support/dataset-files'
import { upload } from '../support/datasets'
import { createTestNewsroom, PASSWORD } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { proseDoc } from '../support/stories'

// Issue 8: stored text that looks like markup, a template or a formula is shown as text. Each
// payload tries to set window.__hostile or open a dialog (tests/fixtures/hostile/payloads.ts).

const TITLE = `${M.script} ${M.image}`
const NOTE = `${M.svg} ${M.attribute}`
const PROSE = proseDoc(...Object.values(M))

/** An invented ledger whose column names and cells carry the payloads; -215.50 repeats for the duplicates test. */
const LEDGER = delimitedText({
  header: [M.image, F.hyperlink, 'note'],
  rows: [
    [M.script, '1840.00', M.svg], [M.attribute, '-215.50', M.template], [M.link, '-215.50', F.equals], [M.template, '1840.00', F.dde],
    ['Quayside Paving', '312.40', F.at], ['Lantern Row Supplies', '-99.10', F.plus], ['Harbour Glaziers', '-99.10', F.minus],
  ],
})

let browser: Browser
let newsroom: TestNewsroom
let datasetId: string
let investigationId: string

beforeAll(async () => {
  browser = await launchBrowser()
  newsroom = await createTestNewsroom('Hostile display')
  const uploaded = await upload(newsroom.reporter, 'hostile-ledger.csv', utf8(LEDGER), { title: TITLE, sourceNote: NOTE }, `?newsroomId=${newsroom.id}`)
  expect(uploaded.status, JSON.stringify(uploaded.body)).toBe(201)
  datasetId = uploaded.body.id

  const created = await newsroom.reporter.post('/api/investigations', { newsroomId: newsroom.id, title: TITLE })
  expect(created.status).toBe(201)
  investigationId = created.body.id
  expect((await newsroom.reporter.patch(`/api/blocks/${created.body.blocks[0].id}`, { version: 1, content: PROSE })).status).toBe(200)
  const analysis = await newsroom.reporter.post(`/api/investigations/${investigationId}/blocks`, {
    kind: 'analysis', settings: { datasetId, column: F.hyperlink, test: 'duplicates', sign: 'negative' },
  })
  expect(analysis.status, JSON.stringify(analysis.body)).toBe(201)
  const review = await newsroom['data-editor'].post(`/api/blocks/${analysis.body.id}/review`, { decision: 'sent-back', note: NOTE })
  expect(review.status).toBe(200)
})
afterAll(async () => {
  await browser?.close()
})

/** A signed-in page that records every dialog (and dismisses it) and every script error. */
async function watchedPage(): Promise<{ page: Page, dialogs: string[], errors: string[] }> {
  const page = await browser.newPage({ viewport: { width: 1280, height: 1000 } })
  const dialogs: string[] = []
  const errors: string[] = []
  page.on('dialog', (dialog) => {
    dialogs.push(dialog.message())
    void dialog.dismiss()
  })
  page.on('pageerror', error => errors.push(error.message))
  await signInThroughPage(page, newsroom.emails.reporter, PASSWORD)
  await page.waitForURL(/\/newsrooms\//)
  return { page, dialogs, errors }
}

/** Nothing ran and nothing became markup: no global, no event-handler attribute, no injected element or javascript: link. */
async function expectNothingRan(page: Page, dialogs: string[]) {
  // Hovering is what the onmouseover payload waits for.
  for (const cell of (await page.locator('td, h1, dd, .ProseMirror p').all()).slice(0, 40)) await cell.hover({ timeout: 2000 }).catch(() => {})
  expect(await page.evaluate(() => (window as unknown as { __hostile?: unknown }).__hostile)).toBeUndefined()
  expect(dialogs).toEqual([])
  const injected = await page.evaluate(() => ({
    handlers: [...document.querySelectorAll('*')].flatMap(el => [...el.attributes].filter(a => /^on/i.test(a.name)).map(a => `${el.tagName} ${a.name}`)),
    // The page's data travels in a JSON script (Nuxt's payload); only scripts that would run count.
    scripts: [...document.querySelectorAll('script')].filter(s => !/json/.test(s.type) && s.textContent?.includes('__hostile')).length,
    images: document.querySelectorAll('img[src="x"]').length,
    links: [...document.querySelectorAll('a[href]')].filter(a => /^\s*javascript:/i.test(a.getAttribute('href') ?? '')).length,
  }))
  expect(injected).toEqual({ handlers: [], scripts: 0, images: 0, links: 0 })
}

describe('hostile text on the page', () => {
  it('shows a dataset\'s title, source note, column names and cells literally, and runs none of them', async () => {
    const { page, dialogs, errors } = await watchedPage()
    await page.goto(`${baseUrl}/datasets/${datasetId}`)
    await page.getByRole('heading', { level: 1 }).waitFor()
    expect((await page.getByRole('heading', { level: 1 }).textContent())?.trim()).toBe(TITLE)
    expect(await page.title()).toBe(`${TITLE} · Mantissa`)
    await expect(page.getByText(NOTE, { exact: true }).count()).resolves.toBeGreaterThan(0)
    const table = page.locator('table').last()
    await table.locator('tbody tr').first().waitFor()
    // The page is drawn with the rows still on their way; read them once they are in.
    await table.getByText('Loading rows…').waitFor({ state: 'detached', timeout: 20_000 })
    expect(await table.locator('thead').textContent()).toContain(M.image)
    const firstRow = await table.locator('tbody tr').first().locator('td').allTextContents()
    expect(firstRow.map(t => t.trim())).toEqual(['1', M.script, '1840.00', M.svg])
    await expect(table.getByText(M.template, { exact: true }).count()).resolves.toBeGreaterThan(0)
    await screenshot(page, 'hostile-dataset')
    await expectNothingRan(page, dialogs)
    expect(errors).toEqual([])
    await page.close()
  })

  it('shows an investigation\'s title, prose and review note literally, and its chart CSV neutralises formula cells', async () => {
    const { page, dialogs, errors } = await watchedPage()
    await page.goto(`${baseUrl}/investigations/${investigationId}`)
    const prose = page.locator('.ProseMirror').first()
    await prose.waitFor({ timeout: 10_000 })
    expect(await prose.textContent()).toBe(Object.values(M).join(''))
    expect(await page.getByLabel('Title of the investigation').inputValue()).toBe(TITLE)
    // The analysis block's form names its dataset by the title, as text.
    await expect.poll(() => page.getByLabel('Dataset').evaluate((el: HTMLSelectElement) => el.selectedOptions[0]?.text), { timeout: 10_000 }).toBe(TITLE)
    expect(await page.getByLabel('Number column').inputValue()).toBe(F.hyperlink)
    await expect(page.getByText(`“${NOTE}”`).count()).resolves.toBeGreaterThan(0)

    await page.getByRole('button', { name: /Run the test|Run again/ }).click()
    const csvButton = page.getByRole('button', { name: 'Data behind the chart (CSV)' })
    await csvButton.waitFor({ timeout: 20_000 })
    const [download] = await Promise.all([page.waitForEvent('download'), csvButton.click()])
    const rows = Papa.parse<string[]>(await readFile((await download.path())!, 'utf8'), { skipEmptyLines: true }).data
    const header = rows[0]!
    expect(header.slice(0, 4)).toEqual(['dataset', 'dataset_sha256', 'test', 'column'])
    const [column, bin] = [header.indexOf('column'), header.indexOf('bin')]
    // The column name is a formula: it arrives with the apostrophe that makes a spreadsheet show it as text (OWASP, "CSV Injection").
    expect(rows.slice(1).map(r => r[column])).toEqual(rows.slice(1).map(() => `'${F.hyperlink}`))
    // The repeated negative amounts are bins of plain numbers, left as numbers.
    expect(rows.slice(1).map(r => r[bin]).sort()).toEqual(['-215.5', '-99.1'])
    for (const cell of rows.flat()) if (/^[=+\-@\t\r]/.test(cell)) expect(cell).toMatch(/^-\d+(\.\d+)?$/)

    await screenshot(page, 'hostile-investigation')
    await expectNothingRan(page, dialogs)
    expect(errors).toEqual([])
    await page.close()
  })
})
