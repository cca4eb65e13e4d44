import { randomUUID } from 'node:crypto'
import type { Role } from '#shared/auth/roles'
import { createNewsroomWithAdminInvitation } from '../../server/cli/newsroom'
import { Client, signedIn } from './api'
import { linkIn, waitForMail } from './mail'

export const PASSWORD = 'a-long-test-password'

export interface TestNewsroom {
  'id': string
  'admin': Client
  'data-editor': Client
  'fact-checker': Client
  'reporter': Client
  'emails': Record<Role, string>
  /** Display names, as the API shows them in stamps, trails and 423 messages. */
  'names': Record<Role, string>
}

/** Accepts an invitation link's token through the API, as the invited person would. */
export async function join(token: string, name: string): Promise<Client> {
  const client = new Client()
  const reply = await client.post(`/api/join/${token}`, { name, password: PASSWORD })
  if (reply.status !== 201) throw new Error(`join answered ${reply.status}: ${JSON.stringify(reply.body)}`)
  return client
}

/**
 * A fresh newsroom with one member per role, built through the real paths: the setup
 * command's admin invitation, then e-mailed invitations read back from the mail sink.
 */
export async function createTestNewsroom(label = 'Test desk'): Promise<TestNewsroom> {
  const tag = randomUUID().slice(0, 8)
  const emails = {
    'admin': `admin-${tag}@test.example`,
    'data-editor': `editor-${tag}@test.example`,
    'fact-checker': `checker-${tag}@test.example`,
    'reporter': `reporter-${tag}@test.example`,
  } satisfies Record<Role, string>
  const { newsroomId, token } = await createNewsroomWithAdminInvitation(process.env.NUXT_DATABASE_URL!, `${label} ${tag}`, emails.admin)
  const names = {
    'admin': `Admin ${tag}`,
    'data-editor': `data-editor ${tag}`,
    'fact-checker': `fact-checker ${tag}`,
    'reporter': `reporter ${tag}`,
  } satisfies Record<Role, string>
  const admin = await join(token, names.admin)
  const newsroom = { id: newsroomId, admin, emails, names } as TestNewsroom
  for (const role of ['data-editor', 'fact-checker', 'reporter'] as const) {
    newsroom[role] = await inviteMember(admin, newsroomId, emails[role], role, names[role])
  }
  return newsroom
}

/** Invites `email` with `role` as the newsroom's admin: the invitation's id and the token its e-mailed link carries. */
export async function invite(admin: Client, newsroomId: string, email: string, role: Role): Promise<{ id: string, token: string }> {
  const invited = await admin.post(`/api/newsrooms/${newsroomId}/invitations`, { email, role })
  if (invited.status !== 201) throw new Error(`invitation answered ${invited.status}`)
  const mail = await waitForMail(email, 'invites you')
  return { id: invited.body.id, token: linkIn(mail.text, '/join/').split('/join/')[1]! }
}

/** Invites `email` with `role` as the newsroom's admin and joins through the e-mailed link. */
export async function inviteMember(admin: Client, newsroomId: string, email: string, role: Role, name: string): Promise<Client> {
  return join((await invite(admin, newsroomId, email, role)).token, name)
}

export { signedIn }
