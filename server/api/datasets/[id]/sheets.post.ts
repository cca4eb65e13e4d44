import { idParamsSchema } from '#shared/schemas/auth'
import { sheetImportSchema } from '#shared/schemas/dataset'
import { findDataset } from '#server/services/datasets/catalog'
import { importSheet } from '#server/services/datasets/sheets'

// { sheet, title? }: another sheet of this workbook as a new dataset → 201 or 202 { id, status }.
export default defineEventHandler(async (event) => {
  const { id } = readParams(event, idParamsSchema)
  const body = await readInput(event, sheetImportSchema)
  const workbook = await findDataset(id)
  const actor = await requirePermission(event, 'dataset.create', { newsroomId: workbook.newsroomId })
  const result = await importSheet(actor, workbook, body.sheet, body.title)
  setResponseStatus(event, result.queued ? 202 : 201)
  return { id: result.id, status: result.status }
})
