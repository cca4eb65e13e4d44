import type { DistributionTest, SignFilter } from '#shared/digits'
import { LRUCache } from 'lru-cache'
import type { PoolClient } from 'pg'
import { datasetColumns } from './catalog'
import type { DigitQuery } from './digit-query'
import { groupCells } from './count-merge'
import { readColumnRecords } from './column-records'
import type { CountSpec } from './column-count'
import { countElsewhere, forgetElsewhere } from './counting-thread'
import type { ColumnRecords } from './column-layout'

/**
 * Distribution tests whose filters and grouping no cell of the import holds (two text columns and a
 * range, say) are counted over the column's records held in memory (column-records.ts), in one pass
 * that counts what SQL's GROUP BY would (column-count.ts). The first question that needs a column
 * starts reading it and waits a few seconds for it; if the read takes longer, SQL answers until it is
 * in. Columns are kept up to a memory budget, least recently used first out.
 *
 * Mode (runtime config columnScan.mode): "on"; "off" (SQL only); "verify", for the tests: the column
 * is read at once and every answer from memory is checked against SQL's (digit-tests.ts).
 */
/** A column's records, or 'sql' for a column they cannot answer for (inexact values, larger than the budget). */
type Entry = ColumnRecords | 'sql'

let kept: LRUCache<string, Entry> | null = null
const loading = new Map<string, Promise<void>>()
/** Reads one at a time: a second core stays free for the questions themselves. */
let queue: Promise<void> = Promise.resolve()

export function columnScanMode(): 'on' | 'off' | 'verify' {
  const mode = useRuntimeConfig().columnScan?.mode
  return mode === 'off' || mode === 'verify' ? mode : 'on'
}

/** The columns kept, least recently used first out past the budget (a column larger than it is not kept). */
function keptColumns() {
  kept ??= new LRUCache<string, Entry>({
    maxSize: Number(useRuntimeConfig().columnScan?.budgetMb ?? 512) * 1024 * 1024,
    sizeCalculation: entry => (entry === 'sql' ? 1 : Math.max(1, entry.bytes)),
    dispose: (_entry, key) => forgetElsewhere(key),
  })
  return kept
}

async function read(datasetId: string, columnPos: number) {
  const [columns, dataset] = await Promise.all([datasetColumns(datasetId), useDb().models.Dataset.findByPk(datasetId, { attributes: ['rowCount'] })])
  const textPositions = columns.filter(c => c.coded).map(c => c.position)
  const reader = await datasetReader(datasetId)
  const manager = reader.connectionManager
  const client = await manager.getConnection({ type: 'read' }) as PoolClient
  let healthy = false
  try {
    const records = await readColumnRecords(client, datasetId, columnPos, textPositions, dataset?.rowCount ?? 0)
    healthy = true
    const fits = records && records.bytes <= keptColumns().maxSize
    keptColumns().set(`${datasetId}:${columnPos}`, fits ? records : 'sql')
  }
  finally {
    // A COPY cut off half-way leaves the connection mid-protocol: it is closed, not pooled.
    if (healthy) manager.releaseConnection(client)
    else await manager.destroyConnection(client).catch(() => {})
  }
}

/** The read of a column, started unless one is under way; reads queue one after another. */
function startReading(datasetId: string, columnPos: number): Promise<void> {
  const key = `${datasetId}:${columnPos}`
  let pending = loading.get(key)
  if (!pending) {
    pending = queue = queue.then(() => read(datasetId, columnPos)).catch((error) => {
      console.warn(`[column scan] ${key} not read: ${(error as Error).message}`)
    }).finally(() => loading.delete(key))
    loading.set(key, pending)
  }
  return pending
}

/**
 * Reads a new dataset's number columns into memory ahead of the first questions, one after another,
 * as long as they fill at most half the budget: the questions a reporter asks first of a new dataset
 * then need not wait for the read. Another app server reads a column on its first question instead.
 */
export async function readAhead(datasetId: string, rowCount: number) {
  if (columnScanMode() === 'off') return
  const columns = await datasetColumns(datasetId)
  // About a record's bytes in memory (column-records.ts), for the estimate.
  const perRecord = 32 + 4 * columns.filter(c => c.coded).length
  let room = keptColumns().maxSize / 2
  for (const column of columns.filter(c => c.numeric)) {
    room -= rowCount * perRecord
    if (room < 0) return
    if (!keptColumns().has(`${datasetId}:${column.position}`)) void startReading(datasetId, column.position)
  }
}

/** How long a question waits for its column to be read (a million rows take a second or two) before SQL counts it. */
const WAIT_FOR_READ_MS = 5000

/** The column's records in memory; starts reading them when absent, and waits a while for them ("verify": until read). */
async function recordsOf(datasetId: string, columnPos: number): Promise<ColumnRecords | null> {
  const key = `${datasetId}:${columnPos}`
  const entry = keptColumns().get(key)
  if (entry) return entry === 'sql' ? null : entry
  const pending = startReading(datasetId, columnPos)
  // A question waits a while for the column rather than scan it in SQL beside the read: fifty
  // people asking at once would otherwise start fifty scans, and the read would wait behind them.
  if (columnScanMode() === 'verify') await pending
  else await Promise.race([pending, new Promise(resolve => setTimeout(resolve, WAIT_FOR_READ_MS).unref())])
  const loaded = keptColumns().get(key)
  return loaded && loaded !== 'sql' ? loaded : null
}

/** The column's records when they are in memory, without waiting (a read starts when they are not; "verify": waits). */
export async function recordsInMemory(datasetId: string, columnPos: number): Promise<ColumnRecords | null> {
  if (columnScanMode() === 'off') return null
  const entry = keptColumns().get(`${datasetId}:${columnPos}`)
  if (entry) return entry === 'sql' ? null : entry
  if (columnScanMode() === 'verify') return recordsOf(datasetId, columnPos)
  void startReading(datasetId, columnPos)
  return null
}

/** countRecords over a column's records in memory, on the counting thread (counting-thread.ts). */
export function countInMemory(datasetId: string, columnPos: number, records: ColumnRecords, spec: CountSpec) {
  return countElsewhere(`${datasetId}:${columnPos}`, records, spec)
}

/**
 * A distribution test's counts by group, and the selection's suitability facts, from the column's
 * records in memory; null when the question has filters or a grouping they cannot answer (a range
 * on another column, a text column not coded) or the column is not in memory yet.
 */
export async function scanDistribution(test: DistributionTest, datasetId: string, columnPos: number, query: DigitQuery, sign: SignFilter) {
  if (columnScanMode() === 'off') return null
  const filters = query.codeFilters ?? query.testedRange?.codeFilters
  if (!filters || (query.group && !query.decoding)) return null
  const records = await recordsOf(datasetId, columnPos)
  if (!records) return null
  const counted = await countInMemory(datasetId, columnPos, records, {
    test, sign, filters, range: query.testedRange, groupBy: query.decoding?.position ?? null,
  })
  if (!counted) return null
  return { groups: await groupCells(datasetId, query.decoding, counted.cells), profile: counted.profile }
}
