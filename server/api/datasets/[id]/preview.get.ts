import { idParamsSchema } from '#shared/schemas/auth'
import { previewQuerySchema } from '#shared/schemas/dataset'
import { findDataset } from '#server/services/datasets/catalog'
import { previewRows } from '#server/services/datasets/rows'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const { page, sort, dir } = readQuery(event, previewQuerySchema)
  const dataset = await findDataset(id)
  await requirePermission(event, 'dataset.read', { newsroomId: dataset.newsroomId })
  return previewRows(dataset, page, sort, dir)
})
