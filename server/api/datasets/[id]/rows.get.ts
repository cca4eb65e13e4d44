import { idParamsSchema } from '#shared/schemas/auth'
import { drillDownQuerySchema } from '#shared/schemas/dataset'
import { findPermittedDataset } from '#server/services/datasets/catalog'
import { binRows } from '#server/services/datasets/rows'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const query = readQuery(event, drillDownQuerySchema)
  const { dataset } = await findPermittedDataset(id, newsroomId => requirePermission(event, 'dataset.read', { newsroomId }))
  return binRows(dataset, query)
})
