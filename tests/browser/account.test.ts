import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { generate } from 'otplib'
import { baseUrl } from '../support/api'
import { launchBrowser, screenshot, signInThroughPage, waitForApp, watchCspViolations } from '../support/browser'
import { createTestNewsroom, PASSWORD } from '../support/newsroom'

// Issue 18 through the pages: two-factor sign-in set up and used, the throttle's message with its
// way out, confirmation before a role change or a removal, sign out everywhere.

let browser: Browser
beforeAll(async () => {
  browser = await launchBrowser()
})
afterAll(async () => {
  await browser?.close()
})

async function openPage(width = 1366): Promise<{ page: Page, violations: () => Promise<string[]> }> {
  const context = await browser.newContext({ viewport: { width, height: 900 } })
  const page = await context.newPage()
  return { page, violations: await watchCspViolations(page) }
}

describe('the account page', () => {
  it('sets up two-factor sign-in, shows the recovery codes once, and then sign-in asks for the code', async () => {
    const { emails } = await createTestNewsroom('Browser 2FA')
    const { page, violations } = await openPage()
    await signInThroughPage(page, emails.reporter, PASSWORD)
    await page.waitForURL(/\/newsrooms\//)
    await page.goto(`${baseUrl}/account`)
    await waitForApp(page)
    await page.getByRole('button', { name: 'Set up an authenticator app' }).click()
    await page.getByRole('img', { name: 'QR code for your authenticator app' }).waitFor()
    const secret = (await page.locator('code').first().textContent())!.trim()
    await page.getByLabel('Code from the app').fill(await generate({ secret }))
    await page.getByRole('button', { name: 'Turn on two-factor sign-in' }).click()
    const codes = page.getByRole('list', { name: 'Recovery codes' }).getByRole('listitem')
    await codes.first().waitFor()
    expect(await codes.count()).toBe(10)
    await page.getByText('10 recovery codes left').waitFor()
    await screenshot(page, 'account-two-factor-1366')
    await page.setViewportSize({ width: 390, height: 900 })
    await screenshot(page, 'account-two-factor-390')

    // At phone width the header folds Sign out into its menu.
    await page.getByRole('button', { name: 'Menu' }).click()
    await page.locator('#site-menu').getByRole('button', { name: 'Sign out', exact: true }).click()
    await page.waitForURL(/\/login/)
    await signInThroughPage(page, emails.reporter, PASSWORD)
    const codeField = page.getByLabel('Code from your authenticator app')
    await codeField.waitFor()
    await codeField.fill(await generate({ secret, epoch: Math.floor(Date.now() / 1000) + 30 }))
    await page.getByRole('button', { name: 'Sign in' }).click()
    await page.waitForURL(/\/newsrooms\//)
    expect(await violations()).toEqual([])
  })

  it('lists the sessions and signs out everywhere after a confirmation', async () => {
    const { emails } = await createTestNewsroom('Browser sessions')
    const { page } = await openPage(390)
    await signInThroughPage(page, emails['fact-checker'], PASSWORD)
    await page.waitForURL(/\/newsrooms\//)
    await page.goto(`${baseUrl}/account`)
    await waitForApp(page)
    await page.getByText('this browser').waitFor()
    await page.getByRole('button', { name: 'Sign out everywhere…' }).click()
    await page.getByRole('button', { name: 'Sign out everywhere', exact: true }).click()
    await page.waitForURL(/\/login/)
    await page.goto(`${baseUrl}/account`)
    await page.waitForURL(/\/login/)
  })
})

describe('the sign-in page under the throttle', () => {
  it('says when to try again and leads to the reset', async () => {
    const { emails } = await createTestNewsroom('Browser throttle')
    const { page } = await openPage(390)
    await page.goto(`${baseUrl}/login`)
    await waitForApp(page)
    for (let i = 0; i < 6; i++) {
      await page.getByLabel('E-mail').fill(emails['data-editor'])
      await page.getByLabel('Password').fill(`wrong-password-${i}`)
      await Promise.all([
        page.waitForResponse(response => response.url().endsWith('/api/auth/login')),
        page.getByRole('button', { name: 'Sign in' }).click(),
      ])
    }
    await expect(page.getByRole('alert').first().textContent()).resolves.toMatch(/Try again in \d+ seconds/)
    await screenshot(page, 'sign-in-throttled-390')
    await page.getByRole('link', { name: 'Reset your password' }).click()
    await page.waitForURL(/\/forgot-password/)
    await expect(page.getByLabel('E-mail').inputValue()).resolves.toBe(emails['data-editor'])
    await page.getByRole('button', { name: 'Send the link' }).click()
    await page.getByText('If that address has a Mantissa account').waitFor()
  })
})

describe('the members page', () => {
  it('asks before changing a role or removing someone, and a cancel changes nothing', async () => {
    const newsroom = await createTestNewsroom('Browser members')
    const { page } = await openPage()
    await signInThroughPage(page, newsroom.emails.admin, PASSWORD)
    await page.waitForURL(/\/newsrooms\//)
    await page.goto(`${baseUrl}/newsrooms/${newsroom.id}/members`)
    await waitForApp(page)
    const roleOf = async () => ((await newsroom.admin.get(`/api/newsrooms/${newsroom.id}/members`)).body as { name: string, role: string }[])
      .find(m => m.name === newsroom.names.reporter)!.role

    await page.getByLabel(`Role of ${newsroom.names.reporter}`).selectOption('fact-checker')
    const confirmation = page.getByRole('group', { name: 'Confirm the change' })
    await expect(confirmation.textContent()).resolves.toContain(`Make ${newsroom.names.reporter} fact-checker instead of reporter?`)
    await screenshot(page, 'members-confirm-role-1366')
    expect(await roleOf()).toBe('reporter')
    await confirmation.getByRole('button', { name: 'Cancel' }).click()
    expect(await roleOf()).toBe('reporter')

    await page.getByLabel(`Role of ${newsroom.names.reporter}`).selectOption('fact-checker')
    await confirmation.getByRole('button', { name: 'Make fact-checker' }).click()
    await confirmation.waitFor({ state: 'detached' })
    await expect.poll(roleOf).toBe('fact-checker')

    const row = page.getByRole('row').filter({ hasText: newsroom.names['data-editor'] })
    await row.getByRole('button', { name: 'Remove' }).click()
    await expect(confirmation.textContent()).resolves.toContain('signed out everywhere')
    await confirmation.getByRole('button', { name: 'Remove' }).click()
    await expect.poll(async () => ((await newsroom.admin.get(`/api/newsrooms/${newsroom.id}/members`)).body as unknown[]).length).toBe(3)
    expect((await newsroom['data-editor'].get('/api/me')).status).toBe(401)
  })
})
