import { loginSchema } from '#shared/schemas/auth'
import { signIn } from '#server/services/sign-in'

export default defineEventHandler(async (event) => {
  const { email, password } = await readInput(event, loginSchema)
  const user = await signIn(email, password, getRequestIP(event) ?? 'unknown')
  await replaceUserSession(event, { user })
  return { user }
})
