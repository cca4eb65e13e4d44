import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { baseUrl } from '../support/api'
import { openDesk, openInvestigationAs, screenshot, waitForApp } from '../support/browser'
import type { TestNewsroom } from '../support/newsroom'
import { CLAIM_TEXT, expectStatus, postClaim, saveBlock, writeStory } from '../support/stories'

// DEVELOPERS.md ("Client data"): after a change the page shows what the server answered, and reads
// again only when a change reaches further than its answer says. Withdrawing a link, restoring a
// block's version and disputing a claim each answer enough for the page: the link and the
// investigation's status, the version added and the block's label, the claim and its conversation.
// Each is done here as a person would, and the page must show the outcome without asking for the
// panel, the document, the history or every conversation again.

let browser: Browser
let newsroom: TestNewsroom
let datasetId: string
beforeAll(async () => ({ browser, newsroom, datasetId } = await openDesk('Browser answers')))
afterAll(() => browser?.close())

/** The paths of the GET requests the page sends from now on. */
function watchReads(page: Page): string[] {
  const paths: string[] = []
  page.on('request', (request) => {
    if (request.method() === 'GET' && request.url().startsWith(`${baseUrl}/api/`)) paths.push(new URL(request.url()).pathname)
  })
  return paths
}

describe('after a change, the page shows the server\'s answer', () => {
  it('withdrawing a public link: the panel lists it withdrawn and the investigation is back in review', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    expectStatus(await postClaim(newsroom.reporter, story), 201)
    expectStatus(await newsroom['data-editor'].post(`/api/blocks/${story.analysisBlockId}/review`, { decision: 'approved' }), 200)
    expectStatus(await newsroom['fact-checker'].post(`/api/claims/${story.claimId}/verify`, { quote: CLAIM_TEXT }), 200)
    expectStatus(await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, {}), 201)
    const page = await openInvestigationAs(browser, newsroom, 'data-editor', story.id, 1366)
    await waitForApp(page)
    await page.getByText('Published', { exact: true }).first().waitFor()
    await page.getByRole('button', { name: /Publishing/ }).click()
    const reads = watchReads(page)
    page.once('dialog', dialog => dialog.accept())
    await page.locator('[data-link-state="live"]').getByRole('button', { name: 'Withdraw' }).click()
    await page.locator('[data-link-state="withdrawn"]').waitFor()
    await page.getByText('In review', { exact: true }).first().waitFor()
    await page.waitForLoadState('networkidle')
    expect(reads.filter(path => path === `/api/investigations/${story.id}` || path === `/api/investigations/${story.id}/publishing`)).toEqual([])
    await screenshot(page, 'answers-withdrawn')
    await page.context().close()
  })

  it('restoring a version: the history lists the new version and the label as the block now reads', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    const later = { type: 'doc', content: [{ type: 'paragraph', content: [{ type: 'text', text: 'A later opening line.' }] }] }
    expectStatus(await saveBlock(newsroom.reporter, story, story.proseBlockId, { content: later }), 200)
    const page = await openInvestigationAs(browser, newsroom, 'reporter', story.id, 390)
    await page.goto(`${baseUrl}/investigations/${story.id}/blocks/${story.proseBlockId}/history`)
    await waitForApp(page)
    const label = page.getByTestId('block-label')
    await label.getByText(/A later opening line/).waitFor()
    const reads = watchReads(page)
    page.once('dialog', dialog => dialog.accept())
    await page.getByRole('button', { name: 'Restore version 2' }).click()
    await page.getByText('Version 2 is back, saved as version 4.').waitFor()
    const versions = page.locator('ol[aria-label="Versions, newest first"] > li')
    await expect.poll(() => versions.count()).toBe(4)
    expect(await versions.first().textContent()).toContain('brought back version 2')
    // Its label reads as the block does now, with writeStory's opening words back.
    await label.getByText(/The ledger lists invented harbour works/).waitFor()
    expect(await label.textContent()).toContain('4 versions kept')
    await page.waitForLoadState('networkidle')
    expect(reads.filter(path => path === `/api/blocks/${story.proseBlockId}/versions`)).toEqual([])
    await screenshot(page, 'answers-restored')
    await page.context().close()
  })

  it('disputing a claim: its conversation opens with the note, without reading every conversation again', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    expectStatus(await postClaim(newsroom.reporter, story), 201)
    const page = await openInvestigationAs(browser, newsroom, 'fact-checker', story.id, 1366)
    await waitForApp(page)
    const note = page.locator(`#claim-${story.claimId}`)
    const reads = watchReads(page)
    await note.getByRole('button', { name: 'Dispute' }).click()
    await note.getByLabel('What is wrong or missing?').fill('Row 4 is a refund, not a payment.')
    await note.getByRole('button', { name: 'Dispute' }).click()
    await note.getByText('Claim · disputed').waitFor()
    const thread = page.locator(`#claim-${story.claimId}-conversation`)
    await thread.getByText('Row 4 is a refund, not a payment.').waitFor()
    await thread.getByText('Disputed the claim').waitFor()
    await page.waitForLoadState('networkidle')
    expect(reads.filter(path => path === `/api/investigations/${story.id}/threads` || path === `/api/investigations/${story.id}`)).toEqual([])
    await screenshot(page, 'answers-disputed')
    await page.context().close()
  })
})
