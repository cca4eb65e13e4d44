import type { CountSpec, Tally } from './column-count'
import type { ColumnRecords } from './column-layout'

/** What the main thread tells the counting thread (column-count-thread.ts); messages arrive in order. */
export type ToCounter
  = | { type: 'hold', key: string, records: ColumnRecords }
    | { type: 'forget', key: string }
    | { type: 'count', id: number, key: string, spec: CountSpec }

/** Its answer to one count: the pass's flat counts, their buffers moved to the main thread (null: countRecords' null). */
export type FromCounter = { id: number, tally: Tally | null } | { id: number, error: string }
