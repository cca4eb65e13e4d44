import type { countRecords, CountSpec } from './column-count'
import type { ColumnRecords } from './column-layout'

/** What the main thread tells the counting thread (column-count-thread.ts); messages arrive in order. */
export type ToCounter
  = | { type: 'hold', key: string, records: ColumnRecords }
    | { type: 'forget', key: string }
    | { type: 'count', id: number, key: string, spec: CountSpec }

/** Its answer to one count. */
export type FromCounter = { id: number, counted: ReturnType<typeof countRecords> } | { id: number, error: string }
