import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { launchBrowser, openInvestigationAs, screenshot, signInThroughPage, waitForApp, watchCspViolations } from '../support/browser'
import { waitForMail } from '../support/mail'
import { createTestNewsroom, PASSWORD } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { CLAIM_TEXT, expectStatus, postClaim, uploadPayments, writeStory } from '../support/stories'

// docs/product-rules.md ("Conversations and notifications"): a fact-checker disputes a claim; the reporter sees the count in the header, follows the
// notification to the exact passage (the address carries it, so a reload lands there too) and
// replies there, mentioning the fact-checker, at desktop (1366 px) and phone (390 px) width.

let browser: Browser
let newsroom: TestNewsroom
beforeAll(async () => {
  browser = await launchBrowser()
  newsroom = await createTestNewsroom('Browser talk')
})
afterAll(async () => {
  await browser?.close()
})

async function inViewport(page: Page, selector: string): Promise<boolean> {
  return page.locator(selector).first().evaluate((element) => {
    const box = element.getBoundingClientRect()
    return box.bottom > 0 && box.top < window.innerHeight && box.height > 0
  })
}

describe.each([1366, 390])('a disputed claim, answered in its conversation, at %i px', (width) => {
  it('carries the reporter from the header\'s count to the passage, where they reply', async () => {
    const story = await writeStory(newsroom.reporter, newsroom.id, await uploadPayments(newsroom.reporter, newsroom.id), `Quay lighting ${width}`)
    expectStatus(await postClaim(newsroom.reporter, story), 201)
    const disputeNote = `Row 4 is a refund, not a payment (${width}).`

    const checker = await openInvestigationAs(browser, newsroom, 'fact-checker', story.id, width)
    await waitForApp(checker)
    const note = checker.locator(`#claim-${story.claimId}`)
    await note.getByRole('button', { name: 'Dispute' }).click()
    await note.getByLabel('What is wrong or missing?').fill(disputeNote)
    await note.getByRole('button', { name: 'Dispute' }).click()
    await note.getByText('Claim · disputed').waitFor({ timeout: 10_000 })
    // The note is the first message of the claim's conversation, shown open.
    const checkerThread = checker.locator(`#claim-${story.claimId}-conversation`)
    await checkerThread.getByText(disputeNote).waitFor({ timeout: 10_000 })
    await checkerThread.getByText('Disputed the claim').waitFor()
    await screenshot(checker, `conversation-disputed-${width}`)
    await checker.context().close()

    const context = await browser.newContext({ viewport: { width, height: 900 } })
    const reporter = await context.newPage()
    const cspViolations = await watchCspViolations(reporter)
    await signInThroughPage(reporter, newsroom.emails.reporter, PASSWORD)
    await reporter.waitForURL(/\/newsrooms\//)
    await waitForApp(reporter)

    // The count: beside "Notifications" on a desktop, on the Menu button on a phone.
    let unreadBefore: number
    if (width >= 768) {
      const link = reporter.locator('header a[data-notifications]:visible')
      const count = link.locator('[data-unread-count]')
      await count.waitFor({ timeout: 10_000 })
      unreadBefore = Number(await count.textContent())
      await screenshot(reporter, `conversation-header-${width}`)
      await link.click()
    }
    else {
      const menu = reporter.getByRole('button', { name: /Menu/ })
      const count = menu.locator('[data-unread-count]')
      await count.waitFor({ timeout: 10_000 })
      unreadBefore = Number(await count.textContent())
      await menu.click()
      await screenshot(reporter, `conversation-header-${width}`)
      await reporter.locator('#site-menu [data-notifications]').click()
    }
    expect(unreadBefore).toBeGreaterThanOrEqual(1)
    await reporter.waitForURL(/\/notifications$/)
    const item = reporter.locator('li', { hasText: `disputed a claim in “${story.title}”` })
    await item.waitFor({ timeout: 10_000 })
    await expect(item.getByText(disputeNote).isVisible()).resolves.toBe(true)
    await screenshot(reporter, `conversation-notifications-${width}`)
    await item.getByRole('link').click()

    // The link lands on the passage: highlighted, in view, its conversation open and focused.
    await reporter.waitForURL(new RegExp(`/investigations/${story.id}#claim-${story.claimId}$`))
    const target = reporter.locator('.ProseMirror span.claim-target')
    await target.waitFor({ timeout: 10_000 })
    expect(await target.textContent()).toBe(CLAIM_TEXT)
    const thread = reporter.locator(`#claim-${story.claimId}-conversation`)
    await thread.getByText(disputeNote).waitFor({ timeout: 10_000 })
    await expect.poll(() => inViewport(reporter, '.ProseMirror span.claim-target'), { timeout: 5_000 }).toBe(true)
    // The thread takes the focus once it has scrolled into view, a moment after the passage does (it failed once under load when read at once).
    await expect.poll(() => reporter.evaluate(() => document.activeElement?.id), { timeout: 5_000 }).toBe(`claim-${story.claimId}-conversation`)
    // Opening it marked it read: the count went down.
    const unreadNow = (await newsroom.reporter.get('/api/me/notifications?limit=0')).body.unread
    expect(unreadNow).toBe(unreadBefore - 1)

    // A reply that mentions the fact-checker, chosen from the picker with the keyboard; markup stays text.
    const box = thread.getByLabel('Reply', { exact: true })
    await box.click()
    await box.pressSequentially('Thanks @fact')
    const option = thread.getByRole('option', { name: newsroom.names['fact-checker'] })
    await option.waitFor({ timeout: 5_000 })
    await box.press('Enter')
    await expect.poll(() => box.inputValue()).toBe(`Thanks @${newsroom.names['fact-checker']} `)
    await box.pressSequentially('the refund is out now. <b>bold?</b>')
    await box.press('Control+Enter')
    const reply = thread.locator('li', { hasText: 'the refund is out now.' })
    await reply.waitFor({ timeout: 10_000 })
    expect(await reply.locator('.mention').textContent()).toBe(`@${newsroom.names['fact-checker']}`)
    expect(await reply.locator('b').count()).toBe(0)
    expect(await reply.textContent()).toContain('<b>bold?</b>')
    await screenshot(reporter, `conversation-replied-${width}`)

    // A reload keeps the place: the address carries it.
    await reporter.reload()
    await waitForApp(reporter)
    await reporter.locator('.ProseMirror span.claim-target').waitFor({ timeout: 10_000 })
    await reporter.locator(`#claim-${story.claimId}-conversation`).getByText('the refund is out now.').waitFor({ timeout: 10_000 })
    await expect.poll(() => inViewport(reporter, '.ProseMirror span.claim-target'), { timeout: 5_000 }).toBe(true)
    expect(await cspViolations()).toEqual([])
    expect(await reporter.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(width)
    await context.close()

    // The fact-checker is told in the app and by e-mail, with a link to the passage.
    const theirs = (await newsroom['fact-checker'].get('/api/me/notifications')).body.items
    expect(theirs.find((n: { kind: string, excerpt: string }) => n.kind === 'mention' && n.excerpt.includes('the refund is out now.')).path).toBe(`/investigations/${story.id}#claim-${story.claimId}`)
    const mail = await waitForMail(newsroom.emails['fact-checker'], `${newsroom.names.reporter} mentioned you: ${story.title}`)
    expect(mail.text).toContain(`/investigations/${story.id}#claim-${story.claimId}`)
  })
})
