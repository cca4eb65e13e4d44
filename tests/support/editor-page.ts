import type { Browser, Page } from 'playwright-core'
import { baseUrl } from './api'
import { signInThroughPage, waitForApp } from './browser'
import { PASSWORD } from './newsroom'
import type { TestNewsroom } from './newsroom'
import type { Story } from './stories'

/** Signs in through the page as `role` of `newsroom` and opens `story` in the editor, ready to type. */
export async function openStory(browser: Browser, newsroom: TestNewsroom, role: 'reporter' | 'data-editor' | 'fact-checker' | 'admin', story: Story): Promise<Page> {
  const context = await browser.newContext({ viewport: { width: 1366, height: 1000 } })
  const page = await context.newPage()
  await signInThroughPage(page, newsroom.emails[role], PASSWORD)
  await page.waitForURL(/\/newsrooms\//)
  await page.goto(`${baseUrl}/investigations/${story.id}`)
  await waitForApp(page)
  await page.locator('.ProseMirror').first().waitFor()
  return page
}

/** The PATCH requests the page sends to save `blockId`, as they leave the browser. */
export function watchSaves(page: Page, blockId: string): unknown[] {
  const bodies: unknown[] = []
  page.on('request', (request) => {
    if (request.method() === 'PATCH' && request.url().endsWith(`/api/blocks/${blockId}`)) bodies.push(request.postDataJSON())
  })
  return bodies
}

/** Selects the text of the first element matching `selector` in the page, as a mouse drag over it would. */
export async function selectTextOf(page: Page, selector: string) {
  await page.evaluate((css) => {
    const element = document.querySelector(css)!
    const range = document.createRange()
    range.selectNodeContents(element)
    const selection = window.getSelection()!
    selection.removeAllRanges()
    selection.addRange(range)
  }, selector)
}
