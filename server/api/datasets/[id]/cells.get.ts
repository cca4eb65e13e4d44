import { idParamsSchema } from '#shared/schemas/auth'
import { cellListQuerySchema } from '#shared/schemas/dataset'
import { findPermittedDataset } from '#server/services/datasets/catalog'
import { cellsCsv, listCells } from '#server/services/datasets/cells'

// ?column=&status=blank|unreadable|zero|negative|outside[&test=][&sign=]&page= → a page of { rowNo, text };
// with format=csv, every such cell of the column as a download.
export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const query = readQuery(event, cellListQuerySchema)
  const { dataset } = await findPermittedDataset(id, newsroomId => requirePermission(event, 'dataset.read', { newsroomId }))
  if (query.format === 'json') return listCells(dataset, query)
  const { fileName, body } = await cellsCsv(dataset, query)
  setResponseHeaders(event, {
    'content-type': 'text/csv; charset=utf-8',
    'content-disposition': `attachment; filename*=UTF-8''${encodeURIComponent(fileName)}`,
  })
  return sendStream(event, body)
})
