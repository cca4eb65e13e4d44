import { idParamsSchema } from '#shared/schemas/auth'
import { raggedQuerySchema } from '#shared/schemas/dataset'
import { findDataset } from '#server/services/datasets/catalog'
import { listRaggedRows } from '#server/services/datasets/cells'

// ?page= → the rows with more or fewer cells than the header: { rowNo, cellCount, extra }.
export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const { page } = readQuery(event, raggedQuerySchema)
  const dataset = await findDataset(id)
  await requirePermission(event, 'dataset.read', { newsroomId: dataset.newsroomId })
  return listRaggedRows(dataset, page)
})
