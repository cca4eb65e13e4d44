import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { openDesk, openStory, screenshot, watchSaves } from '../support/browser'
import type { TestNewsroom } from '../support/newsroom'
import { blockOf, expectStatus, writeStory } from '../support/stories'

let browser: Browser
let newsroom: TestNewsroom
let datasetId: string
beforeAll(async () => ({ browser, newsroom, datasetId } = await openDesk('Approval desk')))
afterAll(() => browser?.close())

async function approvedStory() {
  const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
  expectStatus(await newsroom['data-editor'].post(`/api/blocks/${story.analysisBlockId}/review`, { decision: 'approved' }), 200)
  return story
}

describe('an approved method in the editor', () => {
  it('saves a settings choice once it is chosen, not for every option arrowed past', async () => {
    const story = await approvedStory()
    const page = await openStory(browser, newsroom, 'reporter', story)
    const saves = watchSaves(page, story.analysisBlockId)
    const test = page.getByLabel('Test', { exact: true })
    await test.focus()
    // On a closed dropdown each arrow shows the next option at once: first digit → second → first two → first three.
    for (let i = 0; i < 3; i++) await test.press('ArrowDown')
    await page.waitForTimeout(1000)
    expect(saves).toEqual([])
    expect((await blockOf(newsroom.reporter, story, story.analysisBlockId)).review.status).toBe('approved')
    // Enter chooses what is shown: one save, of that option.
    await test.press('Enter')
    await expect.poll(() => saves.length, { timeout: 5_000 }).toBe(1)
    expect(saves[0]).toMatchObject({ settings: { test: 'first-three-digits' } })
    await page.context().close()
  })

  it('shows the reset of the approval with an undo, and the approval comes back with the approved settings', async () => {
    const story = await approvedStory()
    const page = await openStory(browser, newsroom, 'reporter', story)
    const review = page.locator('aside[aria-label="Review of this analysis"]')
    await review.getByText('Method approved').waitFor()
    await page.getByLabel('Test', { exact: true }).selectOption('second-digit')
    const notice = page.getByRole('status').filter({ hasText: 'approval' })
    await notice.waitFor({ timeout: 10_000 })
    expect(await notice.textContent()).toContain(newsroom.names['data-editor'])
    await review.getByText('Method not reviewed yet').waitFor()
    await screenshot(page, 'editor-approval-reset')
    await notice.getByRole('button', { name: /Undo/ }).click()
    await review.getByText('Method approved').waitFor({ timeout: 10_000 })
    expect(await page.getByLabel('Test', { exact: true }).inputValue()).toBe('first-digit')
    const block = await blockOf(newsroom.reporter, story, story.analysisBlockId)
    expect(block.review).toMatchObject({ status: 'approved', stamp: { by: newsroom.names['data-editor'] } })
    expect(block.settings).toEqual(story.settings)
    await page.context().close()
  })
})
