import { createServer } from 'node:http'
import type { Server } from 'node:http'
import type { AddressInfo } from 'node:net'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Frame, Page } from 'playwright-core'
import { baseUrl } from '../support/api'
import { launchBrowser, screenshot, waitForApp } from '../support/browser'
import { uploadCsv } from '../support/datasets'
import { createTestNewsroom, PASSWORD } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { datedPaymentsCsv, publishChart } from '../support/stories'
import type { PublishedChart } from '../support/stories'

// A published chart placed in a story on another site, as a CMS places it: the embed code copied from
// the published page, pasted into a page that another origin serves. The app answers on localhost; the
// other site is a small server of this test on 127.0.0.1, another origin and another site (the site of
// an address is its scheme and registrable host, HTML Living Standard, "Sites"), and both are loopback,
// so the browser's private-network rules do not come into it.
let browser: Browser
let desk: TestNewsroom
let chart: PublishedChart
let otherSite: Server
let otherOrigin: string
let embedCode: string
const pages = new Map<string, string>()

beforeAll(async () => {
  browser = await launchBrowser()
  desk = await createTestNewsroom('Embed desk')
  const datasetId = await uploadCsv(desk.reporter, desk.id, datedPaymentsCsv(), 'Invented quay payments, dated')
  chart = await publishChart(desk.reporter, desk['data-editor'], desk.id, datasetId, 'Quay payments that start with a 1')
  otherSite = createServer((request, response) => {
    const body = pages.get(new URL(request.url!, 'http://x').pathname)
    response.writeHead(body ? 200 : 404, { 'content-type': 'text/html; charset=utf-8' })
    response.end(body ?? 'Not here')
  })
  await new Promise<void>(resolve => otherSite.listen(0, '127.0.0.1', resolve))
  otherOrigin = `http://127.0.0.1:${(otherSite.address() as AddressInfo).port}`
  expect(new URL(otherOrigin).hostname).not.toBe(new URL(baseUrl).hostname)

  // The code as an editor copies it from the published page.
  const page = await browser.newPage()
  await page.goto(`${baseUrl}/p/${chart.token}`)
  await waitForApp(page)
  await page.getByText('Embed this chart in a story').click()
  embedCode = await page.getByLabel('Embed code').inputValue()
  await page.close()
  expect(embedCode).toContain(`src="${baseUrl}/embed/${chart.token}/${chart.index}"`)
}, 120_000)
afterAll(async () => {
  await browser?.close()
  await new Promise(resolve => otherSite?.close(resolve))
})

/** Serves `body` as a story page of the other site and opens it; console lines of every frame are kept. */
async function openStoryElsewhere(path: string, body: string, width: number): Promise<{ page: Page, console: string[] }> {
  pages.set(path, `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>A story elsewhere</title></head><body style="margin:0;font-family:serif">${body}</body></html>`)
  const page = await (await browser.newContext({ viewport: { width, height: 900 } })).newPage()
  const console: string[] = []
  page.on('console', message => console.push(`${message.type()}: ${message.text()}`))
  await page.goto(`${otherOrigin}${path}`)
  return { page, console }
}

function embedFrame(page: Page): Frame {
  const frame = page.frames().find(f => f.url().startsWith(`${baseUrl}/embed/`))
  expect(frame, 'the embed’s frame').toBeDefined()
  return frame!
}

describe('a published chart inside another site’s page', () => {
  for (const column of [340, 720]) {
    it(`draws in a ${column} px column, as wide as the column and as tall as it needs, with its words, its table and the link back`, async () => {
      const { page, console } = await openStoryElsewhere(`/story-${column}`, `<p>A story on another site.</p><div id="column" style="width:${column}px;margin:0 auto">${embedCode}</div><p>The story goes on.</p>`, column + 50)
      const frameElement = page.locator('iframe')
      await frameElement.scrollIntoViewIfNeeded()
      const inside = page.frameLocator('iframe')
      await inside.locator('.chart-figure .chart-box svg').waitFor({ timeout: 30_000 })
      const frame = embedFrame(page)

      // The frame fills the column, and the chart fills the frame less the page's padding, without sideways scrolling.
      const frameBox = (await frameElement.boundingBox())!
      expect(Math.round(frameBox.width)).toBe(column)
      const inner = await frame.evaluate(() => ({
        chart: document.querySelector('.chart-box svg')!.getBoundingClientRect().width,
        box: document.querySelector('.chart-box')!.getBoundingClientRect().width,
        scrollWidth: document.documentElement.scrollWidth,
        clientWidth: document.documentElement.clientWidth,
      }))
      expect(inner.scrollWidth).toBeLessThanOrEqual(inner.clientWidth)
      expect(inner.chart).toBeGreaterThan(inner.box - 2)
      expect(inner.box).toBeGreaterThan(column - 40)

      // The pasted script fits the frame's height to what the embed says it needs: no scroll bar inside, nothing cut off.
      const fitted = async () => frame.evaluate(() => document.documentElement.scrollHeight <= window.innerHeight + 1 && Math.abs(document.body.getBoundingClientRect().height - window.innerHeight) <= 2)
      await expect.poll(fitted, { timeout: 10_000 }).toBe(true)

      // Its words: what was tested, the summary for readers and screen readers, the caution, and the numbers as a table.
      await expect(inside.locator('h3').textContent()).resolves.toMatch(/First digit of “amount”/)
      await expect(inside.locator('figcaption').textContent()).resolves.toMatch(/First digit of 120 values of “amount”/)
      await expect(inside.getByText('A screen, not proof.').count()).resolves.toBe(1)
      await inside.getByText('The numbers behind the chart').click()
      await expect(inside.locator('table tbody tr').count()).resolves.toBe(9)
      // Opening the table made the embed taller, and the frame followed.
      await expect.poll(fitted, { timeout: 10_000 }).toBe(true)
      await inside.getByRole('link', { name: chart.title }).scrollIntoViewIfNeeded()
      await expect(inside.getByRole('link', { name: chart.title }).isVisible()).resolves.toBe(true)
      // Nothing of the embed is scrolled out of sight inside the frame: its title shows at the frame's top.
      expect(await frame.evaluate(() => window.scrollY)).toBe(0)
      await screenshot(page, `embed-elsewhere-${column}`)

      // The app started inside the frame (a browser that refuses a third-party frame its storage once stopped it) and nothing was blocked.
      expect(console.filter(line => /error caught during app initialization|SecurityError|Content Security Policy|Refused to/i.test(line))).toEqual([])
      await page.context().close()
    }, 90_000)
  }

  it('opens the published story in the reader’s whole window from the link back', async () => {
    const { page } = await openStoryElsewhere('/story-link', `<p>A story on another site.</p>${embedCode}`, 900)
    const link = page.frameLocator('iframe').getByRole('link', { name: chart.title })
    await link.waitFor({ timeout: 30_000 })
    await expect(link.getAttribute('target')).resolves.toBe('_top')
    await link.click()
    await page.waitForURL(`${baseUrl}/p/${chart.token}`)
    await page.getByRole('heading', { level: 1, name: chart.title }).waitFor()
    await page.context().close()
  }, 60_000)
})

describe('every other page of Mantissa refuses to be framed by another site', () => {
  it('shows nothing of the draft, the desk, the sign-in page or the published page inside another site’s frame', async () => {
    const targets = [`/investigations/${chart.storyId}`, `/newsrooms/${desk.id}`, '/login', `/p/${chart.token}`]
    const frames = targets.map(path => `<iframe src="${baseUrl}${path}" title="${path}" style="width:600px;height:300px"></iframe>`).join('')
    const context = await browser.newContext({ viewport: { width: 1366, height: 900 } })
    // Signed in, so a framed draft would have something to show if the browser drew it.
    expect((await context.request.post(`${baseUrl}/api/auth/login`, { data: { email: desk.emails.reporter, password: PASSWORD } })).status()).toBe(200)
    const page = await context.newPage()
    const answers = new Map<string, { xFrameOptions?: string, csp?: string }>()
    page.on('response', (response) => {
      const path = new URL(response.url()).pathname
      if (response.request().resourceType() === 'document' && path !== '/framed') answers.set(path, { xFrameOptions: response.headers()['x-frame-options'], csp: response.headers()['content-security-policy'] })
    })
    pages.set('/framed', `<!doctype html><html lang="en"><head><title>Framing</title></head><body>${frames}</body></html>`)
    await page.goto(`${otherOrigin}/framed`)
    await page.waitForLoadState('load')
    const children = page.frames().filter(f => f !== page.mainFrame())
    expect(children).toHaveLength(targets.length)
    for (const frame of children) {
      // Chromium puts its own error page in a frame it refused; none of Mantissa's pages ran there.
      expect(frame.url(), `${frame.name() || 'a frame'} is refused`).not.toMatch(/^http/)
      expect(await frame.evaluate(() => Boolean(document.querySelector('#__nuxt')))).toBe(false)
    }
    for (const path of targets) {
      const answer = answers.get(path)
      expect(answer, `the browser asked for ${path}`).toBeDefined()
      expect(answer!.xFrameOptions).toBe('DENY')
      expect(answer!.csp).toContain('frame-ancestors \'none\'')
    }
    await screenshot(page, 'framing-refused')
    await context.close()
  }, 60_000)
})
