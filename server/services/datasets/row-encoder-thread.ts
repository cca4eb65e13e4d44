/**
 * Runs in a worker thread of its own (started by row-encoder-worker.ts, bundled by
 * server/build/thread-scripts.ts): turns the rows the main thread parses into COPY bytes while
 * the main thread reads on and sends the bytes to PostgreSQL. Two cores then share an import.
 */
import { parentPort, workerData } from 'node:worker_threads'
import { RowEncoder } from './row-encoder'
import { UnreadableFile } from './sniff'
import type { FromEncoder, ToEncoder } from './row-encoder-messages'
import type { ColumnReadings } from '#shared/types/dataset'

const port = parentPort!
const { datasetId, readings } = workerData as { datasetId: string, readings: ColumnReadings }
let encoder: RowEncoder | null = null
// After a failure the import stops; rows still on their way are not worth an error each.
let failed = false

/** Posts bytes without copying them: each buffer owns its memory (CopyEncoder.take). */
function post(message: FromEncoder, buffers: Uint8Array[]) {
  port.postMessage(message, [...new Set(buffers.map(b => b.buffer as ArrayBuffer))])
}

function handle(message: ToEncoder) {
  if (message.type === 'header') {
    encoder = new RowEncoder(datasetId, message.cells, readings)
    return
  }
  if (message.type === 'rows') {
    const width = encoder!.width
    const cells = width ? message.packed.split('\0') : []
    if (cells.length !== message.count * width) throw new Error(`${message.count} rows of ${width} cells arrived as ${cells.length} cells.`)
    encoder!.add(cells, message.count, message.ragged)
    const { rows: rowBytes, digits } = encoder!.take()
    post({ type: 'bytes', rows: rowBytes, digits }, [...rowBytes, ...digits])
    return
  }
  const { rows, digits, encoded } = encoder!.finish()
  post({ type: 'done', rows, digits, encoded }, [...rows, ...digits, ...encoded.cube, ...encoded.dictionary])
}

port.on('message', (message: ToEncoder) => {
  if (failed) return
  try {
    handle(message)
  }
  catch (error) {
    failed = true
    const unreadable = error instanceof UnreadableFile
    port.postMessage({ type: 'failed', message: (error as Error).message, status: unreadable ? error.status : null } satisfies FromEncoder)
  }
})
