import { tokenParamsSchema } from '#shared/schemas/auth'
import { peekPasswordReset } from '#server/services/account/passwords'

export default defineEventHandler(async (event) => {
  const { token } = readParams(event, tokenParamsSchema)
  return peekPasswordReset(token)
})
