import { expect } from 'vitest'
import { Client } from './api'
import type { Reply } from './api'
import { createTestNewsroom, inviteMember } from './newsroom'
import type { TestNewsroom } from './newsroom'
import { expectStatus, readStory, uploadPayments, writeStory } from './stories'
import type { Story } from './stories'

/** Everyone who may knock on a route: the four roles, the story's own reporter, a second reporter, an outsider, nobody. */
export const EVERYONE = ['admin', 'data-editor', 'fact-checker', 'owner', 'other-reporter', 'outsider', 'anonymous'] as const
export type Who = typeof EVERYONE[number]

/** A newsroom with a client for each `Who`; stories are written by `owner` (the newsroom's reporter). */
export interface Desk {
  newsroom: TestNewsroom
  datasetId: string
  as: Record<Who, Client>
  /** Each caller's sign-in address (anonymous has none), for routes that end sessions and sign in again. */
  emails: Record<Who, string | null>
}

export async function openDesk(): Promise<Desk> {
  const newsroom = await createTestNewsroom('Role table')
  const outside = await createTestNewsroom('Elsewhere')
  const otherEmail = `second-reporter-${newsroom.id.slice(0, 8)}@test.example`
  const otherReporter = await inviteMember(newsroom.admin, newsroom.id, otherEmail, 'reporter', 'Second reporter')
  return {
    newsroom,
    datasetId: await uploadPayments(newsroom.reporter, newsroom.id),
    as: {
      'admin': newsroom.admin,
      'data-editor': newsroom['data-editor'],
      'fact-checker': newsroom['fact-checker'],
      'owner': newsroom.reporter,
      'other-reporter': otherReporter,
      // An admin elsewhere: the strongest role, still a stranger here.
      'outsider': outside.admin,
      'anonymous': new Client(),
    },
    emails: {
      'admin': newsroom.emails.admin,
      'data-editor': newsroom.emails['data-editor'],
      'fact-checker': newsroom.emails['fact-checker'],
      'owner': newsroom.emails.reporter,
      'other-reporter': otherEmail,
      'outsider': outside.emails.admin,
      'anonymous': null,
    },
  }
}

/** One row of a role table: an action, who may do it, and how to set the stage for it. */
export interface RoleCase {
  action: string
  allowed: readonly Who[]
  /** The status an allowed caller gets. */
  success: number
  /** Brings a fresh story to the state the action needs (posted claim, verified claim …). */
  prepare?: (desk: Desk, story: Story) => Promise<void>
  act: (client: Client, story: Story, desk: Desk) => Promise<Reply>
  /** What an allowed call must have done. */
  effect: (reply: Reply, story: Story, desk: Desk) => void | Promise<void>
}

/**
 * How a refused caller is answered (docs/product-rules.md, rules the server enforces): another newsroom's
 * things answer 404 as if missing, no session 401, a member whose role does not allow it 403.
 * A public-link visitor holds no session, so is answered as anonymous.
 */
export function refusalFor(who: Who | 'visitor'): 401 | 403 | 404 {
  if (who === 'outsider') return 404
  if (who === 'anonymous' || who === 'visitor') return 401
  return 403
}

/** docs/product-rules.md "Who does what": allowed roles succeed, everyone else gets their refusal. */
export function expectedStatus(who: Who, row: RoleCase): number {
  return row.allowed.includes(who) ? row.success : refusalFor(who)
}

/** `[label, row, who]` for every row and every caller, for `it.each`. */
export function roleCells(rows: RoleCase[]): [string, RoleCase, Who][] {
  return rows.flatMap(row => EVERYONE.map(who => [`${row.action} as ${who}`, row, who] as [string, RoleCase, Who]))
}

/**
 * Runs one cell on a fresh story: the caller gets the expected status; an allowed call has its
 * effect, a refused one leaves the investigation exactly as its reporter saw it before.
 */
export async function checkCell(desk: Desk, row: RoleCase, who: Who) {
  const story = await writeStory(desk.as.owner, desk.newsroom.id, desk.datasetId)
  await row.prepare?.(desk, story)
  const before = await readStory(desk.as.owner, story)
  const reply = await row.act(desk.as[who], story, desk)
  expectStatus(reply, expectedStatus(who, row))
  if (row.allowed.includes(who)) await row.effect(reply, story, desk)
  else expect(await readStory(desk.as.owner, story)).toEqual(before)
}
