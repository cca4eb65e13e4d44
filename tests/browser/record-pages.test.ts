import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { baseUrl } from '../support/api'
import { launchBrowser, screenshot, signInThroughPage, waitForApp, watchCspViolations } from '../support/browser'
import { createTestNewsroom, PASSWORD } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { uploadPayments, writeStory } from '../support/stories'
import type { Story } from '../support/stories'

// Every page about one record (newsroom and its sub-pages, dataset and its sub-pages, investigation, block history,
// audit trail) sits in one frame. docs/product-rules.md, "Newsroom walls": an id of another newsroom
// is answered exactly like one that does not exist, so each page says the one sentence for both and
// draws nothing of the record; its own newsroom's member sees the record. Walked at 1366 and 390 px.

let browser: Browser
let home: TestNewsroom
let other: TestNewsroom
let datasetId: string
let story: Story

beforeAll(async () => {
  browser = await launchBrowser()
  ;[home, other] = await Promise.all([createTestNewsroom('Browser frame'), createTestNewsroom('Browser frame, elsewhere')])
  datasetId = await uploadPayments(home.reporter, home.id)
  story = await writeStory(home.reporter, home.id, datasetId)
})
afterAll(async () => {
  await browser?.close()
})

async function signedInPage(newsroom: TestNewsroom, width: number): Promise<{ page: Page, violations: () => Promise<string[]> }> {
  const context = await browser.newContext({ viewport: { width, height: 900 } })
  const page = await context.newPage()
  const violations = await watchCspViolations(page)
  await signInThroughPage(page, newsroom.emails['data-editor'], PASSWORD)
  await page.waitForURL(/\/newsrooms\//)
  return { page, violations }
}

const pages = () => [
  { name: 'newsroom', path: `/newsrooms/${home.id}`, sentence: 'This newsroom does not exist, or you are not a member of it.', heading: /Browser frame/ },
  { name: 'newsroom-datasets', path: `/newsrooms/${home.id}/datasets`, sentence: 'This newsroom does not exist, or you are not a member of it.', heading: 'Datasets' },
  { name: 'newsroom-queue', path: `/newsrooms/${home.id}/queue`, sentence: 'This newsroom does not exist, or you are not a member of it.', heading: 'Waiting for you' },
  { name: 'newsroom-members', path: `/newsrooms/${home.id}/members`, sentence: 'This newsroom does not exist, or you are not a member of it.', heading: 'Members' },
  { name: 'dataset', path: `/datasets/${datasetId}`, sentence: 'This dataset does not exist, or it belongs to a newsroom you are not part of.', heading: /payments/i },
  { name: 'dataset-cells', path: `/datasets/${datasetId}/cells`, sentence: 'This dataset does not exist, or it belongs to a newsroom you are not part of.', heading: 'Cells left out' },
  { name: 'investigation', path: `/investigations/${story.id}`, sentence: 'This investigation does not exist, or it belongs to a newsroom you are not part of.', heading: null },
  { name: 'block-history', path: `/investigations/${story.id}/blocks/${story.proseBlockId}/history`, sentence: 'This block does not exist, or it belongs to a newsroom you are not part of.', heading: 'Block history' },
  { name: 'audit-trail', path: `/investigations/${story.id}/audit`, sentence: 'This investigation does not exist, or it belongs to a newsroom you are not part of.', heading: 'Audit trail' },
]

describe.each([1366, 390])('record pages at %i px', (width) => {
  it('say the one sentence to a member of another newsroom, and draw nothing of the record', async () => {
    const { page, violations } = await signedInPage(other, width)
    for (const { name, path, sentence } of pages()) {
      await page.goto(`${baseUrl}${path}`)
      await waitForApp(page)
      await page.getByRole('alert').filter({ hasText: sentence }).waitFor()
      expect(await page.getByRole('heading', { level: 1 }).count(), name).toBe(0)
      expect(await page.getByText(story.title).count(), name).toBe(0)
      await screenshot(page, `record-page-missing-${name}-${width}`)
    }
    expect(await violations()).toEqual([])
    await page.context().close()
  })

  it('show the record to its own newsroom, with the way back where the page has one', async () => {
    const { page, violations } = await signedInPage(home, width)
    for (const { name, path, sentence, heading } of pages()) {
      await page.goto(`${baseUrl}${path}`)
      await waitForApp(page)
      if (heading) await page.getByRole('heading', { level: 1, name: heading }).first().waitFor()
      else await page.locator('.ProseMirror').first().waitFor()
      expect(await page.getByText(sentence).count(), name).toBe(0)
      await screenshot(page, `record-page-${name}-${width}`)
    }
    await page.goto(`${baseUrl}/investigations/${story.id}/audit`)
    await page.getByRole('link', { name: '← Back to the investigation' }).click()
    await page.waitForURL(`${baseUrl}/investigations/${story.id}`)
    expect(await violations()).toEqual([])
    await page.context().close()
  })
})
