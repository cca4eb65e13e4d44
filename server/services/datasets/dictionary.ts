import { LRUCache } from 'lru-cache'
import { QueryTypes } from 'sequelize'

/**
 * A coded column's dictionary (dataset_group_values): each text's code and, for dates, its day. It
 * is written once, in the transaction that makes a dataset ready, and never changes after (a new
 * reading of a file is a new dataset), so each server keeps the dictionaries it has read, the most
 * recently used up to a number of entries, instead of asking for the same codes on every question.
 * Only ready datasets' dictionaries are read (every caller runs on a ready dataset).
 */
export interface Dictionary {
  codeOf: Map<string, number>
  /** Text by code, the code as a string key (as SQL group keys arrive). */
  valueOf: Map<string, string>
  /** Each code's day (days since 1970-01-01), null for a text that reads as no date. */
  dayOf: Map<number, number | null>
}

const kept = new LRUCache<string, Dictionary>({ maxSize: 1_000_000, sizeCalculation: d => Math.max(1, d.dayOf.size) })

export async function dictionaryOf(datasetId: string, position: number): Promise<Dictionary> {
  const key = `${datasetId}:${position}`
  const hit = kept.get(key)
  if (hit) return hit
  const reader = await datasetReader(datasetId)
  const rows = await reader.query<{ code: number, value: string, day: number | null }>(
    'SELECT code, value, day FROM dataset_group_values WHERE dataset_id = :datasetId AND column_pos = :position',
    { replacements: { datasetId, position }, type: QueryTypes.SELECT },
  )
  const dictionary: Dictionary = { codeOf: new Map(), valueOf: new Map(), dayOf: new Map() }
  for (const { code, value, day } of rows) {
    dictionary.codeOf.set(value, code)
    dictionary.valueOf.set(String(code), value)
    dictionary.dayOf.set(code, day)
  }
  kept.set(key, dictionary)
  return dictionary
}
