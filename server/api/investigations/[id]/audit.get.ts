import { idParamsSchema } from '#shared/schemas/auth'
import { auditQuerySchema } from '#shared/schemas/investigation'
import { findInvestigation } from '#server/services/investigations/catalog'
import { auditTrail } from '#server/services/investigations/audit-trail'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const query = readQuery(event, auditQuerySchema)
  const investigation = await findInvestigation(id)
  await requirePermission(event, 'audit.read', { newsroomId: investigation.newsroomId })
  return auditTrail(investigation, query)
})
