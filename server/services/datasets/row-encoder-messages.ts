import type { RaggedRow } from './copy-encoder'
import type { EncodedImport } from './row-encoder'

/** From the import to its encoding thread. Rows travel as their cells joined by NUL, which no cell holds (readers.ts). */
export type ToEncoder
  = | { type: 'header', cells: string[] }
    | { type: 'rows', packed: string, count: number, ragged: [number, RaggedRow][] }
    | { type: 'finish' }

/** From the encoding thread: one 'bytes' per 'rows', one 'done' for 'finish', or 'failed' once. */
export type FromEncoder
  = | { type: 'bytes', rows: Uint8Array[], digits: Uint8Array[] }
    | { type: 'done', rows: Uint8Array[], digits: Uint8Array[], encoded: EncodedImport }
    | { type: 'failed', message: string, status: 415 | 422 | null }
