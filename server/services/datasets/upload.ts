import busboy from 'busboy'
import type { H3Event } from 'h3'
import { datasetUploadSchema } from '#shared/schemas/dataset'
import type { Actor } from '../../utils/permissions'
import { importDataset } from './import'
import { importSlot } from './import-slots'
import { queueImport } from '../../utils/jobs'
import { inflatedHead, inflatedOpener, tableInZip } from './compressed'
import { UnreadableFile, checkCompressed, checkContent, formatFromName } from './sniff'
import type { StoredFile } from '../../utils/file-drivers/store'
import { TooLarge } from '../../utils/file-drivers/store'

/** Files up to this size are imported while the upload waits, so errors come back as 4xx at once. */
export const INLINE_BYTES = 8 * 1024 * 1024
/** How long a small upload waits for an import slot before it is queued instead (answered 202). */
const SLOT_WAIT_MS = 10_000

interface Received {
  fields: Record<string, string>
  file: (StoredFile & { originalName: string }) | null
}

function tooLarge(limit: number) {
  return fail(413, { message: `The file is larger than the limit of ${Math.round(limit / 1024 / 1024)} MB. Split it, or ask an admin to raise the limit.` })
}

/** Streams a multipart upload to file storage; the file is never held in memory. */
function receive(event: H3Event, limit: number): Promise<Received> {
  const fileStore = useFileStore()
  return new Promise((resolve, reject) => {
    let parser: busboy.Busboy
    try {
      parser = busboy({ headers: event.node.req.headers, limits: { files: 1, fields: 20, fieldSize: 10_000, fileSize: limit + 1 } })
    }
    catch {
      reject(fail(400, [{ path: 'file', message: 'Send the file as multipart/form-data with a "file" field.' }]))
      return
    }
    const request = event.node.req
    const fields: Record<string, string> = {}
    let saving: Promise<Received['file']> = Promise.resolve(null)
    const settle = () => saving.then(file => resolve({ fields, file }), (error) => {
      reject(error instanceof TooLarge ? tooLarge(limit) : error)
    })
    parser.on('field', (name, value) => {
      fields[name] = value
    })
    parser.on('file', (name, stream, info) => {
      if (name !== 'file') {
        stream.resume()
        return
      }
      const originalName = (info.filename || 'upload').split(/[\\/]/).pop()!.slice(0, 255)
      saving = fileStore.save(stream, limit).then(stored => ({ ...stored, originalName }))
      // A failed save has destroyed the file stream, and busboy would wait for it forever (its
      // 'close' never comes when the upload's last bytes arrive after the failure). Stop parsing,
      // read the rest of the request so the client can take the answer, then answer.
      saving.catch(() => {
        request.unpipe(parser)
        if (request.readableEnded) settle()
        else {
          request.once('end', settle)
          request.resume()
        }
      })
    })
    parser.on('error', () => reject(fail(400, [{ path: 'file', message: 'The upload was interrupted or malformed. Try again.' }])))
    parser.on('close', settle)
    request.pipe(parser)
  })
}

/**
 * The format of what was sent and the first bytes of its table: for a compressed file, of the
 * table inside it (the zip's one table, found through its directory).
 */
async function whatWasSent(file: StoredFile & { originalName: string }) {
  const named = formatFromName(file.originalName)
  if (!named.compression) return { format: named.format!, compression: null, archiveEntry: null, head: file.head }
  checkCompressed(named.compression, file.head)
  const open = (start: number, end?: number) => useFileStore().open(file.key, start, end)
  const inZip = named.compression === 'zip' ? await tableInZip(open, file.byteSize) : null
  const table = inflatedOpener(open, file.byteSize, named.compression, inZip?.entry ?? null, Number(useRuntimeConfig().uploadLimitBytes))
  return { format: inZip?.format ?? named.format!, compression: named.compression, archiveEntry: inZip?.entry ?? null, head: await inflatedHead(await table()) }
}

/** Removes an upload's stored bytes unless another dataset kept the same file. */
async function discard(key: string) {
  const { Dataset } = useDb().models
  if (await Dataset.count({ where: { storageKey: key } }) === 0) await useFileStore().remove(key)
}

/**
 * Imports a new dataset's stored file. A small file is imported while the request waits, so a bad
 * one is refused at once (the dataset is removed and the error thrown); a large one, or one that
 * finds this server's import slots taken for a while, goes to the queue.
 */
export async function startImport(datasetId: string, byteSize: number): Promise<{ id: string, status: string, queued: boolean }> {
  const slot = byteSize > INLINE_BYTES ? null : await importSlot(SLOT_WAIT_MS)
  if (!slot) {
    await queueImport(datasetId)
    return { id: datasetId, status: 'importing', queued: true }
  }
  try {
    await importDataset(datasetId)
  }
  catch (error) {
    await useDb().models.Dataset.destroy({ where: { id: datasetId } })
    throw error
  }
  finally {
    slot()
  }
  return { id: datasetId, status: 'ready', queued: false }
}

/**
 * Receives an upload and imports it: small files at once (201, or 4xx with the reason and
 * nothing kept), larger ones as a durable job (202, then the dataset's status tells).
 */
export async function uploadDataset(event: H3Event, actor: Actor): Promise<{ id: string, status: string, queued: boolean }> {
  const limit = Number(useRuntimeConfig().uploadLimitBytes)
  const declared = Number(getRequestHeader(event, 'content-length') ?? 0)
  if (declared > limit + 64 * 1024) throw tooLarge(limit)

  const { fields, file } = await receive(event, limit)
  if (!file) throw fail(400, [{ path: 'file', message: 'Choose a file to upload.' }])
  const { models } = useDb()
  try {
    const unstorable = unstorableText(fields)
    if (unstorable.length) throw fail(400, unstorable)
    const parsed = datasetUploadSchema.safeParse(fields)
    if (!parsed.success) throw fail(400, fieldErrors(parsed.error))
    if (file.byteSize === 0) throw fail(422, { message: 'The file is empty.' })
    const { format, compression, archiveEntry, head } = await whatWasSent(file)
    checkContent(format, head)
    if (parsed.data.replacesId) {
      const replaced = await models.Dataset.findOne({ where: { id: parsed.data.replacesId, newsroomId: actor.newsroomId } })
      if (!replaced) throw fail(400, [{ path: 'replacesId', message: 'The dataset this one replaces is not in your newsroom.' }])
    }
    const dataset = await models.Dataset.create({
      newsroomId: actor.newsroomId, title: parsed.data.title, sourceNote: parsed.data.sourceNote ?? null,
      sourceUrl: parsed.data.sourceUrl ?? null, obtainedOn: parsed.data.obtainedOn ?? null,
      originalName: file.originalName, format, compression, archiveEntry, sheet: parsed.data.sheet ?? null, sha256: file.sha256, byteSize: file.byteSize,
      storageKey: file.key, replacesId: parsed.data.replacesId ?? null, createdBy: actor.userId,
    })
    return await startImport(dataset.id, file.byteSize)
  }
  catch (error) {
    await discard(file.key)
    if (error instanceof UnreadableFile) throw fail(error.status, { message: error.message })
    throw error
  }
}
