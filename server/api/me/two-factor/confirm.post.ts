import { codeSchema } from '#shared/schemas/auth'
import { confirmTwoFactor } from '#server/services/account/two-factor'

export default defineEventHandler(async (event) => {
  const signedIn = await requireSession(event)
  const { code } = await readInput(event, codeSchema)
  return confirmTwoFactor(signedIn, code)
})
