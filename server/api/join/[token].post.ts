import { invitationAcceptSchema, tokenParamsSchema } from '#shared/schemas/auth'
import { openSession } from '#server/services/account/sessions'
import { acceptInvitation } from '#server/services/invitations'

export default defineEventHandler(async (event) => {
  const { token } = readParams(event, tokenParamsSchema)
  const { name, password } = await readInput(event, invitationAcceptSchema)
  const { user, mayOpenSession } = await acceptInvitation(token, name, password, getRequestIP(event) ?? 'unknown')
  if (mayOpenSession) await openSession(event, user, false)
  setResponseStatus(event, 201)
  return { user, signedIn: mayOpenSession }
})
