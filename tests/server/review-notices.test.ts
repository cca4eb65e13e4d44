import { beforeAll, describe, expect, it } from 'vitest'
import { Client } from '../support/api'
import { mailTo, waitForMail } from '../support/mail'
import { createTestNewsroom } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { CLAIM_TEXT, expectStatus, postClaim, uploadPayments, writeStory } from '../support/stories'
import type { Story } from '../support/stories'

// The notices issue 6 lists: review requested, block sent back, claim disputed, lock lifted, investigation published; a member can turn them off.

async function deskWithStory(label: string): Promise<{ newsroom: TestNewsroom, story: Story }> {
  const newsroom = await createTestNewsroom(label)
  const story = await writeStory(newsroom.reporter, newsroom.id, await uploadPayments(newsroom.reporter, newsroom.id))
  expectStatus(await postClaim(newsroom.reporter, story), 201)
  return { newsroom, story }
}

const sendBack = (newsroom: TestNewsroom, story: Story, note: string) =>
  newsroom['data-editor'].post(`/api/blocks/${story.analysisBlockId}/review`, { decision: 'sent-back', note })
const dispute = (newsroom: TestNewsroom, story: Story, note: string) =>
  newsroom['fact-checker'].post(`/api/claims/${story.claimId}/dispute`, { note })

async function verifyThenLift(newsroom: TestNewsroom, story: Story, reason: string) {
  expectStatus(await newsroom['fact-checker'].post(`/api/claims/${story.claimId}/verify`), 200)
  expectStatus(await newsroom['data-editor'].post(`/api/claims/${story.claimId}/unlock`, { reason }), 200)
}

/** Subjects of the messages the sink holds for `email` that concern `story`. */
async function noticesAbout(email: string, story: Story): Promise<string[]> {
  return (await mailTo(email)).map(m => m.subject).filter(subject => subject.includes(story.title))
}

describe('e-mail notices', () => {
  let newsroom: TestNewsroom
  let story: Story
  beforeAll(async () => {
    ({ newsroom, story } = await deskWithStory('Notices'))
  })

  it('tells data editors and admins that review is requested, with a link, but not the reporter who asked', async () => {
    expectStatus(await newsroom.reporter.post(`/api/investigations/${story.id}/review-request`), 200)
    for (const email of [newsroom.emails['data-editor'], newsroom.emails.admin]) {
      const mail = await waitForMail(email, `Review requested: ${story.title}`)
      expect(mail.text).toContain(`/investigations/${story.id}`)
      expect(mail.text).toContain(newsroom.names.reporter)
    }
    expect(await noticesAbout(newsroom.emails.reporter, story)).not.toContain(`Review requested: ${story.title}`)
  })

  it('tells the reporter that a method was sent back, with the note', async () => {
    expectStatus(await sendBack(newsroom, story, 'Leave out the cancelled invoices.'), 200)
    const mail = await waitForMail(newsroom.emails.reporter, `Method sent back: ${story.title}`)
    expect(mail.text).toContain('Leave out the cancelled invoices.')
  })

  it('tells the reporter that a claim is disputed, quoting it with the note', async () => {
    expectStatus(await dispute(newsroom, story, 'Two of the five rows are refunds.'), 200)
    const mail = await waitForMail(newsroom.emails.reporter, `Claim disputed: ${story.title}`)
    expect(mail.text).toContain(CLAIM_TEXT)
    expect(mail.text).toContain('Two of the five rows are refunds.')
  })

  it('tells the reporter and the fact-checker who verified it that a lock was lifted, with the reason', async () => {
    await verifyThenLift(newsroom, story, 'A supplier was renamed after checking.')
    for (const email of [newsroom.emails.reporter, newsroom.emails['fact-checker']]) {
      const mail = await waitForMail(email, `Lock lifted: ${story.title}`)
      expect(mail.text).toContain('A supplier was renamed after checking.')
    }
  })

  it('tells every other member that the investigation is published, with the reason for open checks, never the public link', async () => {
    const published = await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, { reason: 'The council confirmed the figures by phone.' })
    expectStatus(published, 201)
    const token = published.body.url.split('/p/')[1]
    for (const role of ['admin', 'fact-checker', 'reporter'] as const) {
      const mail = await waitForMail(newsroom.emails[role], `Published: ${story.title}`)
      expect(mail.text).toContain('The council confirmed the figures by phone.')
      expect(mail.text).toContain(`/investigations/${story.id}`)
      // The e-mail never carries the public link: members who may publish find it under Publishing.
      expect(mail.text).not.toContain(token)
    }
    expect(await noticesAbout(newsroom.emails['data-editor'], story)).not.toContain(`Published: ${story.title}`)
  })
})

describe('turning notices off', () => {
  it('sends a reporter who turned them off none of them, while others still get theirs', async () => {
    const { newsroom, story } = await deskWithStory('Quiet reporter')
    const off = await newsroom.reporter.patch('/api/me/preferences', { notifyByEmail: false })
    expectStatus(off, 200)
    expect((await newsroom.reporter.get('/api/me')).body.notifyByEmail).toBe(false)

    expectStatus(await sendBack(newsroom, story, 'Use the net amounts.'), 200)
    expectStatus(await dispute(newsroom, story, 'The share is rounded.'), 200)
    await verifyThenLift(newsroom, story, 'Wrong supplier cited.')
    // The verifier's copy of the last notice shows the mail path worked; the sink stores a message before answering SMTP.
    await waitForMail(newsroom.emails['fact-checker'], `Lock lifted: ${story.title}`)
    expect(await noticesAbout(newsroom.emails.reporter, story)).toEqual([])
  })

  it('sends a data editor who turned them off no review request, and again once turned back on', async () => {
    const { newsroom, story } = await deskWithStory('Quiet editor')
    expectStatus(await newsroom['data-editor'].patch('/api/me/preferences', { notifyByEmail: false }), 200)
    expectStatus(await newsroom.reporter.post(`/api/investigations/${story.id}/review-request`), 200)
    await waitForMail(newsroom.emails.admin, `Review requested: ${story.title}`)
    expect(await noticesAbout(newsroom.emails['data-editor'], story)).toEqual([])

    expectStatus(await newsroom['data-editor'].patch('/api/me/preferences', { notifyByEmail: true }), 200)
    expectStatus(await newsroom.reporter.post(`/api/investigations/${story.id}/review-request`), 200)
    await waitForMail(newsroom.emails['data-editor'], `Review requested: ${story.title}`)
  })

  it('needs a session and a yes or no', async () => {
    expectStatus(await new Client().patch('/api/me/preferences', { notifyByEmail: false }), 401)
    const newsroom = await createTestNewsroom('Preference input')
    const bad = await newsroom.reporter.patch('/api/me/preferences', { notifyByEmail: 'sometimes' })
    expectStatus(bad, 400)
    expect(bad.body.data[0].path).toBe('notifyByEmail')
  })
})
