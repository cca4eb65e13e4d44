import { passwordConfirmSchema } from '#shared/schemas/auth'
import { disableTwoFactor } from '../../../services/account/two-factor'
import { checkPassword } from '../../../services/sign-in'

export default defineEventHandler(async (event) => {
  const user = await requireSignedIn(event)
  const { password } = await readInput(event, passwordConfirmSchema)
  await checkPassword(user.email, password, getRequestIP(event) ?? 'unknown')
  await disableTwoFactor(user.id)
  return { ok: true }
})
