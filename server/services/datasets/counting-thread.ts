import { Worker } from 'node:worker_threads'
import threadScript from 'thread-script:./column-count-thread'
import { countRecords, countsOfTally } from './column-count'
import type { CountSpec, Tally } from './column-count'
import type { ColumnRecords } from './column-layout'
import type { FromCounter, ToCounter } from './column-count-messages'

type Counted = ReturnType<typeof countRecords>

/**
 * The counting thread seen from the main thread: counts over a column's records in memory run there
 * (a pass over a million records is some 20 ms, time every other request would otherwise wait), on the
 * second core. The records are shared, not copied: the thread is told once which records a key
 * stands for, and to forget them when the column leaves memory. The counts come back as flat arrays
 * whose memory is moved, not copied (Tally in column-count.ts), and are made into cells here. Should the thread fail, counts run
 * here again, with the same answers, and the next count starts a new thread.
 */
class CountingThread {
  private worker: Worker | null = null
  private readonly held = new Set<string>()
  private readonly waiting = new Map<number, { resolve: (tally: Tally | null) => void, reject: (error: Error) => void }>()
  private next = 0

  private start(): Worker {
    const worker = new Worker(threadScript, { eval: true })
    worker.on('message', (reply: FromCounter) => {
      const waiter = this.waiting.get(reply.id)
      this.waiting.delete(reply.id)
      if ('error' in reply) waiter?.reject(new Error(reply.error))
      else waiter?.resolve(reply.tally)
    })
    const stopped = (error: Error) => {
      if (this.worker !== worker) return
      this.worker = null
      this.held.clear()
      for (const waiter of this.waiting.values()) waiter.reject(error)
      this.waiting.clear()
    }
    worker.on('error', stopped)
    worker.on('exit', code => stopped(new Error(`The counting thread stopped (exit code ${code}).`)))
    // The thread keeps no server alive on its own.
    worker.unref()
    return worker
  }

  private post(message: ToCounter) {
    this.worker ??= this.start()
    this.worker.postMessage(message)
  }

  count(key: string, records: ColumnRecords, spec: CountSpec): Promise<Tally | null> {
    if (!this.held.has(key)) {
      this.post({ type: 'hold', key, records })
      this.held.add(key)
    }
    const id = this.next++
    this.post({ type: 'count', id, key, spec })
    return new Promise((resolve, reject) => this.waiting.set(id, { resolve, reject }))
  }

  forget(key: string) {
    if (!this.held.delete(key)) return
    this.worker?.postMessage({ type: 'forget', key } satisfies ToCounter)
  }
}

const thread = new CountingThread()

/** countRecords over a column's records, on the counting thread; here when the thread fails. */
export async function countElsewhere(key: string, records: ColumnRecords, spec: CountSpec): Promise<Counted> {
  try {
    const tally = await thread.count(key, records, spec)
    return tally && countsOfTally(tally, spec)
  }
  catch (error) {
    console.warn(`[column scan] counting thread: ${(error as Error).message}; counting on the main thread`)
    return countRecords(records, spec)
  }
}

/** The column left memory: the thread lets go of its records too. */
export function forgetElsewhere(key: string) {
  thread.forget(key)
}
