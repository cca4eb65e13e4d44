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
  const admin = await join(token, `Admin ${tag}`)
  const newsroom = { id: newsroomId, admin, emails } as TestNewsroom
  for (const role of ['data-editor', 'fact-checker', 'reporter'] as const) {
    const invited = await admin.post(`/api/newsrooms/${newsroomId}/invitations`, { email: emails[role], role })
    if (invited.status !== 201) throw new Error(`invitation answered ${invited.status}`)
    const mail = await waitForMail(emails[role], 'invites you')
    newsroom[role] = await join(linkIn(mail.text, '/join/').split('/join/')[1]!, `${role} ${tag}`)
  }
  return newsroom
}

export { signedIn }
