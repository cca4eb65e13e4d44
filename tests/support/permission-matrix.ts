import { randomUUID } from 'node:crypto'
import ExcelJS from 'exceljs'
import { expect } from 'vitest'
import { Client, signedIn } from './api'
import type { Reply } from './api'
import { upload } from './datasets'
import { invite, inviteMember, PASSWORD } from './newsroom'
import { EVERYONE, openDesk, refusalFor } from './roles'
import type { Desk, Who } from './roles'
import { expectStatus, postClaim, proseDoc, uploadPayments, writeStory } from './stories'
import type { Story } from './stories'

/**
 * Who knocks on each route: the four roles of the newsroom ('owner' is the reporter who made
 * the records, 'other-reporter' a second reporter of the same desk), an admin of another
 * newsroom, nobody, and a public-link visitor (no account; has opened a published link).
 */
export const ACTORS = [...EVERYONE, 'visitor'] as const
export type Actor = typeof ACTORS[number]

const COLUMN_LABELS: Record<Actor, string> = {
  'admin': 'admin',
  'data-editor': 'editor',
  'fact-checker': 'checker',
  'owner': 'rep-own',
  'other-reporter': 'rep-other',
  'outsider': 'outsider',
  'anonymous': 'anon',
  'visitor': 'visitor',
}

export type Expected = Record<Actor, number>

/** A newsroom action: `allowed` get `success`; every other caller gets their refusal (roles.ts). */
export function allowOnly(allowed: readonly Actor[], success: number): Expected {
  return Object.fromEntries(ACTORS.map(who => [who, allowed.includes(who) ? success : refusalFor(who as Who | 'visitor')])) as Expected
}

/** A route that asks for no session: the same answer for everyone. */
export function everyone(status: number): Expected {
  return Object.fromEntries(ACTORS.map(who => [who, status])) as Expected
}

/** A route about the signed-in person themself: any account, of any newsroom; no session 401. */
export function anyAccount(success: number): Expected {
  return allowOnly(ACTORS.filter(who => who !== 'anonymous' && who !== 'visitor'), success)
}

/** The desk the matrix runs on: roles.ts's desk, a story with a posted claim and a run block, published once, and a visitor of its link. */
export interface MatrixDesk extends Omit<Desk, 'as' | 'emails'> {
  as: Record<Actor, Client>
  emails: Record<Actor, string | null>
  story: Story
  /** The published story's public token, which the visitor holds. */
  publicToken: string
  /** An open invitation's token, for routes that only read it. */
  invitationToken: string
}

const tokenOf = (url: string) => url.split('/p/')[1]!
const uniqueEmail = (label: string) => `matrix-${label}-${randomUUID().slice(0, 8)}@test.example`

export async function openMatrixDesk(): Promise<MatrixDesk> {
  const desk = await openDesk()
  const { newsroom, as } = desk
  const story = await writeStory(as.owner, newsroom.id, desk.datasetId)
  expectStatus(await postClaim(as.owner, story), 201)
  expectStatus(await as.owner.post(`/api/blocks/${story.analysisBlockId}/run`), 200)
  const published = await as['data-editor'].post(`/api/investigations/${story.id}/publish`, { reason: 'Permission matrix: published with its checks open.' })
  expectStatus(published, 201)
  const publicToken = tokenOf(published.body.url)
  // The visitor opens the link as a browser would, page and data, and keeps whatever cookies they set.
  const visitor = new Client()
  expectStatus(await visitor.request('GET', `/p/${publicToken}`, undefined, { accept: 'text/html' }), 200)
  expectStatus(await visitor.get(`/api/public/${publicToken}`), 200)
  const { token: invitationToken } = await invite(newsroom.admin, newsroom.id, uniqueEmail('peek'), 'reporter')
  return { ...desk, as: { ...as, visitor }, emails: { ...desk.emails, visitor: null }, story, publicToken, invitationToken }
}

/** A client holding the same session, for routes that replace or end it. */
export function sameSession(client: Client): Client {
  const copy = new Client()
  copy.cookie = client.cookie
  return copy
}

// Fresh targets. The owner (the desk's reporter) makes each one, so 'own' scope is the owner's.

/** A new prose block in the desk's story. */
export async function freshProseBlock(desk: MatrixDesk, content = proseDoc('A paragraph the permission matrix writes.')) {
  const reply = await desk.as.owner.post(`/api/investigations/${desk.story.id}/blocks`, { kind: 'prose', content })
  expectStatus(reply, 201)
  return { id: reply.body.id as string, version: reply.body.version as number }
}

/** A new analysis block in the desk's story, set to a first-digit test of the desk's dataset. */
export async function freshAnalysisBlock(desk: MatrixDesk) {
  const reply = await desk.as.owner.post(`/api/investigations/${desk.story.id}/blocks`, { kind: 'analysis', settings: desk.story.settings })
  expectStatus(reply, 201)
  return { id: reply.body.id as string }
}

/** A prose block its owner saved once after writing it, so it has a version 1 to restore at version 2. */
export async function freshEditedBlock(desk: MatrixDesk) {
  const block = await freshProseBlock(desk)
  expectStatus(await desk.as.owner.patch(`/api/blocks/${block.id}`, { version: block.version, content: proseDoc('The paragraph as the matrix rewrote it.') }), 200)
  return { id: block.id, version: block.version + 1 }
}

/** A prose block removed by its owner, for restore. */
export async function freshRemovedBlock(desk: MatrixDesk) {
  const block = await freshProseBlock(desk)
  expectStatus(await desk.as.owner.delete(`/api/blocks/${block.id}`), 200)
  return block
}

export const MATRIX_CLAIM = 'one in three invented payments is round'

/** A saved passage with a claim mark whose claim is not posted yet. */
export async function freshMarkedPassage(desk: MatrixDesk) {
  const claimId = randomUUID()
  const block = await freshProseBlock(desk, proseDoc('The matrix says ', { text: MATRIX_CLAIM, claimId }, '.'))
  return { claimId, blockId: block.id }
}

/** An open claim the owner marked, citing no block (verifying it locks nothing shared). */
export async function freshClaim(desk: MatrixDesk) {
  const { claimId, blockId } = await freshMarkedPassage(desk)
  expectStatus(await desk.as.owner.post(`/api/investigations/${desk.story.id}/claims`, { id: claimId, blockId, supportingBlockIds: [] }), 201)
  return { id: claimId }
}

/** A claim the fact-checker has verified, so locked. */
export async function freshVerifiedClaim(desk: MatrixDesk) {
  const claim = await freshClaim(desk)
  expectStatus(await desk.as['fact-checker'].post(`/api/claims/${claim.id}/verify`, { quote: MATRIX_CLAIM }), 200)
  return claim
}

/** A conversation the owner started on a new block of the story; resolved by them when asked. */
export async function freshThread(desk: MatrixDesk, resolved = false) {
  const block = await freshProseBlock(desk)
  const reply = await desk.as.owner.post(`/api/investigations/${desk.story.id}/threads`, { subjectType: 'block', subjectId: block.id, parts: [{ type: 'text', text: 'The matrix starts a conversation.' }] })
  expectStatus(reply, 201)
  if (resolved) expectStatus(await desk.as.owner.post(`/api/threads/${reply.body.id}/resolve`), 200)
  return { id: reply.body.id as string }
}

/** A new draft investigation of the owner: one empty paragraph. */
export async function freshInvestigation(desk: MatrixDesk) {
  const reply = await desk.as.owner.post('/api/investigations', { newsroomId: desk.newsroom.id, title: `Matrix draft ${randomUUID().slice(0, 6)}` })
  expectStatus(reply, 201)
  return { id: reply.body.id as string, layoutVersion: reply.body.layoutVersion as number, blockIds: reply.body.blocks.map((b: { id: string }) => b.id) as string[] }
}

/** A dataset the owner uploaded and no block uses. */
export async function freshDataset(desk: MatrixDesk) {
  return { id: await uploadPayments(desk.as.owner, desk.newsroom.id) }
}

/** A workbook of two sheets the owner uploaded ("2023" read, "2024" left to choose). */
export async function freshWorkbook(desk: MatrixDesk) {
  const workbook = new ExcelJS.Workbook()
  workbook.addWorksheet('2023').addRows([['payee', 'amount'], ['Matrix Probe Ltd', 125]])
  workbook.addWorksheet('2024').addRows([['payee', 'amount'], ['Matrix Probe Ltd', 250]])
  const reply = await upload(desk.as.owner, 'matrix-sheets.xlsx', new Uint8Array(await workbook.xlsx.writeBuffer()), { title: 'Matrix workbook' }, `?newsroomId=${desk.newsroom.id}`)
  expectStatus(reply, 201)
  return { id: reply.body.id as string }
}

/** A pending invitation to a new address: its id and token. */
export function freshInvitation(desk: MatrixDesk) {
  return invite(desk.newsroom.admin, desk.newsroom.id, uniqueEmail('invitee'), 'reporter')
}

/** A new reporter who joined through an invitation: their membership. */
export async function freshMember(desk: MatrixDesk) {
  const email = uniqueEmail('member')
  await inviteMember(desk.newsroom.admin, desk.newsroom.id, email, 'reporter', 'Matrix member')
  const members = await desk.newsroom.admin.get(`/api/newsrooms/${desk.newsroom.id}/members`)
  expectStatus(members, 200)
  return { membershipId: members.body.find((m: { email: string }) => m.email === email).membershipId as string }
}

/** A share link of a freshly published draft. */
export async function freshShareLink(desk: MatrixDesk) {
  const draft = await freshInvestigation(desk)
  const published = await desk.as['data-editor'].post(`/api/investigations/${draft.id}/publish`, {})
  expectStatus(published, 201)
  return { id: published.body.link.id as string }
}

/** A small CSV of invented amounts for upload routes. */
export function uploadProbe(client: Client, desk: MatrixDesk): Promise<Reply> {
  return upload(client, 'matrix-probe.csv', new TextEncoder().encode('payee,amount\r\nMatrix Probe Ltd,125.00\r\n'), { title: 'Matrix probe' }, `?newsroomId=${desk.newsroom.id}`)
}

/**
 * One row of the matrix: a route, the status each actor must get, and how to build the request.
 * `target` runs once for the row, or once per actor when `fresh` (the call changes, removes or
 * locks its target, so no actor may see another's leftovers).
 */
export interface Row<T = any> {
  route: string
  expected: Expected
  /** Why, where docs/product-rules.md is silent or the answer is not a plain role question. */
  why?: string
  fresh?: boolean
  target?: (desk: MatrixDesk) => Promise<T>
  /** Send from a copy of the actor's session (the route replaces it). */
  ownSession?: boolean
  /** The route ends the actor's sessions: afterwards the actor signs in again, so later rows find them signed in. */
  endsSessions?: boolean
  send: (client: Client, target: T, desk: MatrixDesk) => Promise<Reply>
}

export interface Cell {
  who: Actor
  want: number
  got: number
  body: unknown
}

/** Runs every actor's call of a row: targets first (concurrently), then the calls (concurrently). */
export async function runRow<T>(desk: MatrixDesk, row: Row<T>): Promise<Cell[]> {
  const build = async () => (row.target ? row.target(desk) : undefined as T)
  const shared = row.fresh ? undefined : await build()
  const targets = await Promise.all(ACTORS.map(() => (row.fresh ? build() : Promise.resolve(shared as T))))
  return Promise.all(ACTORS.map(async (who, i) => {
    const client = row.ownSession ? sameSession(desk.as[who]) : desk.as[who]
    const reply = await row.send(client, targets[i]!, desk)
    const email = desk.emails[who]
    if (row.endsSessions && email) desk.as[who].cookie = (await signedIn(email, PASSWORD)).cookie
    return { who, want: row.expected[who], got: reply.status, body: reply.body }
  }))
}

const CELL_WIDTH = 10

/** Route × actor: each cell the status as expected, or `expected≠got`; then the bodies of the wrong ones. */
export function matrixTable(results: [string, Cell[]][]): string {
  const pad = (text: string, width: number) => text.padEnd(width)
  const routeWidth = Math.max(...results.map(([route]) => route.length)) + 2
  const header = pad('route', routeWidth) + ACTORS.map(who => pad(COLUMN_LABELS[who], CELL_WIDTH)).join('')
  const lines = results.map(([route, cells]) => pad(route, routeWidth)
    + cells.map(c => pad(c.want === c.got ? String(c.got) : `${c.want}≠${c.got}`, CELL_WIDTH)).join(''))
  const wrong = results.flatMap(([route, cells]) => cells.filter(c => c.want !== c.got)
    .map(c => `  ${route} as ${c.who}: expected ${c.want}, got ${c.got} ${JSON.stringify(c.body).slice(0, 200)}`))
  return ['cell: the status as expected, or expected≠got', header, ...lines, ...(wrong.length ? ['', ...wrong] : [])].join('\n')
}

/** Fails with the row's table unless every cell got its expected status. */
export function expectRow(route: string, cells: Cell[]) {
  expect(cells.filter(c => c.want !== c.got).map(c => `${c.who}: expected ${c.want}, got ${c.got}`), `\n${matrixTable([[route, cells]])}\n`).toEqual([])
}
