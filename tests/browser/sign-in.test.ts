import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser } from 'playwright-core'
import demo from '../../server/services/demo/people.json'
import { launchBrowser, screenshot, signInThroughPage } from '../support/browser'

let browser: Browser
beforeAll(async () => {
  browser = await launchBrowser()
})
afterAll(async () => {
  await browser?.close()
})

describe('signing in through the page', () => {
  it('shows each demo member their newsroom and role', async () => {
    for (const person of demo.people) {
      const context = await browser.newContext()
      const page = await context.newPage()
      await signInThroughPage(page, person.email, demo.password)
      await page.waitForURL(/\/newsrooms\//)
      await expect(page.getByRole('heading', { level: 1 }).textContent()).resolves.toBe(demo.newsroom)
      await expect(page.locator('header').textContent()).resolves.toContain(person.name)
      if (person.role === 'reporter') await screenshot(page, 'home-reporter')
      await context.close()
    }
  })

  it('tells a person with a wrong password so, and stays on the sign-in page', async () => {
    const context = await browser.newContext()
    const page = await context.newPage()
    await signInThroughPage(page, demo.people[0]!.email, 'not-the-password')
    await expect(page.getByRole('alert').first().textContent()).resolves.toMatch(/does not match/)
    expect(page.url()).toMatch(/\/login/)
    await context.close()
  })
})
