import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { baseUrl } from '../support/api'
import { launchBrowser, screenshot, signInThroughPage, waitForApp, watchCspViolations } from '../support/browser'
import { uploadCsv } from '../support/datasets'
import { createTestNewsroom, PASSWORD } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { QUAY_LEDGER } from '../fixtures/datasets/quay-ledger'

// Issue 19 and docs/product-rules.md ("Cell by cell", "Reading a column again"), at desktop and phone
// width: the profile links to the cells left out, which list their rows and the file's text; the
// ragged rows are listed; the reading form makes a new version read with a decimal comma.
// The ledger's rows are listed in tests/fixtures/datasets/quay-ledger.ts.

let browser: Browser
let desk: TestNewsroom

beforeAll(async () => {
  browser = await launchBrowser()
  desk = await createTestNewsroom('Cells in the browser')
})
afterAll(async () => {
  await browser?.close()
})

const pageWidth = (page: Page) => page.evaluate(() => document.documentElement.scrollWidth)
const listedCells = (page: Page) => page.locator('tbody tr').evaluateAll(rows => rows.map(row => [...row.querySelectorAll('td')].map(td => td.textContent!.trim())))

describe.each([1366, 390])('cells, ragged rows and readings at %i px', (width) => {
  it('lists the unreadable cells from the profile, the ragged rows from the import message, and reads the column again', async () => {
    const id = await uploadCsv(desk.reporter, desk.id, QUAY_LEDGER, `Quay ledger at ${width}`)
    const page = await browser.newPage({ viewport: { width, height: 900 } })
    page.setDefaultTimeout(15_000)
    const violations = await watchCspViolations(page)
    await signInThroughPage(page, desk.emails.reporter, PASSWORD)
    await page.waitForURL(url => !url.pathname.startsWith('/login'))
    await page.goto(`${baseUrl}/datasets/${id}`)
    await waitForApp(page)

    await page.getByRole('link', { name: /^3 unreadable in amount/ }).click()
    await page.waitForURL(/\/cells\?column=amount&status=unreadable/)
    await expect.poll(() => page.getByRole('heading', { level: 2 }).textContent()).toBe('3 cells that could not be read as a number in “amount”')
    expect(await listedCells(page)).toEqual([['2', '93,19'], ['3', '1.337,69'], ['5', 'n/a']])
    expect(await page.getByRole('link', { name: 'Download all 3 as CSV' }).getAttribute('href')).toBe(`/api/datasets/${id}/cells?column=amount&status=unreadable&format=csv`)
    expect(await pageWidth(page)).toBeLessThanOrEqual(width)
    await screenshot(page, `dataset-cells-${width}`)
    // The choice lives in the address: another status, then Back and reload, come back to it.
    await page.getByLabel('Cells', { exact: true }).selectOption('negative')
    await page.waitForURL(/status=negative/)
    await expect.poll(() => listedCells(page)).toEqual([['6', '(250.00)']])
    await page.reload()
    await waitForApp(page)
    await expect.poll(() => listedCells(page)).toEqual([['6', '(250.00)']])

    await page.goto(`${baseUrl}/datasets/${id}`)
    await waitForApp(page)
    await page.getByRole('link', { name: 'list them' }).click()
    await page.waitForURL(/\/ragged/)
    await expect.poll(() => listedCells(page)).toEqual([['9', '5', '(1) late entry(2) see memo'], ['10', '2', 'none: the row is short']])
    expect(await pageWidth(page)).toBeLessThanOrEqual(width)
    await screenshot(page, `dataset-ragged-${width}`)

    await page.goBack()
    await waitForApp(page)
    // The rows page shows the extra cells as columns of their own.
    await expect.poll(() => page.getByRole('columnheader', { name: '(extra 2)' }).count()).toBe(1)
    await page.getByText('Read the columns another way').click()
    const amount = page.getByRole('group', { name: /^amount/ })
    await amount.getByLabel('Decimal separator').selectOption(',')
    expect(await pageWidth(page)).toBeLessThanOrEqual(width)
    await screenshot(page, `dataset-reading-form-${width}`)
    await page.getByRole('button', { name: 'Make a new version read this way' }).click()
    await page.waitForURL(url => url.pathname.startsWith('/datasets/') && !url.pathname.includes(id))
    await waitForApp(page)
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toContain('reading 2')
    expect(await page.getByRole('heading', { name: 'Versions of this file' }).count()).toBe(1)
    expect(await page.getByText('“amount”: decimal comma').count()).toBe(1)
    // Read with a decimal comma, the cells written with a point are the unreadable ones (rows 1, 5, 6, 7, 9, 10, 11).
    await page.getByRole('link', { name: /^7 unreadable in amount/ }).click()
    await page.waitForURL(/\/cells\?/)
    await expect.poll(() => listedCells(page).then(rows => rows.map(r => r[0]))).toEqual(['1', '5', '6', '7', '9', '10', '11'])
    await page.goBack()
    await waitForApp(page)
    await screenshot(page, `dataset-reading-2-${width}`)
    expect(await violations()).toEqual([])
    await page.close()
  })
})
