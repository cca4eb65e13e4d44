import { idParamsSchema } from '#shared/schemas/auth'
import { archiveDataset, findDataset } from '#server/services/datasets/catalog'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const dataset = await findDataset(id)
  const actor = await requirePermission(event, 'dataset.archive', { newsroomId: dataset.newsroomId, ownerId: dataset.createdBy })
  await archiveDataset(actor, dataset)
  return { ok: true }
})
