import { idParamsSchema } from '#shared/schemas/auth'
import { describeDataset, findDataset } from '#server/services/datasets/catalog'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const dataset = await findDataset(id)
  await requirePermission(event, 'dataset.read', { newsroomId: dataset.newsroomId })
  return describeDataset(dataset)
})
