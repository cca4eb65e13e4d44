import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { openDesk, openStory, screenshot, selectTextOf } from '../support/browser'
import type { TestNewsroom } from '../support/newsroom'
import { BEFORE_CLAIM, CLAIM_TEXT, AFTER_CLAIM, blockOf, expectStatus, postClaim, writeStory } from '../support/stories'

let browser: Browser
let newsroom: TestNewsroom
let datasetId: string
beforeAll(async () => ({ browser, newsroom, datasetId } = await openDesk('Focus desk')))
afterAll(() => browser?.close())

describe('where typing lands in the editor', () => {
  it('puts the caret in the block "+ Text" makes, and composed input lands there, never over the claim selected before', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    expectStatus(await postClaim(newsroom.reporter, story), 201)
    const page = await openStory(browser, newsroom, 'reporter', story)
    const first = page.locator('.ProseMirror').first()
    // The reporter had the claim's words selected (as when marking it), then adds a text block below.
    await first.click()
    await selectTextOf(page, '.ProseMirror span[data-claim]')
    const addText = page.getByRole('button', { name: '+ Text' })
    // The insert bars: one above the first block, then one after each block; the second sits below the prose.
    await addText.nth(1).click()
    await expect.poll(() => page.locator('.ProseMirror').count(), { timeout: 10_000 }).toBe(2)
    const added = page.locator('.ProseMirror').nth(1)
    await expect.poll(() => added.evaluate(element => element.contains(document.activeElement)), { timeout: 5_000 }).toBe(true)

    // Plain keys, a curly apostrophe (sent as committed text, as a keyboard layout or compose key sends it)
    // and an input method's composition, in that order.
    await page.keyboard.type('The harbour')
    await page.keyboard.type('’')
    const cdp = await page.context().newCDPSession(page)
    await cdp.send('Input.imeSetComposition', { text: 's', selectionStart: 1, selectionEnd: 1 })
    await cdp.send('Input.imeSetComposition', { text: 's ', selectionStart: 2, selectionEnd: 2 })
    await cdp.send('Input.insertText', { text: 's ' })
    await page.keyboard.type('quays')
    await expect.poll(() => added.textContent()).toBe('The harbour’s quays')
    expect(await first.textContent()).toBe(`${BEFORE_CLAIM}${CLAIM_TEXT}${AFTER_CLAIM}`)
    await screenshot(page, 'editor-focus-new-block')

    // And the server holds both blocks as shown.
    await expect.poll(() => page.getByText('Saved', { exact: true }).count(), { timeout: 10_000 }).toBeGreaterThan(0)
    await expect.poll(async () => JSON.stringify((await blockOf(newsroom.reporter, story, story.proseBlockId)).content)).toContain(CLAIM_TEXT)
    await page.context().close()
  })

  it('puts the focus in the settings of the block "+ Analysis" makes', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    const page = await openStory(browser, newsroom, 'reporter', story)
    const before = await page.getByLabel('Dataset').count()
    await page.getByRole('button', { name: '+ Analysis' }).first().click()
    await expect.poll(() => page.getByLabel('Dataset').count(), { timeout: 10_000 }).toBe(before + 1)
    // The new block is the first one: its dataset choice holds the focus.
    await expect.poll(() => page.evaluate(() => document.activeElement?.closest('section')?.getAttribute('aria-label'))).toBe('Analysis block 1 of 3')
    await page.context().close()
  })
})
