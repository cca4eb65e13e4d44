import { idParamsSchema } from '#shared/schemas/auth'
import { describeInvestigation, findInvestigation } from '#server/services/investigations/catalog'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const investigation = await findInvestigation(id)
  await requirePermission(event, 'investigation.read', { newsroomId: investigation.newsroomId })
  return describeInvestigation(investigation)
})
