import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import demo from '../../server/services/demo/people.json'
import { launchBrowser, screenshot, signInThroughPage, watchCspViolations } from '../support/browser'

let browser: Browser
beforeAll(async () => {
  browser = await launchBrowser()
})
afterAll(async () => {
  await browser?.close()
})

const reporter = demo.people.find(p => p.role === 'reporter')!

describe('writing an investigation', () => {
  it('writes a paragraph, runs an analysis block on the demo ledger, and opens the rows behind a bin', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 1000 } })
    const errors: string[] = []
    page.on('pageerror', error => errors.push(error.message))
    // Vue reports a page the server drew differently from the browser's first render as a console error.
    page.on('console', (message) => {
      if (message.type() === 'error' && /hydration/i.test(message.text())) errors.push(message.text())
    })
    const cspViolations = await watchCspViolations(page)
    await signInThroughPage(page, reporter.email, demo.password)
    await page.waitForURL(/\/newsrooms\//)
    await page.getByLabel('Working title').fill('Browser test story')
    await page.getByRole('button', { name: 'Start writing' }).click()
    await page.waitForURL(/\/investigations\//)

    await page.locator('.ProseMirror').first().click()
    await page.keyboard.type('Suppliers were paid thousands of times last year.')
    await expect.poll(() => page.getByText('Saved', { exact: true }).count(), { timeout: 10_000 }).toBeGreaterThan(0)

    await page.getByRole('button', { name: '+ Analysis' }).last().click()
    await page.getByLabel('Dataset').selectOption({ label: 'Port Averly supplier payments, 2025' })
    await expect.poll(() => page.getByLabel('Number column').isEnabled()).toBe(true)
    await page.getByLabel('Number column').selectOption('amount')
    await page.getByLabel('Test', { exact: true }).selectOption('first-digit')
    await page.getByRole('button', { name: 'Run the test' }).click()

    const chart = page.locator('.chart-box svg').first()
    await chart.waitFor({ timeout: 20_000 })
    await expect(page.locator('figcaption').first().textContent()).resolves.toMatch(/First digit of 24,600 values of “amount”/)
    await expect(page.getByText('A screen, not proof.').count()).resolves.toBeGreaterThan(0)

    // Click the column of the leading digit 1, as a reader would.
    await page.locator('.chart-box svg path[aria-roledescription="bar"][aria-label*="Count"]').first().click()
    await page.getByRole('heading', { name: /Rows behind “1”/ }).waitFor({ timeout: 10_000 })
    const rowsPanel = page.locator('section[aria-labelledby="bin-rows-heading"]')
    await rowsPanel.getByText(/Page 1 of/).waitFor({ timeout: 10_000 })
    expect(await rowsPanel.locator('tbody tr').count()).toBe(25)
    await screenshot(page, 'investigation-analysis')
    // The chart drew under the Content-Security-Policy, which forbids evaluating strings: nothing was blocked.
    expect(await cspViolations()).toEqual([])

    // The paragraph survived: reload and read it back from the server.
    await page.reload()
    await expect(page.locator('.ProseMirror').first().textContent({ timeout: 10_000 })).resolves.toContain('Suppliers were paid thousands of times last year.')
    expect(errors).toEqual([])
    expect(await cspViolations()).toEqual([])
    await page.close()
  })
})

async function newAnalysis(page: Page, title: string) {
  await signInThroughPage(page, reporter.email, demo.password)
  await page.waitForURL(/\/newsrooms\//)
  await page.getByLabel('Working title').fill(title)
  await page.getByRole('button', { name: 'Start writing' }).click()
  await page.waitForURL(/\/investigations\//)
  await page.getByRole('button', { name: '+ Analysis' }).last().click()
  await page.getByLabel('Dataset').selectOption({ label: 'Port Averly supplier payments, 2025' })
  await expect.poll(() => page.getByLabel('Number column').isEnabled()).toBe(true)
  await page.getByLabel('Number column').selectOption('amount')
  await page.getByLabel('Test', { exact: true }).selectOption('first-digit')
}

// The demo ledger (server/services/demo/payments.ts) pays on dates of 2025 written 2025-03-15, in four departments.
describe('asking a dataset several questions from one block', () => {
  for (const [width, height] of [[1366, 1000], [390, 900]] as const) {
    it(`filters, groups by month, opens a month on its own and comes back, at ${width} px`, async () => {
      const page = await browser.newPage({ viewport: { width, height } })
      const errors: string[] = []
      page.on('pageerror', error => errors.push(error.message))
      const cspViolations = await watchCspViolations(page)
      await newAnalysis(page, `Questions at ${width}`)

      // Two conditions at once: a date range and a floor on the amount.
      await page.getByRole('button', { name: 'Add a condition' }).click()
      await page.getByLabel('Condition 1: column').selectOption('paid_on')
      await page.getByLabel('Condition 1: from').fill('2025-02-01')
      await page.getByLabel('Condition 1: to').fill('2025-11-30')
      await page.getByLabel('Condition 1: to').dispatchEvent('change')
      await page.getByRole('button', { name: 'Add a condition' }).click()
      await page.getByLabel('Condition 2: column').selectOption('amount')
      await page.getByLabel('Condition 2: at least').fill('50')
      await page.getByLabel('Condition 2: at least').dispatchEvent('change')
      await page.getByLabel('Rank groups by').selectOption('paid_on')
      await expect(page.getByLabel('Period').inputValue()).resolves.toBe('month')
      await page.getByRole('button', { name: 'Run the test' }).click()

      // Ten months in the range, in date order, with the sentence under their chart.
      const caption = page.locator('#period-chart-caption')
      await caption.waitFor({ timeout: 30_000 })
      await expect(caption.textContent()).resolves.toMatch(/^10 months tested, in date order/)
      await screenshot(page, `questions-periods-${width}`)

      // A month opens on its own: its chart and the way back.
      await page.getByRole('button', { name: 'Open 2025-03 on its own' }).click()
      await page.getByRole('heading', { name: /month of “paid_on”: “2025-03” on its own/ }).waitFor({ timeout: 30_000 })
      await page.locator('section[aria-labelledby="group-result-heading"] figure svg').first().waitFor({ timeout: 20_000 })
      await expect(page.locator('section[aria-labelledby="group-result-heading"] figcaption').first().textContent()).resolves.toMatch(/First digit of [\d,]+ values of “amount”/)

      // The rows behind the leading digit of that month: searched and sorted in the browser.
      await page.locator('section[aria-labelledby="group-result-heading"] figure svg path[aria-roledescription="bar"][aria-label*="Count"]').first().click({ force: true })
      const rows = page.locator('section[aria-labelledby="bin-rows-heading"]')
      await rows.getByText(/Page 1 of/).waitFor({ timeout: 20_000 })
      await screenshot(page, `questions-group-rows-before-sort-${width}`)
      await rows.getByRole('button', { name: 'amount', exact: true }).click()
      await rows.locator('th[aria-sort="ascending"]').waitFor({ timeout: 10_000 })
      const firstAmounts = await rows.locator('tbody tr').evaluateAll(trs => trs.slice(0, 5).map(tr => (tr as HTMLTableRowElement).cells[6]!.textContent!.trim()))
      const values = firstAmounts.map(text => Number(text.replace(/[^\d.]/g, '')))
      expect(values).toEqual([...values].sort((a, b) => a - b))
      const dates = await rows.locator('tbody tr').evaluateAll(trs => trs.map(tr => (tr as HTMLTableRowElement).cells[2]!.textContent!.trim()))
      expect(dates.every(d => d.startsWith('2025-03'))).toBe(true)
      await screenshot(page, `questions-group-rows-${width}`)

      await page.getByRole('button', { name: '← Back to all groups' }).click()
      await caption.waitFor({ timeout: 10_000 })
      expect(errors).toEqual([])
      expect(await cspViolations()).toEqual([])
      await page.close()
    })
  }
})
