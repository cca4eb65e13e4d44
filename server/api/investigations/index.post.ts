import { investigationCreateSchema } from '#shared/schemas/investigation'
import { createInvestigation } from '#server/services/investigations/catalog'

export default defineEventHandler(async (event) => {
  const { newsroomId, title, firstAnalysis } = await readInput(event, investigationCreateSchema)
  const actor = await requirePermission(event, 'investigation.create', { newsroomId })
  setResponseStatus(event, 201)
  return createInvestigation(actor, title, firstAnalysis)
})
