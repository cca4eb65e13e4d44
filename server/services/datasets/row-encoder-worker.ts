import { Worker } from 'node:worker_threads'
import threadScript from 'thread-script:./row-encoder-thread'
import type { EncodedImport } from './row-encoder'
import type { FromEncoder, ToEncoder } from './row-encoder-messages'
import type { ColumnReadings } from '#shared/types/dataset'
import type { RaggedRow } from './copy-encoder'
import { UnreadableFile } from './sniff'

/** Enough for the digit counts (up to 8,000 cells of 9 KB) and the group codes of a wide file. */
const THREAD_HEAP_MB = 768

export interface Encoded {
  rows: Buffer[]
  digits: Buffer[]
}

const buffers = (list: Uint8Array[]) => list.map(bytes => Buffer.from(bytes.buffer, bytes.byteOffset, bytes.length))

/**
 * One import's encoding thread (row-encoder-thread.ts), seen from the main thread: rows go in,
 * COPY bytes come back in the same order, so several batches can be on their way at once.
 */
export class RowEncoderWorker {
  private readonly worker: Worker
  private readonly waiting: { resolve: (message: FromEncoder) => void, reject: (error: Error) => void }[] = []
  private failure: Error | null = null

  /** `readings`: how the reporter told columns to be read (a re-read of a stored upload), by name. */
  constructor(datasetId: string, readings: ColumnReadings = {}) {
    this.worker = new Worker(threadScript, { eval: true, workerData: { datasetId, readings }, resourceLimits: { maxOldGenerationSizeMb: THREAD_HEAP_MB } })
    this.worker.on('message', (message: FromEncoder) => {
      if (message.type === 'failed') this.fail(message.status ? new UnreadableFile(message.message, message.status) : new Error(message.message))
      else this.waiting.shift()?.resolve(message)
    })
    this.worker.on('error', (error: Error) => this.fail(error))
    this.worker.on('exit', code => this.fail(new Error(`The import's encoding thread stopped (exit code ${code}).`)))
  }

  /** The first failure goes to the oldest waiting request and to every later one; those behind it are abandoned with the import. */
  private fail(error: Error) {
    if (this.failure) return
    this.failure = error
    this.waiting.shift()?.reject(error)
  }

  private send(message: ToEncoder): Promise<FromEncoder> {
    if (this.failure) return Promise.reject(this.failure)
    this.worker.postMessage(message)
    return new Promise((resolve, reject) => this.waiting.push({ resolve, reject }))
  }

  header(cells: string[]) {
    if (!this.failure) this.worker.postMessage({ type: 'header', cells } satisfies ToEncoder)
  }

  /** `count` rows, their cells one after another, the header's width to a row; `ragged`: rows of another width, by place in the batch. */
  async encode(cells: readonly string[], count: number, ragged: [number, RaggedRow][] = []): Promise<Encoded> {
    const reply = await this.send({ type: 'rows', packed: cells.join('\0'), count, ragged })
    if (reply.type !== 'bytes') throw new Error(`The encoding thread answered rows with "${reply.type}".`)
    return { rows: buffers(reply.rows), digits: buffers(reply.digits) }
  }

  async finish(): Promise<Encoded & { encoded: EncodedImport }> {
    const reply = await this.send({ type: 'finish' })
    if (reply.type !== 'done') throw new Error(`The encoding thread answered the end with "${reply.type}".`)
    return { rows: buffers(reply.rows), digits: buffers(reply.digits), encoded: reply.encoded }
  }

  async stop() {
    this.failure ??= new Error('The import was stopped.')
    await this.worker.terminate()
  }
}
