import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { baseUrl, signedIn } from '../support/api'
import demo from '../../server/services/demo/people.json'
import { artifacts, launchBrowser, screenshot, watchCspViolations } from '../support/browser'

let browser: Browser
let publicUrl: string

beforeAll(async () => {
  browser = await launchBrowser()
  // Publish the demo investigation as its data editor, through the API.
  const editor = await signedIn(demo.people.find(p => p.role === 'data-editor')!.email, demo.password)
  const me = await editor.get('/api/me')
  const list = await editor.get(`/api/investigations?newsroomId=${me.body.memberships[0].newsroomId}`)
  const story = list.body.find((i: { title: string }) => i.title.startsWith('Invoices that stop'))
  // The demo holds a disputed claim: publishing it as written is its own decision.
  const panel = await editor.get(`/api/investigations/${story.id}/publishing`)
  const disputed = panel.body.blockers.filter((b: { kind: string }) => b.kind === 'disputed-claim').map((b: { id: string }) => b.id)
  const published = await editor.post(`/api/investigations/${story.id}/publish`, {
    reason: 'Browser test of the public page.',
    ...(disputed.length ? { disputed: { claimIds: disputed, reason: 'Browser test of the public page.' } } : {}),
  })
  expect(published.status).toBe(201)
  publicUrl = published.body.url.replace(/^https?:\/\/[^/]+/, baseUrl)
})
afterAll(async () => {
  await browser?.close()
})

describe('the published page', () => {
  it('opens in a fresh context without cookies and shows the charts, the methodology and the legal note', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 1000 } })
    expect(await context.cookies()).toEqual([])
    const page = await context.newPage()
    const cspViolations = await watchCspViolations(page)
    await page.goto(publicUrl)
    await page.getByRole('heading', { level: 1, name: /Invoices that stop just short/ }).waitFor()
    await page.locator('figure svg').first().waitFor({ timeout: 20_000 })
    expect(await page.locator('figure svg').count()).toBe(4)
    await expect(page.getByRole('heading', { name: 'Before anyone is named' }).count()).resolves.toBe(1)
    await expect(page.getByText(/Methodology: Invoices that stop/).count()).resolves.toBe(1)
    expect(await page.locator('.ProseMirror, [contenteditable="true"]').count()).toBe(0)
    await screenshot(page, 'public-page')

    // The chart downloads render the chart again, off screen, under the same policy.
    const [png] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Chart as PNG' }).first().click()])
    expect(readFileSync(await png.path()).subarray(1, 4).toString()).toBe('PNG') // PNG signature (RFC 2083, 3.1)
    const [svg] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Chart as SVG' }).first().click()])
    expect(readFileSync(await svg.path(), 'utf8')).toMatch(/^<svg[^>]*xmlns="http:\/\/www.w3.org\/2000\/svg"/)
    // The charts drew under the Content-Security-Policy, which forbids evaluating strings: nothing was blocked.
    expect(await cspViolations()).toEqual([])

    const pdf = join(artifacts, 'public-page.pdf')
    await page.emulateMedia({ media: 'print' })
    await page.pdf({ path: pdf, format: 'A4', printBackground: true })
    const bytes = readFileSync(pdf)
    expect(bytes.subarray(0, 5).toString()).toBe('%PDF-')
    expect(bytes.length).toBeGreaterThan(20_000)
    await context.close()
  })

  it('says plainly that a withdrawn or unknown link opens nothing', async () => {
    const page = await (await browser.newContext()).newPage()
    await page.goto(`${baseUrl}/p/${'z'.repeat(43)}`)
    await page.getByRole('heading', { name: 'This link does not open anything' }).waitFor()
    await page.context().close()
  })
})
