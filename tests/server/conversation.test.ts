import { beforeAll, describe, expect, it } from 'vitest'
import { Client } from '../support/api'
import { mailTo, waitForMail } from '../support/mail'
import { createTestNewsroom, PASSWORD, signedIn } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { CLAIM_TEXT, expectStatus, postClaim, proseDoc, saveBlock, uploadPayments, writeStory } from '../support/stories'
import type { Story } from '../support/stories'

// docs/product-rules.md ("Conversations and notifications"; "Who does what": every member reads the
// newsroom; "Newsroom walls": another newsroom's ids answer 404, no session 401), from issue 20.

type Role = 'admin' | 'data-editor' | 'fact-checker' | 'reporter'
const text = (value: string) => ({ type: 'text', text: value })
const mention = (userId: string) => ({ type: 'mention', userId })

async function idOf(client: Client): Promise<string> {
  const me = await client.get('/api/me')
  expectStatus(me, 200)
  return me.body.user.id
}

async function notices(client: Client, query = '') {
  const reply = await client.get(`/api/me/notifications${query}`)
  expectStatus(reply, 200)
  return reply.body as { unread: number, items: { id: string, kind: string, path: string, excerpt: string, actor: string, read: boolean, investigationTitle: string }[], next: string | null }
}

async function threadsOf(client: Client, story: Story) {
  const reply = await client.get(`/api/investigations/${story.id}/threads`)
  expectStatus(reply, 200)
  return reply.body as { threads: any[], members: { id: string, name: string }[] }
}

describe('conversations on blocks, reviews and claims', () => {
  let newsroom: TestNewsroom
  let other: TestNewsroom
  let story: Story
  const ids = {} as Record<Role, string>
  beforeAll(async () => {
    [newsroom, other] = await Promise.all([createTestNewsroom('Talk'), createTestNewsroom('Talk elsewhere')])
    story = await writeStory(newsroom.reporter, newsroom.id, await uploadPayments(newsroom.reporter, newsroom.id))
    expectStatus(await postClaim(newsroom.reporter, story), 201)
    for (const role of ['admin', 'data-editor', 'fact-checker', 'reporter'] as const) ids[role] = await idOf(newsroom[role])
  })

  it('starts a thread on a block, takes replies, and tells those who wrote in it before', async () => {
    const started = await newsroom.reporter.post(`/api/investigations/${story.id}/threads`, { subjectType: 'block', subjectId: story.proseBlockId, parts: [text('Is the harbour figure from the 2023 ledger?')] })
    expectStatus(started, 201)
    expect(started.body).toMatchObject({ subjectType: 'block', subjectId: story.proseBlockId, blockId: story.proseBlockId, resolved: null })
    expect(started.body.messages).toHaveLength(1)
    expect(started.body.messages[0]).toMatchObject({ kind: 'message', author: newsroom.names.reporter, parts: [text('Is the harbour figure from the 2023 ledger?')] })

    // A second first message on the same block joins the same thread.
    const again = await newsroom['data-editor'].post(`/api/investigations/${story.id}/threads`, { subjectType: 'block', subjectId: story.proseBlockId, parts: [text('It is.')] })
    expectStatus(again, 201)
    expect(again.body.id).toBe(started.body.id)

    const reply = await newsroom['fact-checker'].post(`/api/threads/${started.body.id}/messages`, { parts: [text('The ledger says 2023, page 4.')] })
    expectStatus(reply, 201)
    expect(reply.body.messages.map((m: { author: string }) => m.author)).toEqual([newsroom.names.reporter, newsroom.names['data-editor'], newsroom.names['fact-checker']])

    // Everyone who wrote before is told of the reply; the one who wrote it is not.
    for (const role of ['reporter', 'data-editor'] as const) {
      const found = (await notices(newsroom[role])).items.find(n => n.kind === 'reply' && n.excerpt === 'The ledger says 2023, page 4.')
      expect(found, role).toMatchObject({ actor: newsroom.names['fact-checker'], path: `/investigations/${story.id}#block-${story.proseBlockId}`, read: false, investigationTitle: story.title })
    }
    expect((await notices(newsroom['fact-checker'])).items.filter(n => n.excerpt === 'The ledger says 2023, page 4.')).toEqual([])

    const { threads } = await threadsOf(newsroom.admin, story)
    expect(threads.find(t => t.id === started.body.id).messages).toHaveLength(3)
  })

  it('keeps a message as plain text: markup is text, never HTML', async () => {
    const hostile = '<img src=x onerror="alert(1)"><script>alert(2)</script> & “quotes”'
    const reply = await newsroom['fact-checker'].post(`/api/investigations/${story.id}/threads`, { subjectType: 'review', subjectId: story.analysisBlockId, parts: [text(hostile)] })
    expectStatus(reply, 201)
    expect(reply.headers.get('content-type')).toMatch(/application\/json/)
    expect(reply.body.messages.at(-1).parts).toEqual([text(hostile)])
  })

  it('stores a mention as the member\'s id, notifies them in the app and by e-mail, and respects the opt-out', async () => {
    expectStatus(await newsroom.admin.patch('/api/me/preferences', { emailMentions: false }), 200)
    const me = await newsroom.admin.get('/api/me')
    expect(me.body).toMatchObject({ emailMentions: false, notifyByEmail: true })
    const parts = [mention(ids['data-editor']), text(' and '), mention(ids.admin), text(' can you look at the cancelled invoices?')]
    const posted = await newsroom.reporter.post(`/api/investigations/${story.id}/threads`, { subjectType: 'claim', subjectId: story.claimId, parts })
    expectStatus(posted, 201)
    // Stored as ids and drawn with the members' names as they are now.
    expect(posted.body.messages.at(-1).parts).toEqual([
      { type: 'mention', userId: ids['data-editor'], name: newsroom.names['data-editor'] }, text(' and '),
      { type: 'mention', userId: ids.admin, name: newsroom.names.admin }, text(' can you look at the cancelled invoices?'),
    ])
    const path = `/investigations/${story.id}#claim-${story.claimId}`
    for (const role of ['data-editor', 'admin'] as const) {
      const found = (await notices(newsroom[role])).items.find(n => n.kind === 'mention' && n.excerpt.includes('cancelled invoices'))
      expect(found, role).toMatchObject({ path, actor: newsroom.names.reporter })
      expect(found!.excerpt).toBe(`@${newsroom.names['data-editor']} and @${newsroom.names.admin} can you look at the cancelled invoices?`)
    }
    const mail = await waitForMail(newsroom.emails['data-editor'], `${newsroom.names.reporter} mentioned you`)
    expect(mail.subject).toContain(story.title)
    expect(mail.text).toContain('can you look at the cancelled invoices?')
    expect(mail.text).toContain(path)
    // The admin turned mention e-mails off: the same message reached the editor's inbox, not theirs.
    expect((await mailTo(newsroom.emails.admin)).filter(m => m.subject.includes('mentioned you'))).toEqual([])
    expectStatus(await newsroom.admin.patch('/api/me/preferences', { emailMentions: true }), 200)
  })

  it('refuses a mention of someone outside the newsroom, and stores nothing', async () => {
    const outsiderId = await idOf(other.reporter)
    const before = (await threadsOf(newsroom.reporter, story)).threads.flatMap(t => t.messages).length
    const refused = await newsroom.reporter.post(`/api/investigations/${story.id}/threads`, { subjectType: 'block', subjectId: story.analysisBlockId, parts: [text('Ask '), mention(outsiderId)] })
    expectStatus(refused, 400)
    expect(refused.body.data).toEqual([{ path: 'parts.1.userId', message: 'Only members of this newsroom can be mentioned.' }])
    expect((await threadsOf(newsroom.reporter, story)).threads.flatMap(t => t.messages)).toHaveLength(before)
    expect((await notices(other.reporter)).items).toEqual([])
    expect((await mailTo(other.emails.reporter)).filter(m => m.subject.includes('mentioned you'))).toEqual([])
  })

  it('refuses an empty message and a subject of another investigation', async () => {
    expectStatus(await newsroom.reporter.post(`/api/investigations/${story.id}/threads`, { subjectType: 'block', subjectId: story.proseBlockId, parts: [text('   ')] }), 400)
    const elsewhere = await writeStory(other.reporter, other.id, await uploadPayments(other.reporter, other.id))
    const refused = await newsroom.reporter.post(`/api/investigations/${story.id}/threads`, { subjectType: 'block', subjectId: elsewhere.proseBlockId, parts: [text('Hello')] })
    expectStatus(refused, 400)
    expect(refused.body.data[0].path).toBe('subjectId')
    // A review thread is for an analysis block only.
    expectStatus(await newsroom.reporter.post(`/api/investigations/${story.id}/threads`, { subjectType: 'review', subjectId: story.proseBlockId, parts: [text('Hello')] }), 400)
  })

  it('resolves and reopens a thread, showing who and when, and writes both to the audit trail once', async () => {
    const started = await newsroom.reporter.post(`/api/investigations/${story.id}/threads`, { subjectType: 'block', subjectId: story.analysisBlockId, parts: [text('Should refunds stay out?')] })
    expectStatus(started, 201)
    const threadId = started.body.id
    const resolved = await newsroom['fact-checker'].post(`/api/threads/${threadId}/resolve`)
    expectStatus(resolved, 200)
    expect(resolved.body.resolved.by).toBe(newsroom.names['fact-checker'])
    expect(Date.now() - Date.parse(resolved.body.resolved.at)).toBeLessThan(60_000)
    expectStatus(await newsroom['fact-checker'].post(`/api/threads/${threadId}/resolve`), 200)
    const reopened = await newsroom.reporter.post(`/api/threads/${threadId}/reopen`)
    expectStatus(reopened, 200)
    expect(reopened.body).toMatchObject({ resolved: null, reopened: { by: newsroom.names.reporter } })

    const trail = await newsroom.admin.get(`/api/investigations/${story.id}/audit?kind=thread`)
    expectStatus(trail, 200)
    const events = trail.body.events.filter((e: { subjectId: string }) => e.subjectId === threadId)
    expect(events.map((e: { action: string, actor: string }) => [e.action, e.actor])).toEqual([
      ['thread.reopened', newsroom.names.reporter], ['thread.resolved', newsroom.names['fact-checker']],
    ])
    expect(events[0].detail).toMatchObject({ about: 'block', blockId: story.analysisBlockId })

    // A new message in a resolved thread opens it again, and the trail says so.
    expectStatus(await newsroom.reporter.post(`/api/threads/${threadId}/resolve`), 200)
    const answered = await newsroom['data-editor'].post(`/api/threads/${threadId}/messages`, { parts: [text('Not settled: the refunds matter.')] })
    expectStatus(answered, 201)
    expect(answered.body.resolved).toBeNull()
    expect(answered.body.reopened.by).toBe(newsroom.names['data-editor'])
    const after = await newsroom.admin.get(`/api/investigations/${story.id}/audit?kind=thread.reopened`)
    expect(after.body.events.filter((e: { subjectId: string }) => e.subjectId === threadId)).toHaveLength(2)
  })

  it('starts the review\'s thread with the note of a method sent back, and the claim\'s with the note of a dispute', async () => {
    const note = 'Leave out the cancelled invoices before reading the first digits.'
    const sentBack = await newsroom['data-editor'].post(`/api/blocks/${story.analysisBlockId}/review`, { decision: 'sent-back', note })
    expectStatus(sentBack, 200)
    const disputeNote = 'Two of the five rows are refunds.'
    const disputed = await newsroom['fact-checker'].post(`/api/claims/${story.claimId}/dispute`, { note: disputeNote })
    expectStatus(disputed, 200)

    const { threads } = await threadsOf(newsroom.reporter, story)
    const review = threads.find(t => t.subjectType === 'review' && t.subjectId === story.analysisBlockId)
    expect(review.messages.at(-1)).toMatchObject({ kind: 'sent-back', author: newsroom.names['data-editor'], parts: [text(note)] })
    const claim = threads.find(t => t.subjectType === 'claim' && t.subjectId === story.claimId)
    expect(claim.messages.at(-1)).toMatchObject({ kind: 'disputed', author: newsroom.names['fact-checker'], parts: [text(disputeNote)] })
    // Each decision answers its record with the conversation as it then stood: the page shows it without reading every thread again.
    expect(sentBack.body).toMatchObject({ id: story.analysisBlockId, review: { status: 'sent-back', note } })
    expect(sentBack.body.thread).toEqual(review)
    expect(disputed.body).toMatchObject({ id: story.claimId, status: 'disputed', note: disputeNote })
    expect(disputed.body.thread).toEqual(claim)

    const mine = await notices(newsroom.reporter)
    expect(mine.items.find(n => n.kind === 'sent-back')).toMatchObject({ path: `/investigations/${story.id}#review-${story.analysisBlockId}`, excerpt: note })
    expect(mine.items.find(n => n.kind === 'disputed')).toMatchObject({ path: `/investigations/${story.id}#claim-${story.claimId}`, excerpt: disputeNote })
    // The reporter wrote in the claim's thread before: told once, of the dispute, not also of a "reply".
    expect(mine.items.filter(n => n.excerpt === disputeNote).map(n => n.kind)).toEqual(['disputed'])
    // The e-mail of the dispute links to the passage too.
    const mail = await waitForMail(newsroom.emails.reporter, `Claim disputed: ${story.title}`)
    expect(mail.text).toContain(`/investigations/${story.id}#claim-${story.claimId}`)

    // The reporter answers the dispute in its thread; the fact-checker who disputed is told.
    const answer = await newsroom.reporter.post(`/api/threads/${claim.id}/messages`, { parts: [text('The refunds are left out in the second run.')] })
    expectStatus(answer, 201)
    expect((await notices(newsroom['fact-checker'])).items.find(n => n.kind === 'reply' && n.excerpt.startsWith('The refunds are left out'))).toMatchObject({ path: `/investigations/${story.id}#claim-${story.claimId}` })
  })

  it('keeps the conversations of two newsrooms apart when their claims share an id', async () => {
    // docs/product-rules.md: a claim's id names it within its investigation only, so another
    // newsroom may mark a claim with the same id; its conversation must be its own.
    const theirs = await writeStory(other.reporter, other.id, await uploadPayments(other.reporter, other.id))
    expectStatus(await saveBlock(other.reporter, theirs, theirs.proseBlockId, { content: proseDoc('Copied ', { text: 'an id', claimId: story.claimId }) }), 200)
    expectStatus(await other.reporter.post(`/api/investigations/${theirs.id}/claims`, { id: story.claimId, blockId: theirs.proseBlockId, supportingBlockIds: [] }), 201)
    const started = await other.reporter.post(`/api/investigations/${theirs.id}/threads`, { subjectType: 'claim', subjectId: story.claimId, parts: [text('Our own question.')] })
    expectStatus(started, 201)
    expect(started.body.messages.map((m: { parts: unknown }) => m.parts)).toEqual([[text('Our own question.')]])
    const ours = (await threadsOf(newsroom.reporter, story)).threads.find(t => t.subjectType === 'claim' && t.subjectId === story.claimId)
    if (ours) expect(ours.id).not.toBe(started.body.id)
    const seen = JSON.stringify(await threadsOf(newsroom.reporter, story))
    expect(seen).not.toContain('Our own question.')
    // Nor does the trail name their claim's words for ours ("claim.marked" keeps no quote of its own).
    const trail = await newsroom.admin.get(`/api/investigations/${story.id}/audit?kind=claim`)
    expectStatus(trail, 200)
    const named = trail.body.events.filter((e: { subjectId: string }) => e.subjectId === story.claimId).map((e: { claim: string | null }) => e.claim)
    expect(named.length).toBeGreaterThan(0)
    expect(named.filter((quote: string | null) => quote === 'an id')).toEqual([])
  })

  it('keeps 404 for a member of another newsroom and 401 without a session on every conversation route', async () => {
    const { threads } = await threadsOf(newsroom.reporter, story)
    const threadId = threads[0].id
    const outsider = other.admin
    expectStatus(await outsider.get(`/api/investigations/${story.id}/threads`), 404)
    expectStatus(await outsider.post(`/api/investigations/${story.id}/threads`, { subjectType: 'block', subjectId: story.proseBlockId, parts: [text('Hello')] }), 404)
    expectStatus(await outsider.post(`/api/threads/${threadId}/messages`, { parts: [text('Hello')] }), 404)
    expectStatus(await outsider.post(`/api/threads/${threadId}/resolve`), 404)
    expectStatus(await outsider.post(`/api/threads/${threadId}/reopen`), 404)
    const anonymous = new Client()
    expectStatus(await anonymous.get(`/api/investigations/${story.id}/threads`), 401)
    expectStatus(await anonymous.post(`/api/threads/${threadId}/messages`, { parts: [text('Hello')] }), 401)
    expectStatus(await anonymous.get('/api/me/notifications'), 401)
  })
})

describe('notifications in the app', () => {
  let newsroom: TestNewsroom
  let story: Story
  beforeAll(async () => {
    newsroom = await createTestNewsroom('Notices in the app')
    story = await writeStory(newsroom.reporter, newsroom.id, await uploadPayments(newsroom.reporter, newsroom.id))
    expectStatus(await postClaim(newsroom.reporter, story), 201)
  })

  it('tells data editors and admins that review is requested, at the first method waiting', async () => {
    expectStatus(await newsroom.reporter.post(`/api/investigations/${story.id}/review-request`), 200)
    for (const role of ['data-editor', 'admin'] as const) {
      expect((await notices(newsroom[role])).items.find(n => n.kind === 'review-requested'), role)
        .toMatchObject({ path: `/investigations/${story.id}#review-${story.analysisBlockId}`, actor: newsroom.names.reporter })
    }
    expect((await notices(newsroom.reporter)).items.filter(n => n.kind === 'review-requested')).toEqual([])
    expect((await notices(newsroom['fact-checker'])).items.filter(n => n.kind === 'review-requested')).toEqual([])
  })

  it('tells the reporter that a claim is verified, at the passage', async () => {
    expectStatus(await newsroom['fact-checker'].post(`/api/claims/${story.claimId}/verify`, { quote: CLAIM_TEXT }), 200)
    expect((await notices(newsroom.reporter)).items.find(n => n.kind === 'verified'))
      .toMatchObject({ path: `/investigations/${story.id}#claim-${story.claimId}`, excerpt: CLAIM_TEXT, actor: newsroom.names['fact-checker'] })
  })

  it('tells every other member of a publication', async () => {
    expectStatus(await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, { reason: 'Checked by phone with the council.' }), 201)
    for (const role of ['admin', 'fact-checker', 'reporter'] as const) {
      expect((await notices(newsroom[role])).items.find(n => n.kind === 'published'), role).toMatchObject({ path: `/investigations/${story.id}` })
    }
    expect((await notices(newsroom['data-editor'])).items.filter(n => n.kind === 'published')).toEqual([])
  })

  it('counts unread notices, marks one read, then all, and never another member\'s', async () => {
    const start = await notices(newsroom.reporter)
    expect(start.unread).toBe(start.items.filter(n => !n.read).length)
    expect(start.unread).toBeGreaterThanOrEqual(2)
    const [first] = start.items
    // Another member cannot mark the reporter's notices read: their ids change nothing.
    expectStatus(await newsroom.admin.post('/api/me/notifications/read', { ids: [first!.id] }), 200)
    expect((await notices(newsroom.reporter)).unread).toBe(start.unread)

    const one = await newsroom.reporter.post('/api/me/notifications/read', { ids: [first!.id] })
    expectStatus(one, 200)
    expect(one.body.unread).toBe(start.unread - 1)
    const after = await notices(newsroom.reporter)
    expect(after.items.find(n => n.id === first!.id)!.read).toBe(true)
    expect((await notices(newsroom.reporter, '?unread=true')).items.map(n => n.id)).not.toContain(first!.id)

    const all = await newsroom.reporter.post('/api/me/notifications/read', { all: true })
    expectStatus(all, 200)
    expect(all.body.unread).toBe(0)
    expect((await notices(newsroom.reporter)).items.every(n => n.read)).toBe(true)
    expect((await notices(newsroom.admin)).unread).toBeGreaterThan(0)
  })

  it('pages newest first', async () => {
    const full = await notices(newsroom.admin)
    expect(full.items.length).toBeGreaterThanOrEqual(2)
    const first = await notices(newsroom.admin, '?limit=1')
    expect(first.items.map(n => n.id)).toEqual([full.items[0]!.id])
    const second = await notices(newsroom.admin, `?limit=1&before=${first.next}`)
    expect(second.items.map(n => n.id)).toEqual([full.items[1]!.id])
  })

  it('points the queues at the block or the passage, not the top of the investigation', async () => {
    const fresh = await writeStory(newsroom.reporter, newsroom.id, await uploadPayments(newsroom.reporter, newsroom.id))
    expectStatus(await postClaim(newsroom.reporter, fresh), 201)
    expectStatus(await newsroom.reporter.post(`/api/investigations/${fresh.id}/review-request`), 200)
    const queue = await newsroom['data-editor'].get(`/api/newsrooms/${newsroom.id}/queue`)
    expectStatus(queue, 200)
    expect(queue.body.review.find((i: { blockId: string }) => i.blockId === fresh.analysisBlockId).anchor).toBe(`review-${fresh.analysisBlockId}`)
    expect(queue.body.factCheck.find((i: { investigationId: string }) => i.investigationId === fresh.id).anchor).toBe(`claim-${fresh.claimId}`)
  })

  it('shows nothing of a newsroom the member no longer belongs to', async () => {
    expect((await notices(newsroom['fact-checker'])).items.length).toBeGreaterThan(0)
    const members = await newsroom.admin.get(`/api/newsrooms/${newsroom.id}/members`)
    const membership = members.body.find((m: { email: string }) => m.email === newsroom.emails['fact-checker'])
    expectStatus(await newsroom.admin.delete(`/api/memberships/${membership.membershipId}`), 200)
    const again = await signedIn(newsroom.emails['fact-checker'], PASSWORD)
    expect(await notices(again)).toEqual({ unread: 0, items: [], next: null })
  })
})
