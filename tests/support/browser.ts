import { mkdirSync } from 'node:fs'
import { join } from 'node:path'
import { chromium } from 'playwright-core'
import type { Browser, Page } from 'playwright-core'
import type { Role } from '#shared/auth/roles'
import { baseUrl } from './api'
import { createTestNewsroom, PASSWORD } from './newsroom'
import type { TestNewsroom } from './newsroom'
import { uploadPayments } from './stories'
import type { Story } from './stories'

// Flags that keep Debian's Chromium quiet on a closed network (../shared/STACK.md).
const ARGS = ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync']

export const artifacts = join(process.cwd(), 'tests', '.artifacts')

export function launchBrowser(): Promise<Browser> {
  return chromium.launch({ executablePath: '/usr/bin/chromium', args: ARGS, headless: true })
}

/** Signs in through the page, as a person would. */
export async function signInThroughPage(page: Page, email: string, password: string) {
  await page.goto(`${baseUrl}/login`)
  await waitForApp(page)
  await page.getByLabel('E-mail').fill(email)
  await page.getByLabel('Password').fill(password)
  await page.getByRole('button', { name: 'Sign in' }).click()
}

/**
 * Waits until Vue has taken over the server-rendered page: a click before that reaches no handler
 * (on a loaded machine the sign-in button was pressed before it could do anything).
 */
export async function waitForApp(page: Page) {
  await page.waitForFunction(() => Boolean((document.querySelector('#__nuxt') as { __vue_app__?: unknown } | null)?.__vue_app__))
}

/**
 * Collects the Content-Security-Policy violations a page reports, as the browser's
 * `securitypolicyviolation` events and its console lines, for the test to expect none.
 */
export async function watchCspViolations(page: Page): Promise<() => Promise<string[]>> {
  const lines: string[] = []
  page.on('console', (message) => {
    if (/Content Security Policy/i.test(message.text())) lines.push(message.text())
  })
  await page.addInitScript(() => {
    const seen: string[] = ((window as { cspViolations?: string[] }).cspViolations = [])
    document.addEventListener('securitypolicyviolation', event => seen.push(`${event.effectiveDirective} blocked ${event.blockedURI || 'inline'} at ${event.sourceFile}:${event.lineNumber}:${event.columnNumber}`))
  })
  return async () => [...lines, ...await page.evaluate(() => (window as { cspViolations?: string[] }).cspViolations ?? [])]
}

export async function screenshot(page: Page, name: string) {
  mkdirSync(artifacts, { recursive: true })
  await page.screenshot({ path: join(artifacts, `${name}.png`), fullPage: true })
}

/**
 * Signs in through the page as the test newsroom's member with `role` and opens the investigation
 * `id`, in a fresh context of its own (with the clipboard allowed, for copy buttons).
 */
export async function openInvestigationAs(browser: Browser, newsroom: TestNewsroom, role: Role, id: string, width = 1400): Promise<Page> {
  const context = await browser.newContext({ viewport: { width, height: 1000 } })
  await context.grantPermissions(['clipboard-read', 'clipboard-write'], { origin: baseUrl })
  const page = await context.newPage()
  await signInThroughPage(page, newsroom.emails[role], PASSWORD)
  await page.waitForURL(/\/newsrooms\//)
  await page.goto(`${baseUrl}/investigations/${id}`)
  await page.locator('.ProseMirror').first().waitFor()
  return page
}

/** Opens `story` in the editor as `role`, at 1366 px, once the page is interactive and ready to type. */
export async function openStory(browser: Browser, newsroom: TestNewsroom, role: Role, story: Story): Promise<Page> {
  const page = await openInvestigationAs(browser, newsroom, role, story.id, 1366)
  await waitForApp(page)
  return page
}

/** The PATCH requests the page sends to save `blockId`, as they leave the browser. */
export function watchSaves(page: Page, blockId: string): unknown[] {
  const bodies: unknown[] = []
  page.on('request', (request) => {
    if (request.method() === 'PATCH' && request.url().endsWith(`/api/blocks/${blockId}`)) bodies.push(request.postDataJSON())
  })
  return bodies
}

/** Selects the text of the first element matching `selector` in the page, as a mouse drag over it would. */
export async function selectTextOf(page: Page, selector: string) {
  await page.evaluate((css) => {
    const element = document.querySelector(css)!
    const range = document.createRange()
    range.selectNodeContents(element)
    const selection = window.getSelection()!
    selection.removeAllRanges()
    selection.addRange(range)
  }, selector)
}

/** What most browser test files start from: a browser, a newsroom of their own and its payments dataset. */
export async function openDesk(name: string): Promise<{ browser: Browser, newsroom: TestNewsroom, datasetId: string }> {
  const browser = await launchBrowser()
  const newsroom = await createTestNewsroom(name)
  return { browser, newsroom, datasetId: await uploadPayments(newsroom.reporter, newsroom.id) }
}
