import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { launchBrowser, openInvestigationAs, screenshot } from '../support/browser'
import { createTestNewsroom } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { AFTER_CLAIM, BEFORE_CLAIM, CLAIM_TEXT, expectStatus, postClaim, uploadPayments, writeStory } from '../support/stories'
import type { Story } from '../support/stories'

// A newsroom and a story of this test's own, so that it passes again against the same database.
let browser: Browser
let newsroom: TestNewsroom
let story: Story
beforeAll(async () => {
  browser = await launchBrowser()
  newsroom = await createTestNewsroom('Browser locks')
  story = await writeStory(newsroom.reporter, newsroom.id, await uploadPayments(newsroom.reporter, newsroom.id))
  expectStatus(await postClaim(newsroom.reporter, story), 201)
})
afterAll(async () => {
  await browser?.close()
})

/** Signs in and opens the story, as the newsroom's member with `role`. */
const openStory = (role: 'fact-checker' | 'reporter') => openInvestigationAs(browser, newsroom, role, story.id)

describe('a fact-checker locks a claim', () => {
  it('keeps the locked passage as it was when the reporter tries to change it, and saves the rest', async () => {
    const checker = await openStory('fact-checker')
    const note = checker.locator('article', { hasText: CLAIM_TEXT })
    await note.getByRole('button', { name: 'Verify and lock' }).click()
    await note.getByText('Claim · verified and locked').waitFor({ timeout: 10_000 })
    await checker.context().close()

    const reporter = await openStory('reporter')
    await reporter.locator('article', { hasText: CLAIM_TEXT }).getByText('Claim · verified and locked').waitFor({ timeout: 10_000 })
    const paragraph = reporter.locator('.ProseMirror p', { hasText: CLAIM_TEXT })
    const claim = paragraph.locator('span.claim')
    // Put the cursor inside the passage and try to delete from it, then select across it and type over it.
    await claim.click()
    for (let i = 0; i < 6; i++) await reporter.keyboard.press('Backspace')
    await reporter.keyboard.press('Shift+Home')
    await reporter.keyboard.type('Rewritten')
    expect(await claim.textContent()).toBe(CLAIM_TEXT)
    // Text outside the passage stays editable; once its save is done, no refused edit is still on its way.
    await paragraph.click()
    await reporter.keyboard.press('End')
    await reporter.keyboard.type(' Checked.')
    await reporter.locator('section', { has: paragraph }).getByText('Saved', { exact: true }).waitFor({ timeout: 10_000 })
    const expected = `${BEFORE_CLAIM}${CLAIM_TEXT}${AFTER_CLAIM} Checked.`
    expect(await paragraph.textContent()).toBe(expected)
    await screenshot(reporter, 'claim-locked')

    // Reload: the server kept the locked passage and the edit beside it.
    await reporter.reload()
    const reloaded = reporter.locator('.ProseMirror p', { hasText: CLAIM_TEXT })
    await reloaded.waitFor({ timeout: 10_000 })
    expect(await reloaded.textContent()).toBe(expected)
    expect(await reloaded.locator('span.claim').textContent()).toBe(CLAIM_TEXT)
    await reporter.context().close()
  })
})
