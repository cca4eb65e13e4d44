import { idParamsSchema } from '#shared/schemas/auth'
import { rereadSchema } from '#shared/schemas/dataset'
import { findDataset } from '#server/services/datasets/catalog'
import { rereadDataset } from '#server/services/datasets/readings'

// { columns: { [name]: { kind?, decimalMark?, negatives?, currency?, dateOrder? } } }: the stored upload
// read again with these column readings, as a new version → 201 or 202 { id, status, readingNo }.
export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const body = await readInput(event, rereadSchema)
  const dataset = await findDataset(id)
  const actor = await requirePermission(event, 'dataset.create', { newsroomId: dataset.newsroomId })
  const result = await rereadDataset(actor, dataset, body.columns)
  setResponseStatus(event, result.queued ? 202 : 201)
  return { id: result.id, status: result.status, readingNo: result.readingNo }
})
