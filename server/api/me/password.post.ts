import { passwordChangeSchema } from '#shared/schemas/auth'
import { changePassword } from '#server/services/account/passwords'

export default defineEventHandler(async (event) => {
  const signedIn = await requireSession(event)
  const { currentPassword, newPassword } = await readInput(event, passwordChangeSchema)
  return changePassword(signedIn, currentPassword, newPassword, getRequestIP(event) ?? 'unknown')
})
