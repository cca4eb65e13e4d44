import { idParamsSchema } from '#shared/schemas/auth'
import { publishSchema } from '#shared/schemas/investigation'
import { findInvestigation } from '#server/services/investigations/catalog'
import { publish } from '#server/services/publishing/publish'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const options = await readInput(event, publishSchema)
  const investigation = await findInvestigation(id)
  const actor = await requirePermission(event, 'investigation.publish', { newsroomId: investigation.newsroomId })
  setResponseStatus(event, 201)
  return publish(actor, investigation, options)
})
