import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { baseUrl } from '../support/api'
import { createTestNewsroom, PASSWORD } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { launchBrowser, openInvestigationAs, screenshot, signInThroughPage } from '../support/browser'
import { CLAIM_TEXT, expectStatus, postClaim, saveBlock, uploadPayments, writeStory } from '../support/stories'
import type { Story } from '../support/stories'
import type { Role } from '#shared/auth/roles'

let browser: Browser
let newsroom: TestNewsroom
beforeAll(async () => {
  browser = await launchBrowser()
  newsroom = await createTestNewsroom('Browser publishing desk')
})
afterAll(async () => {
  await browser?.close()
})

/** A story of the reporter with a claim citing its analysis block. */
async function story(): Promise<Story> {
  const datasetId = await uploadPayments(newsroom.reporter, newsroom.id)
  const written = await writeStory(newsroom.reporter, newsroom.id, datasetId)
  expectStatus(await postClaim(newsroom.reporter, written), 201)
  return written
}

const open = (role: Role, written: Story, width = 1366) => openInvestigationAs(browser, newsroom, role, written.id, width)

describe('publishing, as a data editor in the browser', () => {
  it('asks for a separate decision on a disputed claim, shows who did which check, and keeps the link to copy again', async () => {
    const written = await story()
    expectStatus(await newsroom['data-editor'].post(`/api/blocks/${written.analysisBlockId}/review`, { decision: 'approved' }), 200)
    expectStatus(await newsroom['fact-checker'].post(`/api/claims/${written.claimId}/dispute`, { note: 'The ledger says one in three.' }), 200)
    const page = await open('data-editor', written)
    await page.getByRole('button', { name: /Publishing/ }).click()
    const checks = page.locator('[data-check]')
    await expect(checks.filter({ hasText: 'Method' }).textContent()).resolves.toMatch(new RegExp(`written by ${newsroom.names.reporter} · approved by ${newsroom.names['data-editor']}`))
    await expect(checks.filter({ hasText: 'Claim' }).textContent()).resolves.toMatch(new RegExp(`marked by ${newsroom.names.reporter} · disputed by ${newsroom.names['fact-checker']}`))

    await page.getByRole('button', { name: 'Publish', exact: true }).click()
    await page.getByText(/A claim is disputed\. Publishing it as written needs its own decision/).waitFor()
    await page.getByLabel(/Publish this passage as written/).check()
    await page.getByLabel('Why publish while disputed (kept in the audit trail)').fill('Legal read the wording and cleared it.')
    await page.getByRole('button', { name: 'Publish', exact: true }).click()
    const live = page.locator('[data-link-state="live"]')
    await live.waitFor()
    await live.getByText('Published with disputed claims: Legal read the wording and cleared it.').waitFor()
    const address = await live.getByRole('textbox').inputValue()
    expect(address).toMatch(/\/p\/[\w-]{40,}$/)
    await live.getByRole('button', { name: 'Copy' }).click()
    await live.getByRole('button', { name: 'Copied' }).waitFor()
    expect(await page.evaluate(() => navigator.clipboard.readText())).toBe(address)
    await screenshot(page, 'publishing-panel')

    // Later, after a reload: the same address, still there to copy.
    await page.reload()
    await page.getByRole('button', { name: /Publishing/ }).click()
    expect(await page.locator('[data-link-state="live"]').getByRole('textbox').inputValue()).toBe(address)

    // The reader's page: the disputed passage is there, unmarked, and nothing claims a follow-up.
    const reader = await (await browser.newContext({ viewport: { width: 390, height: 900 } })).newPage()
    await reader.goto(address.replace(/^https?:\/\/[^/]+/, baseUrl))
    await reader.getByText(CLAIM_TEXT).waitFor()
    expect(await reader.locator('.claim').count()).toBe(0)
    await reader.getByText(/1 published while disputed/).waitFor()
    expect(await reader.getByText(/followed up in the records/).count()).toBe(0)
    await reader.getByRole('heading', { name: 'Analysis 1: First digit of “amount”' }).waitFor()
    await screenshot(reader, 'public-page-phone')

    // Withdrawn, the link tells its reader so.
    page.once('dialog', dialog => dialog.accept())
    await page.locator('[data-link-state="live"]').getByRole('button', { name: 'Withdraw' }).click()
    await page.locator('[data-link-state="withdrawn"]').waitFor()
    const response = await reader.reload()
    expect(response?.status()).toBe(410)
    await reader.getByRole('heading', { name: 'This link was withdrawn' }).waitFor()
    await reader.context().close()
    await page.context().close()
  })

  it('marks verified claims on the public page and explains the mark', async () => {
    const written = await story()
    expectStatus(await newsroom['data-editor'].post(`/api/blocks/${written.analysisBlockId}/review`, { decision: 'approved' }), 200)
    expectStatus(await newsroom['fact-checker'].post(`/api/claims/${written.claimId}/verify`), 200)
    const published = await newsroom['data-editor'].post(`/api/investigations/${written.id}/publish`, {})
    const reader = await (await browser.newContext({ viewport: { width: 1366, height: 900 } })).newPage()
    await reader.goto(published.body.url.replace(/^https?:\/\/[^/]+/, baseUrl))
    await reader.locator('.prose-mantissa .claim-verified', { hasText: CLAIM_TEXT }).waitFor()
    await reader.getByText(/were verified in the newsroom’s fact-check before publication/).waitFor()
    await screenshot(reader, 'public-page-verified')
    await reader.context().close()
  })
})

describe('the methodology and the page name the same things', () => {
  it('prints the follow-up statement only when the publisher ticks it, and shows the grouped ranking the methodology names', async () => {
    const written = await story()
    expectStatus(await saveBlock(newsroom.reporter, written, written.analysisBlockId, { settings: { ...written.settings, groupBy: 'supplier' } }), 200)
    expectStatus(await newsroom['data-editor'].post(`/api/blocks/${written.analysisBlockId}/review`, { decision: 'approved' }), 200)
    expectStatus(await newsroom['fact-checker'].post(`/api/claims/${written.claimId}/verify`), 200)
    const page = await open('data-editor', written)
    await page.getByRole('button', { name: /Publishing/ }).click()
    await page.getByLabel(/Print in the methodology that every deviation reported here was followed up/).check()
    await page.getByRole('button', { name: 'Publish', exact: true }).click()
    const live = page.locator('[data-link-state="live"]')
    await live.getByText(`Follow-up statement confirmed by ${newsroom.names['data-editor']}`).waitFor()
    const address = await live.getByRole('textbox').inputValue()
    const reader = await (await browser.newContext({ viewport: { width: 1366, height: 900 } })).newPage()
    await reader.goto(address.replace(/^https?:\/\/[^/]+/, baseUrl))
    await reader.getByText(/The newsroom confirmed at publication that every deviation reported here was followed up/).waitFor()
    await reader.getByText(/one test per value of “supplier”/).waitFor()
    await reader.getByRole('heading', { name: 'Groups ranked by deviation' }).waitFor()
    await reader.context().close()
    await page.context().close()
  })
})

describe('claims in the editor', () => {
  it('a reporter unmarks an open claim from the margin; the words stay', async () => {
    const written = await story()
    const page = await open('reporter', written)
    const note = page.locator('article', { hasText: 'Claim · not checked yet' })
    await note.getByRole('button', { name: 'Unmark' }).click()
    await note.waitFor({ state: 'detached' })
    await page.locator('.ProseMirror', { hasText: CLAIM_TEXT }).waitFor()
    expect(await page.locator('.ProseMirror .claim').count()).toBe(0)
    await page.reload()
    await page.locator('.ProseMirror', { hasText: CLAIM_TEXT }).waitFor()
    expect(await page.locator('.ProseMirror .claim').count()).toBe(0)
    await page.context().close()
  })

  it('a data editor removes a disputed claim with a reason', async () => {
    const written = await story()
    expectStatus(await newsroom['fact-checker'].post(`/api/claims/${written.claimId}/dispute`, { note: 'No source.' }), 200)
    const page = await open('data-editor', written)
    const note = page.locator('article', { hasText: 'Claim · disputed' })
    await note.getByRole('button', { name: 'Remove the claim' }).click()
    await note.getByLabel(/Why remove this disputed claim/).fill('It reads as opinion, not a claim.')
    await note.getByRole('button', { name: 'Remove the claim' }).click()
    await note.waitFor({ state: 'detached' })
    await page.goto(`${baseUrl}/investigations/${written.id}/audit`)
    await page.getByText('removed a claim (the words stay in the text)').waitFor()
    await page.context().close()
  })

  it('deleting a claim\'s words takes it out of the margin and the publishing checklist', async () => {
    const written = await story()
    const page = await open('reporter', written)
    await page.locator('article', { hasText: 'Claim · not checked yet' }).waitFor()
    await saveBlock(newsroom.reporter, written, written.proseBlockId, { content: { type: 'doc', content: [{ type: 'paragraph', content: [{ type: 'text', text: 'Only the context is left.' }] }] } })
    await page.reload()
    await page.locator('.ProseMirror', { hasText: 'Only the context is left.' }).waitFor()
    expect(await page.locator('article', { hasText: /Claim ·/ }).count()).toBe(0)
    await page.getByRole('button', { name: /Publishing/ }).click()
    expect(await page.getByText(/not verified/).count()).toBe(0)
    await page.context().close()
  })
})

describe('four eyes, in the browser', () => {
  it('refuses a data editor\'s approval of their own block, with the reason beside the block', async () => {
    const written = await story()
    const own = await newsroom['data-editor'].post(`/api/investigations/${written.id}/blocks`, { kind: 'analysis', settings: written.settings })
    expectStatus(own, 201)
    const page = await open('data-editor', written)
    const approve = page.getByRole('button', { name: 'Approve the method' }).last()
    await approve.click()
    await page.getByText(/Four eyes: you wrote or last changed this analysis block/).first().waitFor()
    await screenshot(page, 'four-eyes-refusal')
    await page.context().close()
  })

  it('shows the setting to every member and lets only an admin change it', async () => {
    const admin = await (await browser.newContext({ viewport: { width: 1366, height: 900 } })).newPage()
    await signInThroughPage(admin, newsroom.emails.admin, PASSWORD)
    await admin.waitForURL(/\/newsrooms\//)
    await admin.goto(`${baseUrl}/newsrooms/${newsroom.id}/members`)
    const box = admin.getByRole('checkbox', { name: /Whoever approves a method or verifies a claim/ })
    expect(await box.isChecked()).toBe(true)
    expect(await box.isDisabled()).toBe(false)
    await admin.context().close()
    const reporter = await (await browser.newContext({ viewport: { width: 390, height: 900 } })).newPage()
    await signInThroughPage(reporter, newsroom.emails.reporter, PASSWORD)
    await reporter.waitForURL(/\/newsrooms\//)
    await reporter.goto(`${baseUrl}/newsrooms/${newsroom.id}/members`)
    expect(await reporter.getByRole('checkbox', { name: /Whoever approves a method or verifies a claim/ }).isDisabled()).toBe(true)
    await reporter.context().close()
  })
})

describe('Mantissa\'s own words for a conflict', () => {
  it('offers "Save my version" and "Use their version", and saving mine keeps what I typed', async () => {
    const written = await story()
    const page = await open('reporter', written)
    // Someone else saves the same text block after the page was opened.
    expectStatus(await saveBlock(newsroom['data-editor'], written, written.proseBlockId, {
      content: { type: 'doc', content: [{ type: 'paragraph', content: [{ type: 'text', text: 'The desk rewrote this paragraph.' }] }] },
    }), 200)
    await page.locator('.ProseMirror p').first().click()
    await page.keyboard.press('End')
    await page.keyboard.type(' Typed by the reporter.')
    const conflict = page.getByRole('alert').filter({ hasText: 'saved this block while you were editing it' })
    await conflict.waitFor({ timeout: 15_000 })
    expect(await conflict.getByRole('button', { name: 'Keep mine' }).count()).toBe(0)
    await conflict.getByRole('button', { name: 'Use their version' }).waitFor()
    await conflict.getByRole('button', { name: 'Save my version' }).click()
    await conflict.waitFor({ state: 'detached' })
    await expect.poll(async () => JSON.stringify((await newsroom.reporter.get(`/api/investigations/${written.id}`)).body.blocks[0].content), { timeout: 10_000 }).toContain('Typed by the reporter.')
    await page.context().close()
  })
})
