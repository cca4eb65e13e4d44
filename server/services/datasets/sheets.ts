import { oneLine } from '#shared/schemas/text'
import type { Dataset } from '../../models/Dataset'
import type { Actor } from '../../utils/permissions'
import { startImport } from './upload'
import { UnreadableFile } from './sniff'

/**
 * Reads another sheet of an imported workbook into a dataset of its own, from the bytes already
 * stored (same fingerprint, same source): the workbook need not be uploaded again.
 */
export async function importSheet(actor: Actor, workbook: Dataset, sheet: string, title?: string): Promise<{ id: string, status: string, queued: boolean }> {
  if (workbook.format !== 'xlsx' || !workbook.sheets) throw fail(400, [{ path: 'sheet', message: 'Only an imported workbook has sheets to choose from.' }])
  if (!workbook.sheets.includes(sheet)) {
    throw fail(400, [{ path: 'sheet', message: `This workbook has no sheet named "${sheet}". Its sheets: ${workbook.sheets.map(name => `"${name}"`).join(', ')}.` }])
  }
  const dataset = await useDb().models.Dataset.create({
    newsroomId: workbook.newsroomId, title: title ?? oneLine(`${workbook.title} (${sheet})`), sourceNote: workbook.sourceNote,
    sourceUrl: workbook.sourceUrl, obtainedOn: workbook.obtainedOn, originalName: workbook.originalName, format: 'xlsx',
    sheet, sha256: workbook.sha256, byteSize: workbook.byteSize, storageKey: workbook.storageKey, replacesId: null, createdBy: actor.userId,
  })
  try {
    return await startImport(dataset.id, workbook.byteSize)
  }
  catch (error) {
    if (error instanceof UnreadableFile) throw fail(error.status, { message: error.message })
    throw error
  }
}
