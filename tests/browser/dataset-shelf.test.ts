import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { baseUrl } from '../support/api'
import { launchBrowser, screenshot, signInThroughPage, waitForApp } from '../support/browser'
import { sha256Of, upload, uploadCsv } from '../support/datasets'
import { createTestNewsroom, PASSWORD } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { writeStory } from '../support/stories'

// Issue 19: the datasets page finds a dataset by its source, and a dataset's page offers what a
// reporter does with it; a refusal shows beside the button that was pressed.

let browser: Browser
let desk: TestNewsroom
let used: string

beforeAll(async () => {
  browser = await launchBrowser()
  desk = await createTestNewsroom('Shelf')
  used = await uploadCsv(desk.reporter, desk.id, 'supplier,amount\nNorthgate Paving,1840.00\nQuay Lighting,1215.50\n', 'Ferry subsidies')
  await uploadCsv(desk.reporter, desk.id, 'supplier,amount\nWillow Drains,143.20\n', 'Road grit tenders')
  await writeStory(desk.reporter, desk.id, used)
})
afterAll(async () => {
  await browser?.close()
})

describe('the datasets of a newsroom', () => {
  it('finds one by a word of its title and keeps the search in the address', async () => {
    const page = await browser.newPage({ viewport: { width: 1366, height: 900 } })
    await signInThroughPage(page, desk.emails.reporter, PASSWORD)
    await page.waitForURL(url => !url.pathname.startsWith('/login'))
    await page.goto(`${baseUrl}/newsrooms/${desk.id}/datasets`)
    await waitForApp(page)
    await page.getByLabel('Find a dataset').fill('grit')
    await page.waitForURL(/q=grit/)
    await expect.poll(() => page.getByRole('link', { name: 'Ferry subsidies' }).count()).toBe(0)
    expect(await page.getByRole('link', { name: 'Road grit tenders' }).count()).toBe(1)
    await page.reload()
    await waitForApp(page)
    expect(await page.getByLabel('Find a dataset').inputValue()).toBe('grit')
    expect(await page.getByRole('link', { name: 'Road grit tenders' }).count()).toBe(1)

    await page.goto(`${baseUrl}/datasets/${used}`)
    await waitForApp(page)
    await page.getByRole('button', { name: 'Delete…' }).click()
    await page.getByRole('button', { name: 'Delete', exact: true }).click()
    await expect.poll(() => page.getByRole('alert').filter({ hasText: 'uses this dataset' }).count()).toBe(1)
    await screenshot(page, 'dataset-actions-refused-delete')

    // One request makes the draft with its first analysis, so no refusal between two can leave an empty draft behind.
    const writes: string[] = []
    page.on('request', (request) => {
      if (request.method() === 'POST' && request.url().includes('/api/investigations')) writes.push(new URL(request.url()).pathname)
    })
    await page.getByRole('button', { name: 'Start an investigation from it' }).click()
    await page.waitForURL(/\/investigations\//)
    await expect.poll(() => page.title()).toBe('On Ferry subsidies · Mantissa')
    expect(writes).toEqual(['/api/investigations'])
    const draft = await desk.reporter.get(`/api/investigations/${new URL(page.url()).pathname.split('/').pop()}`)
    expect(draft.body.blocks.map((b: { kind: string, settings: unknown }) => [b.kind, b.settings])).toEqual([
      ['prose', null], ['analysis', { datasetId: used, column: 'amount', test: 'first-digit' }],
    ])
    await page.close()
  })

  it('shows each entry\'s rows, date obtained, uploader and the start of its fingerprint, and keeps the search on Back', async () => {
    const bytes = new TextEncoder().encode('supplier,amount\nQuay Lighting,412.30\nMill Lane Timber,77.10\n')
    const reply = await upload(desk.reporter, 'lantern-repairs.csv', bytes, { title: 'Lantern repairs', obtainedOn: '2026-02-14' }, `?newsroomId=${desk.id}`)
    expect(reply.status).toBe(201)
    const page = await browser.newPage({ viewport: { width: 390, height: 900 } })
    await signInThroughPage(page, desk.emails.reporter, PASSWORD)
    await page.waitForURL(url => !url.pathname.startsWith('/login'))
    await page.goto(`${baseUrl}/newsrooms/${desk.id}/datasets?q=lantern`)
    await waitForApp(page)
    const entry = page.getByRole('listitem').filter({ has: page.getByRole('link', { name: 'Lantern repairs' }) })
    // The fingerprint is the SHA-256 of the bytes sent (FIPS 180-4, node:crypto); 14 Feb 2026 is the date given.
    const text = (await entry.innerText()).replace(/\s+/g, ' ')
    expect(text).toContain(`Added by ${desk.names.reporter}`)
    expect(text).toContain('obtained 14 Feb 2026')
    expect(text).toContain('2 rows')
    expect(text).toContain(`fingerprint ${sha256Of(bytes).slice(0, 12)}…`)
    await page.getByRole('link', { name: 'Lantern repairs' }).click()
    await page.waitForURL(/\/datasets\/[0-9a-f-]{36}/)
    await waitForApp(page)
    // While the list comes back, the page must not say that none matches (it once did, for a moment).
    const saidNone: string[] = []
    await page.exposeFunction('noteSaidNone', (text: string) => saidNone.push(text))
    await page.evaluate(() => new MutationObserver(() => {
      const text = document.body.innerText
      if (text.includes('No dataset\'s title')) (window as unknown as { noteSaidNone: (t: string) => void }).noteSaidNone(text)
    }).observe(document.body, { childList: true, subtree: true, characterData: true }))
    await page.goBack()
    await waitForApp(page)
    expect(await page.getByLabel('Find a dataset').inputValue()).toBe('lantern')
    await expect.poll(() => page.getByRole('link', { name: 'Lantern repairs' }).count()).toBe(1)
    expect(await page.getByRole('link', { name: 'Ferry subsidies' }).count()).toBe(0)
    expect(saidNone).toEqual([])
    await screenshot(page, 'dataset-shelf-entry-390')
    await page.close()
  })
})
