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
    // The demo story holds an open claim: “Payments cluster just below that line.”
    const checker = await openDemoStory('fact-checker')
    const note = checker.locator('article', { hasText: 'Payments cluster just below that line.' })
    await note.getByRole('button', { name: 'Verify and lock' }).click()
    await note.getByText('Claim · verified and locked').waitFor({ timeout: 10_000 })
    await checker.context().close()

    const reporter = await openDemoStory('reporter')
    await reporter.locator('article', { hasText: 'Payments cluster just below that line.' }).getByText('Claim · verified and locked').waitFor({ timeout: 10_000 })
    const paragraph = reporter.locator('.ProseMirror p', { hasText: 'Payments cluster just below that line.' })
    const before = await paragraph.textContent()
    // Put the cursor at the end of the passage, try to delete its last words, then select it and type over it.
    await paragraph.click()
    await reporter.keyboard.press('End')
    for (let i = 0; i < 6; i++) await reporter.keyboard.press('Backspace')
    await reporter.keyboard.press('Shift+Home')
    await reporter.keyboard.type('Rewritten')
    await reporter.waitForTimeout(1500)
    expect(await paragraph.textContent()).toBe(before)
    await screenshot(reporter, 'claim-locked')

    // Reload: the server kept the locked text too.
    await reporter.reload()
    const reloaded = reporter.locator('.ProseMirror p', { hasText: 'Payments cluster just below that line.' })
    await reloaded.waitFor({ timeout: 10_000 })
    expect(await reloaded.textContent()).toBe(before)
    await reporter.context().close()
  })
})
