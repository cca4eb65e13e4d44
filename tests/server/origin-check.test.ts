import { beforeAll, describe, expect, it } from 'vitest'
import { baseUrl, Client } from '../support/api'
import type { Reply } from '../support/api'
import { createTestNewsroom, PASSWORD } from '../support/newsroom'
import type { TestNewsroom } from '../support/newsroom'
import { expectStatus, readStory, uploadPayments, writeStory } from '../support/stories'
import type { Story } from '../support/stories'

// What a browser sends with a request made by a page of another site: its Origin header (Fetch
// standard, "append a request Origin header"), or Sec-Fetch-Site / Referer when Origin is missing.
const ELSEWHERE = 'https://elsewhere.example'
const FROM_ELSEWHERE = { origin: ELSEWHERE }

function expectRefused(reply: Reply, from: string) {
  expect(reply.status, JSON.stringify(reply.body)).toBe(403)
  expect(reply.body).toMatchObject({ statusCode: 403, statusMessage: 'Not allowed' })
  expect(reply.body.data.message).toContain('only from its own pages')
  expect(reply.body.data.message).toContain(from)
}

let newsroom: TestNewsroom
let story: Story
beforeAll(async () => {
  newsroom = await createTestNewsroom('Origin desk')
  const datasetId = await uploadPayments(newsroom.reporter, newsroom.id)
  story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
})

describe('changes from another site', () => {
  it('refuses a cross-site POST, PATCH and DELETE with 403 and changes nothing', async () => {
    const { reporter } = newsroom
    const before = await readStory(reporter, story)

    expectRefused(await reporter.request('POST', '/api/investigations', { newsroomId: newsroom.id, title: 'Planted from elsewhere' }, FROM_ELSEWHERE), ELSEWHERE)
    expectRefused(await reporter.request('PATCH', `/api/investigations/${story.id}`, { title: 'Renamed from elsewhere' }, FROM_ELSEWHERE), ELSEWHERE)
    expectRefused(await reporter.request('DELETE', `/api/blocks/${story.analysisBlockId}`, undefined, FROM_ELSEWHERE), ELSEWHERE)

    const after = await readStory(reporter, story)
    expect(after.title).toBe(before.title)
    expect(after.blocks.map((b: { id: string, version: number }) => [b.id, b.version])).toEqual(before.blocks.map((b: { id: string, version: number }) => [b.id, b.version]))
    const list = await reporter.get(`/api/investigations?newsroomId=${newsroom.id}`)
    expect(list.body.map((i: { title: string }) => i.title)).not.toContain('Planted from elsewhere')
  })

  it('refuses sign-in and sign-out from another site, including the session library\'s own route', async () => {
    const stranger = new Client()
    const login = await stranger.request('POST', '/api/auth/login', { email: newsroom.emails.reporter, password: PASSWORD }, FROM_ELSEWHERE)
    expectRefused(login, ELSEWHERE)
    expect(login.headers.getSetCookie()).toEqual([])

    const checker = newsroom['fact-checker']
    expectRefused(await checker.request('POST', '/api/auth/logout', {}, FROM_ELSEWHERE), ELSEWHERE)
    expectRefused(await checker.request('DELETE', '/api/_auth/session', undefined, FROM_ELSEWHERE), ELSEWHERE)
    expect((await checker.get('/api/me')).status).toBe(200)
  })

  it('reads a foreign site from Sec-Fetch-Site or Referer when Origin is missing, and refuses an opaque origin', async () => {
    const path = `/api/investigations/${story.id}`
    const { reporter } = newsroom
    expectRefused(await reporter.request('PATCH', path, { title: 'x' }, { 'sec-fetch-site': 'cross-site' }), 'cross-site')
    // A neighbouring subdomain is the same site but not Mantissa.
    expectRefused(await reporter.request('PATCH', path, { title: 'x' }, { 'sec-fetch-site': 'same-site' }), 'same-site')
    expectRefused(await reporter.request('PATCH', path, { title: 'x' }, { referer: `${ELSEWHERE}/some/page` }), ELSEWHERE)
    expectRefused(await reporter.request('PATCH', path, { title: 'x' }, { origin: 'null' }), 'hides its origin')
    // Same host name, another port: another origin.
    const otherPort = new URL(baseUrl)
    otherPort.port = String(Number(otherPort.port || 80) + 1)
    expectRefused(await reporter.request('PATCH', path, { title: 'x' }, { origin: otherPort.origin }), otherPort.origin)
    expect((await readStory(reporter, story)).title).toBe(story.title)
  })
})

describe('changes from Mantissa itself and from scripts', () => {
  it('accepts a same-origin change by Origin, by Sec-Fetch-Site and by Referer', async () => {
    const { reporter } = newsroom
    const path = `/api/investigations/${story.id}`
    // A rename names the title version it starts from (a stale one is a 409, another test's business).
    const rename = async (title: string, headers: Record<string, string>) =>
      reporter.request('PATCH', path, { title, titleVersion: (await readStory(reporter, story)).titleVersion }, headers)
    expectStatus(await rename('Renamed on the page', { 'origin': new URL(baseUrl).origin, 'sec-fetch-site': 'same-origin' }), 200)
    expect((await readStory(reporter, story)).title).toBe('Renamed on the page')
    expectStatus(await rename('Renamed by fetch metadata', { 'sec-fetch-site': 'same-origin' }), 200)
    expectStatus(await rename(story.title, { referer: `${baseUrl}/investigations/${story.id}` }), 200)
    expect((await readStory(reporter, story)).title).toBe(story.title)
  })

  it('accepts a script that sends no Origin at all (the scripting API), and reads from anywhere', async () => {
    const created = await newsroom.reporter.post('/api/investigations', { newsroomId: newsroom.id, title: 'Made by a script' })
    expectStatus(created, 201)
    const removed = await newsroom.reporter.delete(`/api/blocks/${created.body.blocks[0].id}`)
    expectStatus(removed, 200)
    expectStatus(await newsroom.reporter.request('GET', `/api/investigations/${story.id}`, undefined, FROM_ELSEWHERE), 200)
  })
})
