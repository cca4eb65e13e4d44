import { loginSchema } from '#shared/schemas/auth'
import { openSession } from '../../services/account/sessions'
import { signIn } from '../../services/sign-in'

export default defineEventHandler(async (event) => {
  const { email, password, code } = await readInput(event, loginSchema)
  const { user, secondFactor } = await signIn(email, password, code, getRequestIP(event) ?? 'unknown')
  await openSession(event, user, secondFactor)
  return { user }
})
