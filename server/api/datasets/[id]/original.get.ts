import { idParamsSchema } from '#shared/schemas/auth'
import { findDataset, originalBytes } from '#server/services/datasets/catalog'

// The bytes as uploaded, checked against their SHA-256 first; saved under the original file name.
export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const dataset = await findDataset(id)
  await requirePermission(event, 'dataset.read', { newsroomId: dataset.newsroomId })
  const bytes = await originalBytes(dataset)
  setResponseHeaders(event, {
    'content-type': 'application/octet-stream',
    'content-length': dataset.byteSize,
    'content-disposition': `attachment; filename*=UTF-8''${encodeURIComponent(dataset.originalName)}`,
    'x-content-sha256': dataset.sha256,
  })
  return sendStream(event, bytes)
})
