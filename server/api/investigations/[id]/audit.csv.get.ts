import { idParamsSchema } from '#shared/schemas/auth'
import { auditDownloadSchema } from '#shared/schemas/history'
import { findInvestigation } from '#server/services/investigations/catalog'
import { auditCsv, auditFileName } from '#server/services/investigations/audit-download'

// The trail as CSV, with the same filters as the page (?actor=&kind=), every matching event.
export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const filters = readQuery(event, auditDownloadSchema)
  const investigation = await findInvestigation(id)
  await requirePermission(event, 'audit.read', { newsroomId: investigation.newsroomId })
  setResponseHeaders(event, {
    'content-type': 'text/csv; charset=utf-8',
    'content-disposition': `attachment; filename="${auditFileName(investigation)}"`,
  })
  return sendStream(event, auditCsv(investigation, filters))
})
