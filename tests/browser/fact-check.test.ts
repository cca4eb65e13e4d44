import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import demo from '../../server/services/demo/people.json'
import { launchBrowser, screenshot, signInThroughPage } from '../support/browser'

let browser: Browser
beforeAll(async () => {
  browser = await launchBrowser()
})
afterAll(async () => {
  await browser?.close()
})

const person = (role: string) => demo.people.find(p => p.role === role)!

/** Signs in and opens the demo investigation, as the person with `role`. */
async function openDemoStory(role: string): Promise<Page> {
  const page = await (await browser.newContext({ viewport: { width: 1400, height: 1000 } })).newPage()
  await signInThroughPage(page, person(role).email, demo.password)
  await page.waitForURL(/\/newsrooms\//)
  await page.getByRole('link', { name: /Invoices that stop just short/ }).click()
  await page.waitForURL(/\/investigations\//)
  await page.locator('.ProseMirror').first().waitFor()
  return page
}

describe('a fact-checker locks a claim', () => {
  it('keeps the locked passage as it was when the reporter tries to change it', async () => {
    const reporter = await openDemoStory('reporter')
    const firstParagraph = reporter.locator('.ProseMirror p').first()
    await firstParagraph.click({ clickCount: 3 })
    await reporter.getByRole('button', { name: /Mark the selected passage as a claim/ }).first().click()
    await reporter.getByText('Claim · not checked yet').waitFor({ timeout: 10_000 })
    await reporter.locator('aside').first().getByRole('checkbox').first().check()
    await reporter.context().close()

    const checker = await openDemoStory('fact-checker')
    await checker.getByRole('button', { name: 'Verify and lock' }).first().click()
    await checker.getByText('Claim · verified and locked').waitFor({ timeout: 10_000 })
    await checker.context().close()

    const again = await openDemoStory('reporter')
    await again.getByText('Claim · verified and locked').waitFor({ timeout: 10_000 })
    const paragraph = again.locator('.ProseMirror p').first()
    const before = await paragraph.textContent()
    // Try to delete the passage's first words, then type over it.
    await paragraph.click({ position: { x: 2, y: 8 } })
    await again.keyboard.press('Home')
    for (let i = 0; i < 5; i++) await again.keyboard.press('Delete')
    await again.keyboard.press('Shift+End')
    await again.keyboard.type('Rewritten')
    await again.waitForTimeout(1500)
    expect(await paragraph.textContent()).toBe(before)
    await expect(again.getByText('Settings locked').count()).resolves.toBeGreaterThan(0)
    await screenshot(again, 'claim-locked')

    // Reload: the server kept the locked text too.
    await again.reload()
    await again.getByText('Claim · verified and locked').waitFor({ timeout: 10_000 })
    expect(await again.locator('.ProseMirror p').first().textContent()).toBe(before)
    await again.context().close()
  })
})
