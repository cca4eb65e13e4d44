import { preferencesSchema } from '#shared/schemas/investigation'
import { updatePreferences } from '#server/services/sign-in'

export default defineEventHandler(async (event) => {
  const user = await requireSignedIn(event)
  const preferences = await readInput(event, preferencesSchema)
  return updatePreferences(user.id, preferences)
})
