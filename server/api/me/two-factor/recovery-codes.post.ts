import { codeSchema } from '#shared/schemas/auth'
import { regenerateRecoveryCodes } from '#server/services/account/two-factor'

export default defineEventHandler(async (event) => {
  const user = await requireSignedIn(event)
  const { code } = await readInput(event, codeSchema)
  return regenerateRecoveryCodes(user.id, code)
})
