import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { openDesk, openStory, screenshot } from '../support/browser'
import type { TestNewsroom } from '../support/newsroom'
import { blockOf, writeStory } from '../support/stories'

let browser: Browser
let newsroom: TestNewsroom
let datasetId: string
beforeAll(async () => ({ browser, newsroom, datasetId } = await openDesk('Unsaved desk')))
afterAll(() => browser?.close())

const proseOf = async (story: Awaited<ReturnType<typeof writeStory>>) => JSON.stringify((await blockOf(newsroom.reporter, story, story.proseBlockId)).content)

describe('nothing typed is lost', () => {
  it('shows unsaved words, asks before a reload, and sends them as the page goes', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    const page = await openStory(browser, newsroom, 'reporter', story)
    const dialogs: string[] = []
    page.on('dialog', (dialog) => {
      dialogs.push(dialog.type())
      void dialog.accept()
    })
    await page.locator('.ProseMirror').first().click()
    await page.keyboard.press('End')
    await page.keyboard.type(' Typed just before leaving.')
    // Straight away, before any save could have gone: the page says the words are not saved yet.
    await page.getByText('Unsaved changes').first().waitFor({ timeout: 1_000 })
    await screenshot(page, 'editor-unsaved')
    await page.reload()
    expect(dialogs).toEqual(['beforeunload'])
    await expect.poll(() => proseOf(story), { timeout: 10_000 }).toContain('Typed just before leaving.')
    // The page may be drawn before the request sent on leaving has landed: then it sends the words again.
    await expect.poll(() => page.locator('.ProseMirror').first().textContent(), { timeout: 10_000 }).toContain('Typed just before leaving.')
    await page.getByText('All changes saved').waitFor({ timeout: 10_000 })
    expect(await proseOf(story)).toContain('Typed just before leaving.')
    await page.context().close()
  })

  it('sends the words when the tab is closed, even without waiting for the save', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    const page = await openStory(browser, newsroom, 'reporter', story)
    await page.locator('.ProseMirror').first().click()
    await page.keyboard.press('End')
    await page.keyboard.type(' Typed as the tab closed.')
    await page.close({ runBeforeUnload: false })
    await expect.poll(() => proseOf(story), { timeout: 10_000 }).toContain('Typed as the tab closed.')
  })

  it('resends a change that failed when "Try again" is pressed', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    const page = await openStory(browser, newsroom, 'reporter', story)
    const url = `**/api/blocks/${story.proseBlockId}`
    await page.route(url, route => route.request().method() === 'PATCH' ? route.abort('connectionreset') : route.continue())
    await page.locator('.ProseMirror').first().click()
    await page.keyboard.press('End')
    await page.keyboard.type(' Sent on the second try.')
    const retry = page.getByRole('button', { name: 'Try again' })
    await retry.waitFor({ timeout: 10_000 })
    await page.unroute(url)
    await retry.click()
    await page.locator('section[aria-label^="Text block"]').getByText('Saved', { exact: true }).waitFor({ timeout: 10_000 })
    expect(await proseOf(story)).toContain('Sent on the second try.')
    await page.context().close()
  })

  it('asks before leaving for another page of the app while a change is not saved', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    const page = await openStory(browser, newsroom, 'reporter', story)
    await page.route(`**/api/blocks/${story.proseBlockId}`, route => route.request().method() === 'PATCH' ? route.abort('connectionreset') : route.continue())
    await page.locator('.ProseMirror').first().click()
    await page.keyboard.press('End')
    await page.keyboard.type(' Not saved yet.')
    await page.getByRole('button', { name: 'Try again' }).waitFor({ timeout: 10_000 })
    const dialogs: string[] = []
    page.on('dialog', (dialog) => {
      dialogs.push(`${dialog.type()}: ${dialog.message()}`)
      void dialog.dismiss()
    })
    await page.getByRole('link', { name: '← All investigations' }).click()
    await expect.poll(() => dialogs.length, { timeout: 5_000 }).toBe(1)
    expect(dialogs[0]).toMatch(/^confirm: .*not saved/)
    expect(page.url()).toContain(`/investigations/${story.id}`)
    expect(await page.locator('.ProseMirror').first().textContent()).toContain('Not saved yet.')
    await page.context().close()
  })

  it('saves pending words before leaving for another page of the app, without asking', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    const page = await openStory(browser, newsroom, 'reporter', story)
    const dialogs: string[] = []
    page.on('dialog', (dialog) => {
      dialogs.push(dialog.type())
      void dialog.dismiss()
    })
    await page.locator('.ProseMirror').first().click()
    await page.keyboard.press('End')
    await page.keyboard.type(' Saved on the way out.')
    await page.getByRole('link', { name: '← All investigations' }).click()
    await page.waitForURL(/\/newsrooms\//)
    expect(dialogs).toEqual([])
    expect(await proseOf(story)).toContain('Saved on the way out.')
    await page.context().close()
  })
})
