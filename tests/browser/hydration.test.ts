import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { baseUrl } from '../support/api'
import { launchBrowser, screenshot, signInThroughPage, waitForApp } from '../support/browser'
import { createTestNewsroom, PASSWORD } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { AFTER_CLAIM, BEFORE_CLAIM, CLAIM_TEXT, expectStatus, postClaim, proseDoc, saveBlock, uploadPayments, writeStory } from '../support/stories'
import type { Story } from '../support/stories'

// The server draws a page and the browser takes it over: Vue's hydration expects its first render
// to be the server's, node for node. Where they differ, Vue says so on the console (in a production
// build one line, "Hydration completed but contains mismatches."; in development a warning per
// mismatch) and leaves what the server drew in place, so a reader sees a conversation with two
// messages offered as "Write the first message" until something redraws it. These pages draw
// conversations, claims and compared versions from data the server has too, so none may differ.
// The public page draws a published copy's text node by node, where two neighbouring texts must stay
// two. Walked as every role at desktop (1366 px) and phone (390 px) width, as the team's rules ask.

let browser: Browser
let newsroom: TestNewsroom
let story: Story
let published: Story
let removedBlockId: string
let publicPath: string

const text = (value: string) => ({ type: 'text', text: value })
const paragraph = (value: string) => ({ type: 'doc', content: [{ type: 'paragraph', content: [text(value)] }] })

beforeAll(async () => {
  browser = await launchBrowser()
  newsroom = await createTestNewsroom('Browser hydration')
  story = await writeStory(newsroom.reporter, newsroom.id, await uploadPayments(newsroom.reporter, newsroom.id))
  expectStatus(await postClaim(newsroom.reporter, story), 201)
  // A claim whose conversation has begun (the dispute's note is its first message), a method with one,
  // and a passage saved twice more, so its history compares two versions by default.
  expectStatus(await newsroom['fact-checker'].post(`/api/claims/${story.claimId}/dispute`, { note: 'Row 4 is a refund, not a payment.' }), 200)
  expectStatus(await newsroom.reporter.post(`/api/investigations/${story.id}/threads`, { subjectType: 'claim', subjectId: story.claimId, parts: [text('It is in the ledger as a payment.')] }), 201)
  expectStatus(await newsroom['data-editor'].post(`/api/investigations/${story.id}/threads`, { subjectType: 'review', subjectId: story.analysisBlockId, parts: [text('Why the first digit and not the first two?')] }), 201)
  expectStatus(await saveBlock(newsroom.reporter, story, story.analysisBlockId, { settings: { ...story.settings, test: 'second-digit' } }), 200)
  expectStatus(await saveBlock(newsroom.reporter, story, story.proseBlockId, { content: paragraph('The ledger lists invented harbour works, twice.') }), 200)
  // A removed block, whose history offers to bring it back.
  const spare = await newsroom.reporter.post(`/api/investigations/${story.id}/blocks`, { kind: 'prose', content: paragraph('A paragraph that goes.') })
  expectStatus(spare, 201)
  removedBlockId = spare.body.id
  expectStatus(await newsroom.reporter.delete(`/api/blocks/${removedBlockId}`), 200)
  // And a published story: its method approved, its claim verified (so its passage and the analysis are locked), a live link.
  // Its text holds two neighbouring runs that the public page draws as plain text: the second carries
  // the mark of a claim never made, which a published copy leaves off.
  published = await writeStory(newsroom.reporter, newsroom.id, await uploadPayments(newsroom.reporter, newsroom.id))
  const withNeighbours = proseDoc(BEFORE_CLAIM, { text: CLAIM_TEXT, claimId: published.claimId }, AFTER_CLAIM)
  withNeighbours.content.push(proseDoc('Invented figures, all of them. ', { text: 'Nothing here was checked.', claimId: randomUUID() }).content[0]!)
  expectStatus(await saveBlock(newsroom.reporter, published, published.proseBlockId, { content: withNeighbours }), 200)
  expectStatus(await postClaim(newsroom.reporter, published), 201)
  expectStatus(await newsroom['data-editor'].post(`/api/blocks/${published.analysisBlockId}/review`, { decision: 'approved' }), 200)
  expectStatus(await newsroom['fact-checker'].post(`/api/claims/${published.claimId}/verify`, { quote: CLAIM_TEXT }), 200)
  const publication = await newsroom['data-editor'].post(`/api/investigations/${published.id}/publish`, {})
  expectStatus(publication, 201)
  publicPath = new URL(publication.body.url).pathname
})
afterAll(async () => {
  await browser?.close()
})

/** Console lines about hydration while `page` loads `path` from the server and the browser takes it over. */
async function hydrationLines(page: Page, path: string): Promise<string[]> {
  const lines: string[] = []
  const listen = (message: { text: () => string }) => {
    if (/hydrat/i.test(message.text())) lines.push(message.text().split('\n').slice(0, 3).join(' '))
  }
  page.on('console', listen)
  // From a blank page, so that an address differing from the last one only in its '#' part loads afresh.
  await page.goto('about:blank')
  await page.goto(`${baseUrl}${path}`)
  await waitForApp(page)
  // Hydration is over once the app is mounted; the loads it starts (a comparison, a chart) settle after it.
  await page.waitForLoadState('networkidle')
  page.off('console', listen)
  return lines
}

const ROLES = ['reporter', 'data-editor', 'fact-checker', 'admin'] as const

describe.each([1366, 390])('the first frame at %i px', (width) => {
  it.each(ROLES)('is the server\'s on the investigation and the block histories, as %s', async (role) => {
    const context = await browser.newContext({ viewport: { width, height: 900 } })
    const page = await context.newPage()
    await signInThroughPage(page, newsroom.emails[role], PASSWORD)
    await page.waitForURL(/\/newsrooms\//)
    await waitForApp(page)

    const pages = {
      'investigation': `/investigations/${story.id}`,
      'investigation at the claim': `/investigations/${story.id}#claim-${story.claimId}`,
      'text block history': `/investigations/${story.id}/blocks/${story.proseBlockId}/history`,
      'analysis block history': `/investigations/${story.id}/blocks/${story.analysisBlockId}/history`,
      'removed block history': `/investigations/${story.id}/blocks/${removedBlockId}/history`,
      'published investigation': `/investigations/${published.id}`,
      'published investigation at the method': `/investigations/${published.id}#review-${published.analysisBlockId}`,
      'locked analysis block history': `/investigations/${published.id}/blocks/${published.analysisBlockId}/history`,
      'public page': publicPath,
    }
    const found: Record<string, string[]> = {}
    for (const [name, path] of Object.entries(pages)) {
      const lines = await hydrationLines(page, path)
      if (lines.length) found[name] = lines
    }
    await screenshot(page, `hydration-${role}-${width}`)
    expect(found).toEqual({})
    await context.close()
  })
})
