import { beforeAll, describe, expect, it } from 'vitest'
import { ROLES } from '#shared/auth/roles'
import { PAYMENT_FILES } from '../fixtures/datasets/payments'
import { Client } from '../support/api'
import { utf8 } from '../support/dataset-files'
import { sql } from '../support/database'
import { upload, uploadReady } from '../support/datasets'
import { createTestNewsroom, type TestNewsroom } from '../support/newsroom'

let mine: TestNewsroom
let theirs: TestNewsroom
let id: string
beforeAll(async () => {
  ;[mine, theirs] = await Promise.all([createTestNewsroom('Permissions desk'), createTestNewsroom('Other desk')])
  id = (await uploadReady(mine.reporter, PAYMENT_FILES.csv.name, await PAYMENT_FILES.csv.bytes())).id
})

/** Every dataset route, each as one call; `newsroomId` names the newsroom the list and upload address. */
function everyRoute(client: Client, newsroomId: string) {
  const file = () => utf8(`vendor,amount\r\nPermission Probe ${Date.now()},10\r\n`)
  return {
    'list': () => client.get(`/api/datasets?newsroomId=${newsroomId}`),
    'upload': () => upload(client, 'probe.csv', file(), {}, `?newsroomId=${newsroomId}`),
    'read': () => client.get(`/api/datasets/${id}`),
    'preview': () => client.get(`/api/datasets/${id}/preview`),
    'digit test': () => client.post(`/api/datasets/${id}/digit-tests`, { column: 'amount', test: 'first-digit' }),
    'drill-down': () => client.get(`/api/datasets/${id}/rows?column=amount&key=1`),
    'archive': () => client.post(`/api/datasets/${id}/archive`),
    'delete': () => client.delete(`/api/datasets/${id}`),
  }
}

async function datasetsOf(newsroomId: string): Promise<number> {
  return (await sql(`SELECT count(*)::int AS n FROM datasets WHERE newsroom_id = $1`, [newsroomId])).rows[0].n
}

// The role table (shared/auth/permissions.ts, after docs/product-rules.md "Who does what"): a fact-checker reads
// everything and uploads nothing; another newsroom's ids answer 404; no session answers 401.
describe('dataset permissions', () => {
  it('lets a fact-checker read every route and refuses the upload with 403', async () => {
    const routes = everyRoute(mine['fact-checker'], mine.id)
    for (const name of ['list', 'read', 'preview', 'digit test', 'drill-down'] as const) {
      expect((await routes[name]()).status, name).toBe(200)
    }
    const before = await datasetsOf(mine.id)
    const refused = await routes.upload()
    expect(refused.status).toBe(403)
    expect(refused.body.statusCode).toBe(403)
    expect(await datasetsOf(mine.id)).toBe(before)
    expect((await routes.archive()).status).toBe(403)
    expect((await routes.delete()).status).toBe(403)
  })

  it('answers 404 on every dataset route to each member of another newsroom', async () => {
    const before = await datasetsOf(mine.id)
    for (const role of ROLES) {
      for (const [name, call] of Object.entries(everyRoute(theirs[role], mine.id))) {
        expect((await call()).status, `${role}: ${name}`).toBe(404)
      }
    }
    expect(await datasetsOf(mine.id)).toBe(before)
  })

  it('answers 401 on every dataset route without a session', async () => {
    for (const [name, call] of Object.entries(everyRoute(new Client(), mine.id))) {
      expect((await call()).status, name).toBe(401)
    }
  })

  it('leaves the dataset as it was after all the refusals', async () => {
    const reply = await mine.admin.get(`/api/datasets/${id}`)
    expect(reply.status).toBe(200)
    expect(reply.body).toMatchObject({ status: 'ready', archived: false })
  })
})
