import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { formatDateTime } from '#shared/format/dates'
import { openDesk, openStory, screenshot } from '../support/browser'
import type { TestNewsroom } from '../support/newsroom'
import { CLAIM_TEXT, expectStatus, postClaim, readStory, writeStory } from '../support/stories'

let browser: Browser
let newsroom: TestNewsroom
let datasetId: string
beforeAll(async () => ({ browser, newsroom, datasetId } = await openDesk('Lock desk')))
afterAll(() => browser?.close())

async function verifiedStory() {
  const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
  expectStatus(await postClaim(newsroom.reporter, story), 201)
  expectStatus(await newsroom['fact-checker'].post(`/api/claims/${story.claimId}/verify`, { quote: CLAIM_TEXT }), 200)
  const claim = (await readStory(newsroom.reporter, story)).claims.find((c: { id: string }) => c.id === story.claimId)
  return { story, verifiedAt: claim.decision.at as string }
}

describe('locked text in the editor', () => {
  it('says at the caret that the passage is locked, by whom and when, and what to do', async () => {
    const { story, verifiedAt } = await verifiedStory()
    const page = await openStory(browser, newsroom, 'reporter', story)
    const claim = page.locator('.ProseMirror span[data-claim]')
    await claim.click()
    await page.keyboard.type('x')
    const notice = page.getByRole('status').filter({ hasText: 'locked' })
    await notice.waitFor({ timeout: 5_000 })
    const text = await notice.textContent()
    expect(text).toContain(newsroom.names['fact-checker'])
    // One date format everywhere: the same words as the claim's stamp in the margin.
    expect(text).toContain(formatDateTime(verifiedAt))
    expect(await page.locator('aside', { hasText: CLAIM_TEXT }).textContent()).toContain(formatDateTime(verifiedAt))
    expect(text).toMatch(/data editor/)
    // At the caret: the notice starts within a line or two below the caret.
    const caret = await page.evaluate(() => window.getSelection()!.getRangeAt(0).getBoundingClientRect().toJSON() as DOMRect)
    const box = (await notice.boundingBox())!
    expect(Math.abs(box.y - (caret.y + caret.height))).toBeLessThan(40)
    expect(Math.abs(box.x - caret.x)).toBeLessThan(400)
    expect(await claim.textContent()).toBe(CLAIM_TEXT)
    await screenshot(page, 'editor-lock-at-caret')
    await page.context().close()
  })

  it('offers no Remove on a locked block', async () => {
    const { story } = await verifiedStory()
    const page = await openStory(browser, newsroom, 'reporter', story)
    await page.locator('section[aria-label^="Text block"]').hover()
    expect(await page.getByRole('button', { name: 'Remove text block' }).count()).toBe(0)
    await page.locator('section[aria-label^="Analysis block"]').hover()
    expect(await page.getByRole('button', { name: 'Remove analysis block' }).count()).toBe(0)
    await page.context().close()
  })

  it('shows a refusal next to the action that caused it', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    expectStatus(await postClaim(newsroom.reporter, story), 201)
    const page = await openStory(browser, newsroom, 'reporter', story)
    // Verified while the reporter's page was open: the page still offers Remove, the server refuses.
    expectStatus(await newsroom['fact-checker'].post(`/api/claims/${story.claimId}/verify`, { quote: CLAIM_TEXT }), 200)
    const frame = page.locator('section[aria-label^="Text block"]')
    await frame.hover()
    await page.getByRole('button', { name: 'Remove text block' }).click()
    await frame.getByText(/locked by/).waitFor({ timeout: 10_000 })
    expect(await frame.textContent()).toContain(newsroom.names['fact-checker'])
    await page.context().close()
  })
})
