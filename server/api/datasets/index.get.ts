import { z } from 'zod'
import { listDatasets } from '#server/services/datasets/catalog'

const querySchema = z.object({ newsroomId: z.string().uuid(), q: z.string().trim().max(200).optional() })

export default defineEventHandler(async (event) => {
  const { newsroomId, q } = readQuery(event, querySchema)
  await requirePermission(event, 'dataset.read', { newsroomId })
  return listDatasets(newsroomId, q || undefined)
})
