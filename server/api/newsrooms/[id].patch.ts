import { idParamsSchema, newsroomSettingsSchema } from '#shared/schemas/auth'
import { updateNewsroomSettings } from '#server/services/members'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const settings = await readInput(event, newsroomSettingsSchema)
  const actor = await requirePermission(event, 'newsroom.configure', { newsroomId: id })
  return updateNewsroomSettings(actor, settings)
})
