import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { Client } from '../support/api'
import { PASSWORD } from '../support/newsroom'
import {
  allowOnly, anyAccount, everyone, expectRow, freshAnalysisBlock, freshClaim, freshDataset, freshEditedBlock, freshInvestigation, freshWorkbook,
  freshInvitation, freshMarkedPassage, freshMember, freshProseBlock, freshRemovedBlock, freshShareLink,
  freshThread, freshVerifiedClaim, MATRIX_CLAIM, matrixTable, openMatrixDesk, runRow, uploadProbe,
} from '../support/permission-matrix'
import type { Actor, Cell, MatrixDesk, Row } from '../support/permission-matrix'
import { apiRoutes } from '../support/route-files'
import { proseDoc } from '../support/stories'

// Who may do what, from docs/product-rules.md ("Who does what" and the rules the server enforces), written
// out here rather than read from shared/auth/permissions.ts, so that the test checks the table
// instead of repeating it. A refused member gets 403, another newsroom's member 404, no session 401.
/** Every member reads everything in the newsroom (the fact-checker "reads everything"). */
const MEMBERS = ['admin', 'data-editor', 'fact-checker', 'owner', 'other-reporter'] as const satisfies readonly Actor[]
/** Reporters create investigations and upload datasets; data editors and admins do all a reporter does. */
const CREATORS = ['admin', 'data-editor', 'owner', 'other-reporter'] as const satisfies readonly Actor[]
/** A reporter writes in their own investigation; the data editor "on every investigation of the newsroom". */
const WRITERS = ['admin', 'data-editor', 'owner'] as const satisfies readonly Actor[]
/** Approve or send back a method, lift a lock, publish, unpublish, revoke links. */
const DESK_EDITORS = ['admin', 'data-editor'] as const satisfies readonly Actor[]
/** Mark claims verified (locks them) or disputed. */
const CHECKERS = ['admin', 'fact-checker'] as const satisfies readonly Actor[]
/** Invite members, change roles, remove members. */
const ADMINS = ['admin'] as const satisfies readonly Actor[]

const ROWS: Row[] = [
  // Sessions and the person themself
  {
    route: 'POST /api/auth/login',
    expected: everyone(200),
    why: 'Signing in is what a caller without a session does: valid credentials (here the owner\'s) open it whoever sends them.',
    ownSession: true,
    send: (client, _t, desk) => client.post('/api/auth/login', { email: desk.newsroom.emails.reporter, password: PASSWORD }),
  },
  {
    route: 'POST /api/auth/logout',
    expected: everyone(200),
    why: 'Ending a session is harmless without one, so a script may always call it.',
    endsSessions: true,
    send: client => client.post('/api/auth/logout'),
  },
  {
    route: 'POST /api/auth/logout-everywhere',
    expected: anyAccount(200),
    why: 'Each account ends its own sessions, wherever they are; without a session there is nothing to name.',
    endsSessions: true,
    send: client => client.post('/api/auth/logout-everywhere'),
  },
  {
    route: 'POST /api/auth/password-reset',
    expected: everyone(202),
    why: 'Asked by someone who cannot sign in; the same answer for every address, with or without an account.',
    send: () => new Client().post('/api/auth/password-reset', { email: `matrix-nobody-${randomUUID().slice(0, 8)}@test.example` }),
  },
  {
    route: 'GET /api/auth/password-reset/[token]',
    expected: everyone(404),
    why: 'The mailed link is the key, whoever holds a session: a token nobody was sent is missing for everyone (a real link: password-reset.test.ts).',
    send: client => client.get(`/api/auth/password-reset/${randomUUID()}${randomUUID()}`),
  },
  {
    route: 'POST /api/auth/password-reset/[token]',
    expected: everyone(404),
    why: 'As reading it: the link decides, not a session (a real link: password-reset.test.ts).',
    send: client => client.post(`/api/auth/password-reset/${randomUUID()}${randomUUID()}`, { password: 'a-long-enough-password' }),
  },
  {
    route: 'POST /api/me/password',
    expected: anyAccount(200),
    why: 'Each account changes its own password with the current one (here set to what it was: the caller\'s other sessions end, this one stays).',
    send: client => client.post('/api/me/password', { currentPassword: PASSWORD, newPassword: PASSWORD }),
  },
  {
    route: 'GET /api/me/sessions',
    expected: anyAccount(200),
    why: 'Each account lists its own sessions.',
    send: client => client.get('/api/me/sessions'),
  },
  {
    route: 'DELETE /api/me/sessions/[id]',
    expected: anyAccount(404),
    why: 'Only one\'s own sessions can be ended; an id that is not the caller\'s answers 404 like a missing one (ending one\'s own: sessions.test.ts).',
    send: client => client.delete(`/api/me/sessions/${randomUUID()}`),
  },
  {
    route: 'POST /api/me/two-factor/setup',
    expected: anyAccount(200),
    why: 'Each account sets up its own authenticator; the pending secret changes nothing until a code confirms it.',
    send: client => client.post('/api/me/two-factor/setup'),
  },
  {
    route: 'POST /api/me/two-factor/confirm',
    expected: anyAccount(400),
    why: 'Any account may confirm its own authenticator; a code that does not match answers 400, so two-factor stays off for later rows (a right code: two-factor.test.ts).',
    send: client => client.post('/api/me/two-factor/confirm', { code: '000000' }),
  },
  {
    route: 'POST /api/me/two-factor/disable',
    expected: anyAccount(200),
    why: 'Each account turns its own off with its password (off already: nothing changes).',
    send: client => client.post('/api/me/two-factor/disable', { password: PASSWORD }),
  },
  {
    route: 'POST /api/me/two-factor/recovery-codes',
    expected: anyAccount(409),
    why: 'Any account may replace its own codes; with two-factor off there are none, 409 (with it on: two-factor.test.ts).',
    send: client => client.post('/api/me/two-factor/recovery-codes', { code: '000000' }),
  },
  {
    route: 'GET /api/me',
    expected: anyAccount(200),
    why: 'About the caller, not the newsroom: a member elsewhere sees their own account.',
    send: client => client.get('/api/me'),
  },
  {
    route: 'PATCH /api/me/preferences',
    expected: anyAccount(200),
    why: 'Each account sets its own e-mail preference; the value sent is the default, so nothing changes for later tests.',
    send: client => client.patch('/api/me/preferences', { notifyByEmail: true }),
  },
  {
    route: 'GET /api/me/notifications',
    expected: anyAccount(200),
    why: 'Each account reads its own notifications (only of newsrooms it belongs to: conversation.test.ts).',
    send: client => client.get('/api/me/notifications'),
  },
  {
    route: 'POST /api/me/notifications/read',
    expected: anyAccount(200),
    why: 'Each account marks its own notifications read; ids of anyone else\'s change nothing (conversation.test.ts).',
    send: client => client.post('/api/me/notifications/read', { all: true }),
  },

  // Open routes
  {
    route: 'ANY /api/[...]',
    expected: { ...everyone(404), anonymous: 401, visitor: 401 },
    why: 'The catch-all (its own case: no method, no resource): an /api address without a route of its own is not there for any member (404). Without a session every /api address but the open ones answers 401 before anything is looked up (issue 22: existence never leaks), a missing route included.',
    send: client => client.post('/api/no-such-address', {}),
  },
  {
    route: 'GET /api/health',
    expected: everyone(200),
    why: 'Load balancers and the start script ask without a session.',
    send: client => client.get('/api/health'),
  },
  {
    route: 'GET /api/dev/mail',
    expected: everyone(200),
    why: 'The local mail sink\'s inbox: it answers only where the sink runs (tests; `npm start` without SMTP, on 127.0.0.1) and 404 in production, where NUXT_MAIL_SINK_ENABLED is false.',
    send: client => client.get('/api/dev/mail'),
  },
  {
    route: 'GET /api/public/[token]',
    expected: everyone(200),
    why: 'docs/product-rules.md: a public reader opens a published investigation through its link, without an account. The link is the key, so a session (of this newsroom or another) neither helps nor hinders.',
    send: (client, _t, desk) => client.get(`/api/public/${desk.publicToken}`),
  },
  {
    route: 'GET /api/join/[token]',
    expected: everyone(200),
    why: 'The invitation link is the key: the invited person has no account yet.',
    send: (client, _t, desk) => client.get(`/api/join/${desk.invitationToken}`),
  },
  {
    route: 'POST /api/join/[token]',
    expected: everyone(201),
    why: 'Whoever holds a single-use invitation link joins as the invited address (a new account chooses its password); the link, not a session, decides.',
    fresh: true,
    target: freshInvitation,
    ownSession: true,
    send: (client, invitation) => client.post(`/api/join/${invitation.token}`, { name: 'Matrix joiner', password: PASSWORD }),
  },

  // The newsroom and its members
  {
    route: 'GET /api/newsrooms/[id]',
    expected: allowOnly(MEMBERS, 200),
    send: (client, _t, desk) => client.get(`/api/newsrooms/${desk.newsroom.id}`),
  },
  {
    route: 'PATCH /api/newsrooms/[id]',
    expected: allowOnly(ADMINS, 200),
    why: 'The newsroom\'s settings (four eyes, two-factor sign-in for every member) are the admin\'s, like its members; sending the current values changes nothing for the other rows.',
    send: (client, _t, desk) => client.patch(`/api/newsrooms/${desk.newsroom.id}`, { fourEyes: true, requireTwoFactor: false }),
  },
  {
    route: 'GET /api/newsrooms/[id]/members',
    expected: allowOnly(MEMBERS, 200),
    why: 'Every member sees who is on the desk: their names stand on reviews, locks and the audit trail.',
    send: (client, _t, desk) => client.get(`/api/newsrooms/${desk.newsroom.id}/members`),
  },
  {
    route: 'GET /api/newsrooms/[id]/queue',
    expected: allowOnly(MEMBERS, 200),
    why: 'Each member reads what waits for them; the lists follow the role (empty where the role has nothing to do).',
    send: (client, _t, desk) => client.get(`/api/newsrooms/${desk.newsroom.id}/queue`),
  },
  {
    route: 'GET /api/newsrooms/[id]/invitations',
    expected: allowOnly(ADMINS, 200),
    why: 'Pending invitations are part of inviting members, which is the admin\'s.',
    send: (client, _t, desk) => client.get(`/api/newsrooms/${desk.newsroom.id}/invitations`),
  },
  {
    route: 'POST /api/newsrooms/[id]/invitations',
    expected: allowOnly(ADMINS, 201),
    send: (client, _t, desk) => client.post(`/api/newsrooms/${desk.newsroom.id}/invitations`, { email: `matrix-invite-${randomUUID().slice(0, 8)}@test.example`, role: 'reporter' }),
  },
  {
    route: 'DELETE /api/newsrooms/[id]/invitations/[invitationId]',
    expected: allowOnly(ADMINS, 200),
    why: 'Withdrawing an invitation is part of inviting members.',
    fresh: true,
    target: freshInvitation,
    send: (client, invitation, desk) => client.delete(`/api/newsrooms/${desk.newsroom.id}/invitations/${invitation.id}`),
  },
  {
    route: 'PATCH /api/memberships/[id]',
    expected: allowOnly(ADMINS, 200),
    fresh: true,
    target: freshMember,
    send: (client, member) => client.patch(`/api/memberships/${member.membershipId}`, { role: 'fact-checker' }),
  },
  {
    route: 'DELETE /api/memberships/[id]',
    expected: allowOnly(ADMINS, 200),
    fresh: true,
    target: freshMember,
    send: (client, member) => client.delete(`/api/memberships/${member.membershipId}`),
  },

  // Datasets
  {
    route: 'GET /api/datasets',
    expected: allowOnly(MEMBERS, 200),
    send: (client, _t, desk) => client.get(`/api/datasets?newsroomId=${desk.newsroom.id}`),
  },
  {
    route: 'POST /api/datasets',
    expected: allowOnly(CREATORS, 201),
    send: (client, _t, desk) => uploadProbe(client, desk),
  },
  {
    route: 'GET /api/datasets/[id]',
    expected: allowOnly(MEMBERS, 200),
    send: (client, _t, desk) => client.get(`/api/datasets/${desk.datasetId}`),
  },
  {
    route: 'GET /api/datasets/[id]/preview',
    expected: allowOnly(MEMBERS, 200),
    send: (client, _t, desk) => client.get(`/api/datasets/${desk.datasetId}/preview`),
  },
  {
    route: 'POST /api/datasets/[id]/digit-tests',
    expected: allowOnly(MEMBERS, 200),
    why: 'A digit test on a dataset changes nothing; a fact-checker checking a claim runs it again.',
    send: (client, _t, desk) => client.post(`/api/datasets/${desk.datasetId}/digit-tests`, { column: 'amount', test: 'first-digit' }),
  },
  {
    route: 'GET /api/datasets/[id]/rows',
    expected: allowOnly(MEMBERS, 200),
    send: (client, _t, desk) => client.get(`/api/datasets/${desk.datasetId}/rows?column=amount&key=1`),
  },
  {
    route: 'POST /api/datasets/[id]/sheets',
    expected: allowOnly(CREATORS, 201),
    why: 'Reading another sheet of a stored workbook makes a new dataset, as an upload does.',
    target: freshWorkbook,
    send: (client, workbook) => client.post(`/api/datasets/${workbook.id}/sheets`, { sheet: '2024' }),
  },
  {
    route: 'POST /api/datasets/[id]/archive',
    expected: allowOnly(WRITERS, 200),
    why: 'docs/product-rules.md does not name it: a reporter puts away what they uploaded, a data editor anyone\'s (all a reporter does, newsroom-wide); a fact-checker only reads.',
    fresh: true,
    target: freshDataset,
    send: (client, dataset) => client.post(`/api/datasets/${dataset.id}/archive`),
  },
  {
    route: 'POST /api/datasets/[id]/restore',
    expected: allowOnly(WRITERS, 200),
    why: 'The reverse of archiving, by the same people.',
    fresh: true,
    target: freshDataset,
    send: (client, dataset) => client.post(`/api/datasets/${dataset.id}/restore`),
  },
  {
    route: 'GET /api/datasets/[id]/original',
    expected: allowOnly(MEMBERS, 200),
    why: 'Everyone who may read a dataset may check it against its source.',
    send: (client, _t, desk) => client.get(`/api/datasets/${desk.datasetId}/original`),
  },
  {
    route: 'DELETE /api/datasets/[id]',
    expected: allowOnly(WRITERS, 200),
    why: 'As archiving: the uploader or a data editor; a fact-checker only reads.',
    fresh: true,
    target: freshDataset,
    send: (client, dataset) => client.delete(`/api/datasets/${dataset.id}`),
  },

  // Investigations
  {
    route: 'GET /api/investigations',
    expected: allowOnly(MEMBERS, 200),
    send: (client, _t, desk) => client.get(`/api/investigations?newsroomId=${desk.newsroom.id}`),
  },
  {
    route: 'POST /api/investigations',
    expected: allowOnly(CREATORS, 201),
    send: (client, _t, desk) => client.post('/api/investigations', { newsroomId: desk.newsroom.id, title: 'Opened by the permission matrix' }),
  },
  {
    route: 'GET /api/investigations/[id]',
    expected: allowOnly(MEMBERS, 200),
    send: (client, _t, desk) => client.get(`/api/investigations/${desk.story.id}`),
  },
  {
    route: 'PATCH /api/investigations/[id]',
    expected: allowOnly(WRITERS, 200),
    fresh: true,
    target: freshInvestigation,
    send: (client, draft) => client.patch(`/api/investigations/${draft.id}`, { title: 'Renamed by the permission matrix', titleVersion: 1 }),
  },
  {
    route: 'GET /api/investigations/[id]/audit',
    expected: allowOnly(MEMBERS, 200),
    why: 'The trail belongs to the investigation, which every member reads.',
    send: (client, _t, desk) => client.get(`/api/investigations/${desk.story.id}/audit`),
  },
  {
    route: 'GET /api/investigations/[id]/threads',
    expected: allowOnly(MEMBERS, 200),
    why: 'Conversations belong to the investigation, which every member reads.',
    send: (client, _t, desk) => client.get(`/api/investigations/${desk.story.id}/threads`),
  },
  {
    route: 'POST /api/investigations/[id]/threads',
    expected: allowOnly(MEMBERS, 201),
    why: 'docs/product-rules.md ("Conversations and notifications"): every member who reads an investigation may write in its conversations.',
    send: (client, _t, desk) => client.post(`/api/investigations/${desk.story.id}/threads`, { subjectType: 'block', subjectId: desk.story.proseBlockId, parts: [{ type: 'text', text: 'The matrix asks about this paragraph.' }] }),
  },
  {
    route: 'POST /api/threads/[id]/messages',
    expected: allowOnly(MEMBERS, 201),
    why: 'A reply is a message: whoever may start a conversation may answer in it.',
    target: freshThread,
    send: (client, thread) => client.post(`/api/threads/${thread.id}/messages`, { parts: [{ type: 'text', text: 'The matrix replies.' }] }),
  },
  {
    route: 'POST /api/threads/[id]/resolve',
    expected: allowOnly(MEMBERS, 200),
    why: 'Anyone in the conversation may close it; the audit trail keeps who did (conversation.test.ts).',
    fresh: true,
    target: freshThread,
    send: (client, thread) => client.post(`/api/threads/${thread.id}/resolve`),
  },
  {
    route: 'POST /api/threads/[id]/reopen',
    expected: allowOnly(MEMBERS, 200),
    why: 'As resolving: anyone in the conversation may open it again.',
    fresh: true,
    target: desk => freshThread(desk, true),
    send: (client, thread) => client.post(`/api/threads/${thread.id}/reopen`),
  },
  {
    route: 'GET /api/investigations/[id]/audit.csv',
    expected: allowOnly(MEMBERS, 200),
    why: 'The trail as a file: whoever reads the trail may download it.',
    send: (client, _t, desk) => client.get(`/api/investigations/${desk.story.id}/audit.csv`),
  },
  {
    route: 'POST /api/investigations/[id]/blocks',
    expected: allowOnly(WRITERS, 201),
    send: (client, _t, desk) => client.post(`/api/investigations/${desk.story.id}/blocks`, { kind: 'prose' }),
  },
  {
    route: 'POST /api/investigations/[id]/order',
    expected: allowOnly(WRITERS, 200),
    fresh: true,
    target: freshInvestigation,
    send: (client, draft) => client.post(`/api/investigations/${draft.id}/order`, { layoutVersion: draft.layoutVersion, blockIds: draft.blockIds }),
  },
  {
    route: 'POST /api/investigations/[id]/claims',
    expected: allowOnly(WRITERS, 201),
    fresh: true,
    target: freshMarkedPassage,
    send: (client, passage, desk) => client.post(`/api/investigations/${desk.story.id}/claims`, { id: passage.claimId, blockId: passage.blockId, supportingBlockIds: [] }),
  },
  {
    route: 'POST /api/investigations/[id]/review-request',
    expected: allowOnly(WRITERS, 200),
    fresh: true,
    target: freshInvestigation,
    send: (client, draft) => client.post(`/api/investigations/${draft.id}/review-request`),
  },
  {
    route: 'GET /api/investigations/[id]/publishing',
    expected: allowOnly(MEMBERS, 200),
    why: 'What still blocks publication, who did each check and the links made so far: part of reading the investigation. Only members who may publish get the links\' addresses (publishing-integrity.test.ts).',
    send: (client, _t, desk) => client.get(`/api/investigations/${desk.story.id}/publishing`),
  },
  {
    route: 'POST /api/investigations/[id]/publish',
    expected: allowOnly(DESK_EDITORS, 201),
    fresh: true,
    target: freshInvestigation,
    send: (client, draft) => client.post(`/api/investigations/${draft.id}/publish`, {}),
  },
  {
    route: 'GET /api/publications/[id]/changes',
    expected: allowOnly(MEMBERS, 200),
    why: 'What changed since a publication sits beside it in the publishing panel, which every member reads.',
    target: async (desk) => {
      const panel = await desk.as.admin.get(`/api/investigations/${desk.story.id}/publishing`)
      return { id: panel.body.links[0].publicationId as string }
    },
    send: (client, publication) => client.get(`/api/publications/${publication.id}/changes`),
  },
  {
    route: 'POST /api/share-links/[id]/revoke',
    expected: allowOnly(DESK_EDITORS, 200),
    fresh: true,
    target: freshShareLink,
    send: (client, link) => client.post(`/api/share-links/${link.id}/revoke`),
  },

  // Blocks
  {
    route: 'PATCH /api/blocks/[id]',
    expected: allowOnly(WRITERS, 200),
    fresh: true,
    target: freshProseBlock,
    send: (client, block) => client.patch(`/api/blocks/${block.id}`, { version: block.version, content: proseDoc('Rewritten by the permission matrix.') }),
  },
  {
    route: 'DELETE /api/blocks/[id]',
    expected: allowOnly(WRITERS, 200),
    fresh: true,
    target: freshProseBlock,
    send: (client, block) => client.delete(`/api/blocks/${block.id}`),
  },
  {
    route: 'POST /api/blocks/[id]/restore',
    expected: allowOnly(WRITERS, 200),
    fresh: true,
    target: freshRemovedBlock,
    send: (client, block) => client.post(`/api/blocks/${block.id}/restore`),
  },
  {
    route: 'GET /api/blocks/[id]/versions',
    expected: allowOnly(MEMBERS, 200),
    why: 'A block\'s history is part of reading the investigation: every member reads everything in the newsroom.',
    send: (client, _t, desk) => client.get(`/api/blocks/${desk.story.proseBlockId}/versions`),
  },
  {
    route: 'GET /api/blocks/[id]/versions/[version]',
    expected: allowOnly(MEMBERS, 200),
    why: 'One kept version of a block, read like its history.',
    send: (client, _t, desk) => client.get(`/api/blocks/${desk.story.proseBlockId}/versions/1`),
  },
  {
    route: 'GET /api/blocks/[id]/diff',
    expected: allowOnly(MEMBERS, 200),
    why: 'The difference between two kept versions, read like the history.',
    send: (client, _t, desk) => client.get(`/api/blocks/${desk.story.proseBlockId}/diff?from=1&to=2`),
  },
  {
    route: 'POST /api/blocks/[id]/versions/[version]/restore',
    expected: allowOnly(WRITERS, 200),
    why: 'A restore is a save of the block (issue 20: who may restore is who may edit it).',
    fresh: true,
    target: freshEditedBlock,
    send: (client, block) => client.post(`/api/blocks/${block.id}/versions/1/restore`, { version: block.version }),
  },
  {
    route: 'GET /api/blocks/[id]/analysis',
    expected: allowOnly(MEMBERS, 200),
    send: (client, _t, desk) => client.get(`/api/blocks/${desk.story.analysisBlockId}/analysis`),
  },
  {
    route: 'POST /api/blocks/[id]/run',
    expected: allowOnly(MEMBERS, 200),
    why: 'Running computes the saved settings\' result and changes nothing in the document; a fact-checker needs the numbers behind a claim (the same test on the dataset is a read too).',
    send: (client, _t, desk) => client.post(`/api/blocks/${desk.story.analysisBlockId}/run`),
  },
  {
    route: 'POST /api/blocks/[id]/review',
    expected: allowOnly(DESK_EDITORS, 200),
    fresh: true,
    target: freshAnalysisBlock,
    send: (client, block) => client.post(`/api/blocks/${block.id}/review`, { decision: 'approved' }),
  },

  // Claims
  {
    route: 'PATCH /api/claims/[id]',
    expected: allowOnly(WRITERS, 200),
    why: 'Changing which blocks support a claim is part of marking it, the reporter\'s (and so the data editor\'s) job.',
    fresh: true,
    target: freshClaim,
    send: (client, claim, desk) => client.patch(`/api/claims/${claim.id}`, { supportingBlockIds: [desk.story.analysisBlockId] }),
  },
  {
    route: 'DELETE /api/claims/[id]',
    expected: allowOnly(WRITERS, 200),
    why: 'Unmarking an open claim undoes marking it, so it goes with marking; a disputed claim needs a data editor and a reason (claims-lifecycle.test.ts).',
    fresh: true,
    target: freshClaim,
    send: (client, claim) => client.delete(`/api/claims/${claim.id}`),
  },
  {
    route: 'POST /api/claims/[id]/verify',
    expected: allowOnly(CHECKERS, 200),
    fresh: true,
    target: freshClaim,
    send: (client, claim) => client.post(`/api/claims/${claim.id}/verify`, { quote: MATRIX_CLAIM }),
  },
  {
    route: 'POST /api/claims/[id]/dispute',
    expected: allowOnly(CHECKERS, 200),
    fresh: true,
    target: freshClaim,
    send: (client, claim) => client.post(`/api/claims/${claim.id}/dispute`, { note: 'The matrix finds no source for it.' }),
  },
  {
    route: 'POST /api/claims/[id]/unlock',
    expected: allowOnly(DESK_EDITORS, 200),
    fresh: true,
    target: freshVerifiedClaim,
    send: (client, claim) => client.post(`/api/claims/${claim.id}/unlock`, { reason: 'The matrix lifts this lock.' }),
  },
]

describe('permission matrix: every API route × every caller (docs/product-rules.md "Who does what")', () => {
  let desk: MatrixDesk
  const results: [string, Cell[]][] = []

  beforeAll(async () => {
    desk = await openMatrixDesk()
  })

  afterAll(() => {
    if (results.some(([, cells]) => cells.some(c => c.want !== c.got))) console.error(`\nPermission matrix\n${matrixTable(results)}`)
  })

  it('has exactly one row for each route file under server/api/', () => {
    const files = apiRoutes()
    const rows = ROWS.map(r => r.route)
    expect(files.filter(route => !rows.includes(route)), 'route files without a row in the matrix').toEqual([])
    expect(rows.filter(route => !files.includes(route)), 'rows naming no route file').toEqual([])
    expect(rows.filter((route, i) => rows.indexOf(route) !== i), 'routes with more than one row').toEqual([])
  })

  it.each(ROWS.map(row => [row.route, row] as const))('%s', async (route, row) => {
    const cells = await runRow(desk, row)
    results.push([route, cells])
    expectRow(route, cells)
  })
})
