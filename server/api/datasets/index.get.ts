import { z } from 'zod'
import { listDatasets } from '#server/services/datasets/catalog'

const querySchema = z.object({ newsroomId: z.string().uuid() })

export default defineEventHandler(async (event) => {
  const { newsroomId } = readQuery(event, querySchema)
  await requirePermission(event, 'dataset.read', { newsroomId })
  return listDatasets(newsroomId)
})
