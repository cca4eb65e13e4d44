import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser } from 'playwright-core'
import demo from '../../server/services/demo/people.json'
import { baseUrl } from '../support/api'
import { launchBrowser, screenshot, signInThroughPage, waitForApp } from '../support/browser'

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

  it('keeps what a person typed before the page became interactive', async () => {
    const person = demo.people[0]!
    for (let attempt = 0; attempt < 3; attempt++) {
      const context = await browser.newContext()
      const page = await context.newPage()
      // A slow connection: the page is drawn, its scripts arrive only once the person has typed.
      let release!: () => void
      const typed = new Promise<void>(resolve => (release = resolve))
      await page.route('**/_nuxt/**/*.js', async (route) => {
        await typed
        await route.continue()
      })
      // Module scripts hold DOMContentLoaded back: wait only for the drawn form.
      await page.goto(`${baseUrl}/login`, { waitUntil: 'commit' })
      await page.getByLabel('E-mail').click()
      await page.keyboard.type(person.email)
      await page.getByLabel('Password').click()
      await page.keyboard.type(demo.password)
      expect(await page.evaluate(() => Boolean((document.querySelector('#__nuxt') as { __vue_app__?: unknown } | null)?.__vue_app__))).toBe(false)
      release()
      await waitForApp(page)
      await page.waitForTimeout(200)
      expect(await page.getByLabel('E-mail').inputValue()).toBe(person.email)
      expect(await page.getByLabel('Password').inputValue()).toBe(demo.password)
      // And what was kept is what signs in.
      await page.getByRole('button', { name: 'Sign in' }).click()
      await page.waitForURL(/\/newsrooms\//)
      await context.close()
    }
  })
})
