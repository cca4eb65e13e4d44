import { execFileSync } from 'node:child_process'
import { mkdirSync, readdirSync, readFileSync, rmSync } from 'node:fs'
import { createRequire } from 'node:module'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, BrowserContext, Page } from 'playwright-core'
import { baseUrl, signedIn } from '../support/api'
import demo from '../../server/services/demo/people.json'
import { PLANTED_VENDOR } from '../../server/services/demo/payments'
import { artifacts, launchBrowser, screenshot, waitForApp } from '../support/browser'
import { createTestNewsroom, PASSWORD } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { CLAIM_TEXT, expectStatus, postClaim, uploadPayments, writeStory } from '../support/stories'

// axe-core (Deque's accessibility engine, pinned in package.json) checks each page in the browser.
const axeSource = readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8')
const PHONE = 390
const DESKTOP = 1366

let browser: Browser
let desk: TestNewsroom
let demoNewsroomId: string
let demoStoryId: string
let demoDatasetId: string
let publishedPath: string
let embedIndex: number
let storyId: string
const person = (role: string) => demo.people.find(p => p.role === role)!

beforeAll(async () => {
  browser = await launchBrowser()
  // The demo newsroom holds the full story: wide ranking tables, long fingerprints, many bins.
  const editor = await signedIn(person('data-editor').email, demo.password)
  demoNewsroomId = (await editor.get('/api/me')).body.memberships[0].newsroomId
  const stories = (await editor.get(`/api/investigations?newsroomId=${demoNewsroomId}`)).body
  demoStoryId = stories.find((i: { title: string }) => i.title.startsWith('Invoices that stop')).id
  demoDatasetId = (await editor.get(`/api/datasets?newsroomId=${demoNewsroomId}`)).body[0].id
  // The demo holds a disputed claim, which publishing names with its own reason.
  const panel = await editor.get(`/api/investigations/${demoStoryId}/publishing`)
  const disputed = panel.body.blockers.filter((b: { kind: string }) => b.kind === 'disputed-claim').map((b: { id: string }) => b.id)
  const reason = 'Browser test of layout and print.'
  const published = await editor.post(`/api/investigations/${demoStoryId}/publish`, { reason, ...(disputed.length ? { disputed: { claimIds: disputed, reason } } : {}) })
  expectStatus(published, 201)
  publishedPath = new URL(published.body.url).pathname
  const snapshot = await (await fetch(`${baseUrl}/api${publishedPath.replace('/p/', '/public/')}`)).json()
  embedIndex = snapshot.blocks.findIndex((b: { kind: string, result: unknown }) => b.kind === 'analysis' && b.result)

  // A fresh newsroom of our own, so the phone fact-check below changes nothing another test reads.
  desk = await createTestNewsroom('Layout desk')
  const datasetId = await uploadPayments(desk.reporter, desk.id)
  const story = await writeStory(desk.reporter, desk.id, datasetId)
  expectStatus(await postClaim(desk.reporter, story), 201)
  expectStatus(await desk.reporter.post(`/api/blocks/${story.analysisBlockId}/run`), 200)
  storyId = story.id
}, 120_000)
afterAll(async () => {
  await browser?.close()
})

async function open(width: number, who: { email: string, password: string } | null, path: string): Promise<{ page: Page, context: BrowserContext }> {
  const context = await browser.newContext({ viewport: { width, height: 900 } })
  const page = await context.newPage()
  if (who) expect((await page.request.post(`${baseUrl}/api/auth/login`, { data: who })).status()).toBe(200)
  await page.goto(`${baseUrl}${path}`)
  await waitForApp(page)
  await page.waitForLoadState('networkidle')
  if (await page.locator('.chart-box').count()) await page.locator('.chart-box svg').first().waitFor({ timeout: 20_000 })
  return { page, context }
}

const demoPerson = (role: string) => ({ email: person(role).email, password: demo.password })
function mainPages() {
  return [
    { name: 'sign-in', who: null, path: '/login' },
    { name: 'investigations', who: demoPerson('reporter'), path: `/newsrooms/${demoNewsroomId}` },
    ...['reporter', 'data-editor', 'fact-checker', 'admin'].map(role => ({ name: `investigation as ${role}`, who: demoPerson(role), path: `/investigations/${demoStoryId}` })),
    { name: 'datasets', who: demoPerson('data-editor'), path: `/newsrooms/${demoNewsroomId}/datasets` },
    { name: 'dataset', who: demoPerson('data-editor'), path: `/datasets/${demoDatasetId}` },
    { name: 'members', who: demoPerson('admin'), path: `/newsrooms/${demoNewsroomId}/members` },
    { name: 'account', who: demoPerson('reporter'), path: '/account' },
    { name: 'notifications', who: demoPerson('reporter'), path: '/notifications' },
    { name: 'published page', who: null, path: publishedPath },
    { name: 'chart embed', who: null, path: `${publishedPath.replace('/p/', '/embed/')}/${embedIndex}` },
  ]
}

/** What sticks out past the right edge of the screen, outside any box that scrolls or clips. */
function overflowing(page: Page) {
  return page.evaluate(() => {
    const inBox = (element: Element) => {
      for (let parent = element.parentElement; parent && parent !== document.body; parent = parent.parentElement) {
        if (['auto', 'scroll', 'hidden', 'clip'].includes(getComputedStyle(parent).overflowX)) return true
      }
      return false
    }
    const wide = [...document.querySelectorAll('body *')].filter(e => e.getBoundingClientRect().right > window.innerWidth + 1 && !inBox(e))
    return { scrollWidth: document.documentElement.scrollWidth, wide: wide.slice(0, 5).map(e => `${e.tagName.toLowerCase()}.${String(e.className).slice(0, 40)}`) }
  })
}

describe('every main page at phone width (390 px)', () => {
  it('is no wider than the screen', async () => {
    const failures: string[] = []
    for (const target of mainPages()) {
      const { page, context } = await open(PHONE, target.who, target.path)
      // The page itself, not a sign-in page it sent the visitor to.
      expect(new URL(page.url()).pathname, target.name).toBe(target.path)
      const { scrollWidth, wide } = await overflowing(page)
      if (scrollWidth > PHONE) failures.push(`${target.name}: ${scrollWidth} px wide (${wide.join(', ')})`)
      await screenshot(page, `phone-${target.name.replaceAll(' ', '-')}`)
      await context.close()
    }
    expect(failures).toEqual([])
  }, 240_000)

  it('folds the header into a menu that reaches Members and Sign out', async () => {
    const { page, context } = await open(PHONE, demoPerson('admin'), `/newsrooms/${demoNewsroomId}`)
    const menu = page.getByRole('button', { name: 'Menu' })
    await expect(menu.getAttribute('aria-expanded')).resolves.toBe('false')
    await menu.click()
    const members = page.locator('#site-menu').getByRole('link', { name: 'Members' })
    const signOut = page.locator('#site-menu').getByRole('button', { name: 'Sign out' })
    for (const control of [members, signOut]) {
      const box = (await control.boundingBox())!
      expect(box.x).toBeGreaterThanOrEqual(0)
      expect(box.x + box.width).toBeLessThanOrEqual(PHONE)
    }
    await members.click()
    await page.waitForURL(/\/members$/)
    await page.getByRole('heading', { level: 1, name: 'Members' }).waitFor()
    await context.close()
  })

  it('lets a fact-checker read the claim, dispute it and then verify it on a phone', async () => {
    const { page, context } = await open(PHONE, { email: desk.emails['fact-checker'], password: PASSWORD }, `/investigations/${storyId}`)
    await page.getByText(CLAIM_TEXT).first().waitFor()
    const note = page.locator('article', { hasText: CLAIM_TEXT })
    await note.getByRole('button', { name: 'Dispute' }).click()
    await note.getByLabel('What is wrong or missing?').fill('The count of payments starting with 1 is two in six, not two in five.')
    await note.getByRole('button', { name: 'Dispute' }).click()
    await note.getByText(/disputed/i).first().waitFor({ timeout: 10_000 })
    const verify = note.getByRole('button', { name: 'Verify and lock' })
    const box = (await verify.boundingBox())!
    expect(box.x + box.width).toBeLessThanOrEqual(PHONE)
    await verify.click()
    await note.getByText('Claim · verified and locked').waitFor({ timeout: 10_000 })
    expect((await overflowing(page)).scrollWidth).toBeLessThanOrEqual(PHONE)
    await screenshot(page, 'phone-fact-checker-verified')
    await context.close()
  })
})

describe('a published chart’s embed', () => {
  it('shows the chart with its words, its numbers as a table and a link back to the story', async () => {
    const context = await browser.newContext({ viewport: { width: 700, height: 900 } })
    const page = await context.newPage()
    await page.goto(`${baseUrl}${publishedPath.replace('/p/', '/embed/')}/${embedIndex}`)
    await page.locator('.chart-figure .chart-box svg').waitFor({ timeout: 20_000 })
    await expect(page.locator('figcaption').textContent()).resolves.toMatch(/values of “amount”/)
    await expect(page.getByText('A screen, not proof.').count()).resolves.toBe(1)
    await page.getByText('The numbers behind the chart').click()
    expect(await page.locator('table tbody tr').count()).toBeGreaterThanOrEqual(9)
    await expect(page.getByRole('link', { name: /Invoices that stop just short/ }).getAttribute('href')).resolves.toBe(publishedPath)
    await screenshot(page, 'embed')
    await context.close()
  })
})

describe('accessibility (axe-core, WCAG 2 AA rules)', () => {
  it('finds no serious or critical violation on the main pages, at desktop and phone width', async () => {
    const failures: string[] = []
    for (const width of [DESKTOP, PHONE]) {
      for (const target of mainPages()) {
        const { page, context } = await open(width, target.who, target.path)
        // Evaluated through the DevTools protocol, so the page's Content-Security-Policy does not block it.
        await page.evaluate(axeSource)
        const violations = await page.evaluate(async () => {
          const axe = (window as unknown as { axe: { run: (context: Document, options: object) => Promise<{ violations: Array<{ id: string, impact: string, nodes: Array<{ target: string[] }> }> }> } }).axe
          const result = await axe.run(document, { runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'] } })
          return result.violations.filter(v => v.impact === 'serious' || v.impact === 'critical').map(v => `${v.id} (${v.impact}) at ${v.nodes.slice(0, 3).map(n => n.target.join(' ')).join('; ')}`)
        })
        failures.push(...violations.map(v => `${target.name} at ${width} px: ${v}`))
        await context.close()
      }
    }
    expect(failures).toEqual([])
  }, 480_000)
})

/** Prints the page to PDF as Chromium does, and reads each printed page back as text and as an image (poppler). */
async function printed(page: Page, name: string) {
  await page.emulateMedia({ media: 'print' })
  const pdf = join(artifacts, `${name}.pdf`)
  await page.pdf({ path: pdf, format: 'A4', printBackground: true })
  const pages = Number(/Pages:\s+(\d+)/.exec(execFileSync('pdfinfo', [pdf], { encoding: 'utf8' }))![1])
  const texts = Array.from({ length: pages }, (_, i) => execFileSync('pdftotext', ['-f', String(i + 1), '-l', String(i + 1), '-layout', pdf, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' '))
  const folder = join(artifacts, `${name}-pages`)
  // A fresh folder: an earlier print with fewer than ten pages left page-1.png … beside page-01.png ….
  rmSync(folder, { recursive: true, force: true })
  mkdirSync(folder, { recursive: true })
  execFileSync('pdftoppm', ['-png', '-r', '60', pdf, join(folder, 'page')])
  return { pages, texts, images: readdirSync(folder).filter(f => f.endsWith('.png')) }
}

describe('printing (Chromium’s PDF, read back with poppler)', () => {
  for (const target of ['published page', 'draft'] as const) {
    it(`prints the ${target} without controls, each chart full width and on one page with its summary`, async () => {
      const path = target === 'draft' ? `/investigations/${demoStoryId}` : publishedPath
      const { page, context } = await open(1200, target === 'draft' ? demoPerson('data-editor') : null, path)
      await page.emulateMedia({ media: 'print' })
      expect(await page.locator('button:visible, select:visible, textarea:visible').count()).toBe(0)
      const figures = await page.locator('.chart-figure').evaluateAll(nodes => nodes.map(node => ({
        title: node.querySelector('h3')!.textContent!.trim(),
        subtitle: node.querySelector('h3 + p')!.textContent!.trim(),
        summary: node.querySelector('figcaption')!.textContent!.trim(),
        width: node.querySelector('.chart-box svg')!.getBoundingClientRect().width,
        column: node.getBoundingClientRect().width,
      })))
      expect(figures.length).toBeGreaterThanOrEqual(3)
      // Every chart fills its figure's width, so the second prints as wide as the first.
      for (const figure of figures) expect(figure.width).toBeGreaterThan(figure.column - 2)
      const { pages, texts, images } = await printed(page, `print-${target.replace(' ', '-')}`)
      expect(images).toHaveLength(pages)
      const words = (text: string) => text.replace(/\s+/g, ' ').slice(0, 40)
      for (const figure of figures) {
        // The title, the line under it and the summary under the chart all land on one printed page.
        const together = texts.some(t => t.includes(words(figure.title)) && t.includes(words(figure.subtitle)) && t.includes(words(figure.summary)))
        expect(together, `“${figure.title}” (${figure.subtitle}) prints on one page with its summary`).toBe(true)
      }
      expect(texts.join(' ')).not.toMatch(/Chart as PNG|Embed this chart|Run again/)
      // The ranked groups keep their names on paper (on screen the draft's names are buttons, which print leaves out).
      expect(texts.join(' ')).toContain(PLANTED_VENDOR)
      await context.close()
    }, 90_000)
  }
})
