import { passwordResetRequestSchema } from '#shared/schemas/auth'
import { requestPasswordReset } from '#server/services/account/passwords'

export default defineEventHandler(async (event) => {
  const { email } = await readInput(event, passwordResetRequestSchema)
  setResponseStatus(event, 202)
  return requestPasswordReset(email, getRequestIP(event) ?? 'unknown')
})
