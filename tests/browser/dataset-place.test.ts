import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { baseUrl } from '../support/api'
import { launchBrowser, screenshot, signInThroughPage, waitForApp } from '../support/browser'
import { delimitedText } from '../support/dataset-files'
import { uploadCsv } from '../support/datasets'
import { createTestNewsroom, PASSWORD } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'

// Issue 19: the rows page keeps its place (page and order) on reload and on Back.

let browser: Browser
let desk: TestNewsroom
let datasetId: string

beforeAll(async () => {
  browser = await launchBrowser()
  desk = await createTestNewsroom('Rows place')
  // 120 rows: three pages of 50; amounts fall as rows go on, so sorting by amount reverses them.
  const rows = Array.from({ length: 120 }, (_, i) => [`Supplier ${String(i + 1).padStart(3, '0')}`, String(5000 - i * 10)])
  datasetId = await uploadCsv(desk.reporter, desk.id, delimitedText({ header: ['vendor', 'amount'], rows }), 'Rows place ledger')
})
afterAll(async () => {
  await browser?.close()
})

/** The row number in the first line of the rows table (the column profile is a table too). */
const firstRowNumber = (page: Page) => page.getByRole('table', { name: 'The dataset\'s rows as imported' }).locator('tbody tr').first().locator('td').first().innerText()

describe('the dataset page', () => {
  it('keeps the page of rows and its order on reload and on Back', async () => {
    const page = await browser.newPage({ viewport: { width: 1366, height: 900 } })
    await signInThroughPage(page, desk.emails.reporter, PASSWORD)
    await page.waitForURL(url => !url.pathname.startsWith('/login'))
    await page.goto(`${baseUrl}/datasets/${datasetId}`)
    await waitForApp(page)
    await page.getByRole('button', { name: /^amount/ }).click()
    await page.waitForURL(/sort=amount/)
    await page.getByRole('navigation', { name: 'Pages of rows' }).getByRole('button', { name: 'Next' }).click()
    await page.waitForURL(/page=2/)
    await expect.poll(() => page.getByText('Page 2 of 3').count()).toBe(1)
    // Ascending amounts: row 120 (the smallest) first, so page 2 starts at row 70.
    await expect.poll(() => firstRowNumber(page)).toBe('70')

    await page.reload()
    await waitForApp(page)
    await expect.poll(() => page.getByText('Page 2 of 3').count()).toBe(1)
    expect(await firstRowNumber(page)).toBe('70')

    await page.getByRole('link', { name: '← All datasets' }).click()
    await page.waitForURL(/\/datasets$/)
    await page.goBack()
    await waitForApp(page)
    await expect.poll(() => page.getByText('Page 2 of 3').count()).toBe(1)
    expect(await firstRowNumber(page)).toBe('70')
    await screenshot(page, 'dataset-rows-kept-place')
    await page.close()
  })
})
