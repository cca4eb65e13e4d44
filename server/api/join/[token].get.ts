import { tokenParamsSchema } from '#shared/schemas/auth'
import { peekInvitation } from '#server/services/invitations'

export default defineEventHandler(async (event) => {
  const { token } = readParams(event, tokenParamsSchema)
  return peekInvitation(token)
})
