import { invitationAcceptSchema, tokenParamsSchema } from '#shared/schemas/auth'
import { acceptInvitation } from '#server/services/invitations'

export default defineEventHandler(async (event) => {
  const { token } = readParams(event, tokenParamsSchema)
  const { name, password } = await readInput(event, invitationAcceptSchema)
  const user = await acceptInvitation(token, name, password)
  await replaceUserSession(event, { user })
  setResponseStatus(event, 201)
  return { user }
})
