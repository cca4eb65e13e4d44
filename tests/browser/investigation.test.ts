import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser } from 'playwright-core'
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
    await expect.poll(() => page.getByText('Saved').count(), { timeout: 10_000 }).toBeGreaterThan(0)

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
    expect(await rowsPanel.locator('tbody tr').count()).toBe(50)
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
