import { passwordResetSchema, tokenParamsSchema } from '#shared/schemas/auth'
import { completePasswordReset } from '#server/services/account/passwords'

export default defineEventHandler(async (event) => {
  const { token } = readParams(event, tokenParamsSchema)
  const { password } = await readInput(event, passwordResetSchema)
  return completePasswordReset(token, password)
})
