import { readFile } from 'node:fs/promises'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { baseUrl } from '../support/api'
import { launchBrowser, openInvestigationAs, screenshot, waitForApp } from '../support/browser'
import { uploadCsv } from '../support/datasets'
import { createTestNewsroom } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { DATED_PAYMENTS_RANGE, datedPaymentsCsv, publishChart, uploadPayments } from '../support/stories'
import type { PublishedChart } from '../support/stories'

// The line under a chart's title names n and the dataset's date range, read from its date column at
// import; everywhere the chart goes (the draft, its image and specification files, the published page,
// the embed) says the same. The expected range is the fixture's own earliest and latest day
// (tests/support/stories.ts). A dataset without a date column states no range at all.
let browser: Browser
let desk: TestNewsroom
let dated: PublishedChart
let undated: PublishedChart
const DATED_SUBTITLE = `n = 120 values tested · ${DATED_PAYMENTS_RANGE}`
// The five payments of uploadPayments, and nothing else: no date column, so no range.
const UNDATED_SUBTITLE = 'n = 5 values tested'

beforeAll(async () => {
  browser = await launchBrowser()
  desk = await createTestNewsroom('Chart dates desk')
  dated = await publishChart(desk.reporter, desk['data-editor'], desk.id, await uploadCsv(desk.reporter, desk.id, datedPaymentsCsv(), 'Invented quay payments, dated'), 'Dated quay payments')
  undated = await publishChart(desk.reporter, desk['data-editor'], desk.id, await uploadPayments(desk.reporter, desk.id), 'Undated harbour payments')
}, 120_000)
afterAll(async () => {
  await browser?.close()
})

const subtitleOf = async (page: Page) => {
  await page.locator('.chart-figure .chart-box svg').first().waitFor({ timeout: 20_000 })
  return (await page.locator('.chart-figure h3 + p').first().textContent())!.trim()
}

/** Every piece of text a file holds, in order, spaces normalised: an SVG's drawn text or a JSON file's strings. */
function wordsOfSvg(svg: string): string {
  const texts = [...svg.matchAll(/<text[^>]*>([\s\S]*?)<\/text>/g)].map(m => m[1]!.replace(/<[^>]+>/g, ' '))
  return texts.join(' ').replaceAll('&amp;', '&').replaceAll('&quot;', '"').replaceAll('&#39;', '\'').replace(/\s+/g, ' ')
}
function wordsOfJson(value: unknown): string {
  const strings: string[] = []
  const walk = (v: unknown) => {
    if (typeof v === 'string') strings.push(v)
    else if (Array.isArray(v)) v.forEach(walk)
    else if (v && typeof v === 'object') Object.values(v).forEach(walk)
  }
  walk(value)
  return strings.join(' ').replace(/\s+/g, ' ')
}

async function downloaded(page: Page, button: string): Promise<string> {
  const [file] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: button }).first().click()])
  return readFile((await file.path())!, 'utf8')
}

async function openPublic(path: string): Promise<Page> {
  const page = await (await browser.newContext({ viewport: { width: 1200, height: 900 } })).newPage()
  await page.goto(`${baseUrl}${path}`)
  await waitForApp(page)
  return page
}

describe('the date range under a chart', () => {
  it('is stated in the draft, and in the chart’s SVG and Vega-Lite files', async () => {
    const page = await openInvestigationAs(browser, desk, 'reporter', dated.storyId, 1366)
    expect(await subtitleOf(page)).toBe(DATED_SUBTITLE)
    await screenshot(page, 'chart-dates-draft')
    expect(wordsOfSvg(await downloaded(page, 'Chart as SVG'))).toContain(DATED_SUBTITLE)
    expect(wordsOfJson(JSON.parse(await downloaded(page, 'Chart specification (Vega-Lite)')))).toContain(DATED_SUBTITLE)
    await page.context().close()
  })

  it('is stated on the published page and in the embed, as published', async () => {
    for (const path of [`/p/${dated.token}`, `/embed/${dated.token}/${dated.index}`]) {
      const page = await openPublic(path)
      expect(await subtitleOf(page), path).toBe(DATED_SUBTITLE)
      if (path.startsWith('/p/')) {
        expect(wordsOfSvg(await downloaded(page, 'Chart as SVG'))).toContain(DATED_SUBTITLE)
        // The methodology's list of datasets states the range beside the file's fingerprint.
        await expect(page.locator('section[aria-label="Methodology"] p', { hasText: 'Invented quay payments, dated' }).last().textContent()).resolves.toContain(DATED_PAYMENTS_RANGE.replace('dataset dated', 'dated'))
      }
      await page.context().close()
    }
  })

  it('is left out, not guessed, when the dataset has no date column', async () => {
    const draft = await openInvestigationAs(browser, desk, 'reporter', undated.storyId, 1366)
    expect(await subtitleOf(draft)).toBe(UNDATED_SUBTITLE)
    expect(wordsOfSvg(await downloaded(draft, 'Chart as SVG'))).not.toMatch(/dated|\d{4} to /)
    await draft.context().close()
    for (const path of [`/p/${undated.token}`, `/embed/${undated.token}/${undated.index}`]) {
      const page = await openPublic(path)
      expect(await subtitleOf(page), path).toBe(UNDATED_SUBTITLE)
      if (path.startsWith('/p/')) await expect(page.locator('section[aria-label="Methodology"] p', { hasText: 'Invented harbour payments' }).last().textContent()).resolves.not.toMatch(/dated/)
      await page.context().close()
    }
  })
})
