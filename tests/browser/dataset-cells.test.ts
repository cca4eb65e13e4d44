import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { baseUrl } from '../support/api'
import { launchBrowser, screenshot, signInThroughPage, waitForApp, watchCspViolations } from '../support/browser'
import { upload, uploadCsv } from '../support/datasets'
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

  it('lists a date column\'s cells that name no date from the profile, and a JSON file\'s records with keys past its columns', async () => {
    // By hand: 30/02/2026 (February has no 30th) and "TBC" name no date; the rest are days, day first.
    const csv = 'supplier,amount,paid on\nNorthgate Paving,1840.00,14/02/2026\nQuay Lighting,93.19,30/02/2026\nWillow Drains,1337.69,TBC\nAlder Fencing,412.30,21/03/2026\nHarbour Cranes,2210.00,02/04/2026\n'
    const id = await uploadCsv(desk.reporter, desk.id, csv, `Dated ledger at ${width}`)
    const page = await browser.newPage({ viewport: { width, height: 900 } })
    page.setDefaultTimeout(15_000)
    await signInThroughPage(page, desk.emails.reporter, PASSWORD)
    await page.waitForURL(url => !url.pathname.startsWith('/login'))
    await page.goto(`${baseUrl}/datasets/${id}`)
    await waitForApp(page)
    await page.getByRole('link', { name: /^2 naming no date in paid on/ }).click()
    await page.waitForURL(/\/cells\?column=paid\+on&status=unreadable|\/cells\?column=paid%20on&status=unreadable/)
    await expect.poll(() => page.getByRole('heading', { level: 2 }).textContent()).toBe('2 cells that name no date in “paid on”')
    expect(await listedCells(page)).toEqual([['2', '30/02/2026'], ['3', 'TBC']])
    expect(await page.getByLabel('Cells', { exact: true }).locator('option').allTextContents()).toEqual(['Blank', 'Naming no date'])
    expect(await pageWidth(page)).toBeLessThanOrEqual(width)
    await screenshot(page, `dataset-cells-dates-${width}`)

    // Records 1,001 and 1,002 have keys that the first 1,000 (the columns) have not.
    const records = Array.from({ length: 1002 }, (_, i) => ({ vendor: `Vendor ${i % 9}`, amount: (i + 1) * 3.5, ...(i === 1000 ? { note: 'paid twice' } : {}), ...(i === 1001 ? { approver: 'K. Osei' } : {}) }))
    const reply = await upload(desk.reporter, 'late-keys.json', new TextEncoder().encode(JSON.stringify(records)), { title: `Late keys at ${width}` }, `?newsroomId=${desk.id}`)
    expect(reply.status).toBe(201)
    await page.goto(`${baseUrl}/datasets/${reply.body.id}`)
    await waitForApp(page)
    await expect.poll(() => page.getByText('2 records had keys not among the columns').count()).toBe(1)
    await page.getByRole('link', { name: 'list them' }).click()
    await page.waitForURL(/\/ragged/)
    await expect.poll(() => page.getByRole('heading', { level: 2 }).textContent()).toBe('2 records have keys that are not among the 2 columns')
    expect(await listedCells(page)).toEqual([['1,001', '(1) note: paid twice'], ['1,002', '(1) approver: K. Osei']])
    expect(await pageWidth(page)).toBeLessThanOrEqual(width)
    await screenshot(page, `dataset-json-keys-${width}`)
    await page.close()
  })
})
