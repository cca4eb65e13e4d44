import { loginSchema } from '#shared/schemas/auth'
import { openSession } from '#server/services/account/sessions'
import { signIn } from '#server/services/sign-in'

export default defineEventHandler(async (event) => {
  const { email, password, code } = await readInput(event, loginSchema)
  const { user, secondFactor } = await signIn(email, password, code, getRequestIP(event) ?? 'unknown')
  await openSession(event, user, secondFactor)
  return { user }
})
