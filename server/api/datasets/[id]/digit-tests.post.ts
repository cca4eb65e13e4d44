import { idParamsSchema } from '#shared/schemas/auth'
import { digitTestRequestSchema } from '#shared/schemas/dataset'
import { findPermittedDataset } from '#server/services/datasets/catalog'
import { runDatasetTest } from '#server/services/datasets/digit-tests'

export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const body = await readInput(event, digitTestRequestSchema)
  const { dataset } = await findPermittedDataset(id, newsroomId => requirePermission(event, 'dataset.read', { newsroomId }))
  return runDatasetTest(dataset, body, from => setResponseHeader(event, 'x-mantissa-counted-from', from))
})
