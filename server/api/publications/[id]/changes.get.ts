import { idParamsSchema } from '#shared/schemas/auth'
import { findPublication } from '#server/services/publishing/publish'
import { changesSincePublication } from '#server/services/history/published-changes'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const { publication, investigation } = await findPublication(id)
  await requirePermission(event, 'investigation.read', { newsroomId: investigation.newsroomId })
  return changesSincePublication(publication)
})
