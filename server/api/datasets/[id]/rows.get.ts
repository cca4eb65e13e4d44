import { idParamsSchema } from '#shared/schemas/auth'
import { drillDownQuerySchema } from '#shared/schemas/dataset'
import { findDataset } from '#server/services/datasets/catalog'
import { binRows } from '#server/services/datasets/rows'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const query = readQuery(event, drillDownQuerySchema)
  const dataset = await findDataset(id)
  await requirePermission(event, 'dataset.read', { newsroomId: dataset.newsroomId })
  return binRows(dataset, query)
})
