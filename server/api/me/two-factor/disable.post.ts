import { passwordConfirmSchema } from '#shared/schemas/auth'
import { disableTwoFactor } from '#server/services/account/two-factor'
import { confirmPassword } from '#server/services/sign-in'

export default defineEventHandler(async (event) => {
  const user = await requireSignedIn(event)
  const { password } = await readInput(event, passwordConfirmSchema)
  await confirmPassword(user.email, password, getRequestIP(event) ?? 'unknown', 'password', 'This is not your password.')
  await disableTwoFactor(user.id)
  return { ok: true }
})
