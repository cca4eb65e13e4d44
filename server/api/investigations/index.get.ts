import { z } from 'zod'
import { listInvestigations } from '#server/services/investigations/catalog'

const querySchema = z.object({ newsroomId: z.string().uuid() })

export default defineEventHandler(async (event) => {
  const { newsroomId } = readQuery(event, querySchema)
  await requirePermission(event, 'investigation.read', { newsroomId })
  return listInvestigations(newsroomId)
})
