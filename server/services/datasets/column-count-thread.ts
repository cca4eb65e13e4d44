/**
 * Runs in a worker thread of its own (started by counting-thread.ts, bundled by
 * server/build/thread-scripts.ts): counts questions over the columns' records in memory, which it
 * reads in the shared memory the main thread filled (column-records.ts). The main thread meanwhile
 * answers everything else, so a long count holds up no other request.
 */
import { parentPort } from 'node:worker_threads'
import { tallyBuffers, tallyRecords } from './column-count'
import type { ColumnRecords } from './column-layout'
import type { FromCounter, ToCounter } from './column-count-messages'

const port = parentPort!
const held = new Map<string, ColumnRecords>()

port.on('message', (message: ToCounter) => {
  if (message.type === 'hold') held.set(message.key, message.records)
  else if (message.type === 'forget') held.delete(message.key)
  else {
    let reply: FromCounter
    try {
      const records = held.get(message.key)
      reply = records ? { id: message.id, tally: tallyRecords(records, message.spec) } : { id: message.id, error: `records ${message.key} not held` }
    }
    catch (error) {
      reply = { id: message.id, error: (error as Error).message }
    }
    port.postMessage(reply, 'tally' in reply && reply.tally ? tallyBuffers(reply.tally) : [])
  }
})
