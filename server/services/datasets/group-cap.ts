import type { DigitQuery } from './digit-query'
import { rawSelect } from './digit-query'
import { dictionaryOf } from './dictionary'

/**
 * The most groups a grouped test ranks. Each group is a test of its own, kept in memory and sent
 * to the page: a near-unique text column (a reference per row) would make a million of them.
 */
export const MAX_GROUPS = 10_000

/**
 * 400 on `groupBy` when the grouping would make more than MAX_GROUPS groups. A coded column's
 * dictionary gives its size at once; otherwise the distinct values are counted, stopping past the cap.
 */
export async function assertFewGroups(query: DigitQuery, groupBy: string) {
  if (query.decoding !== null) {
    const { dayOf } = await dictionaryOf(query.replacements.datasetId, query.decoding.position)
    if (dayOf.size <= MAX_GROUPS) return
  }
  const [found] = await rawSelect<{ n: number }>(
    `SELECT count(*)::int AS n FROM (SELECT DISTINCT ${query.group} FROM ${query.from} WHERE ${query.where} LIMIT ${MAX_GROUPS + 1}) AS g`,
    query.replacements,
  )
  if ((found?.n ?? 0) > MAX_GROUPS) {
    throw fail(400, [{ path: 'groupBy', message: `“${groupBy}” has more than ${MAX_GROUPS.toLocaleString('en-GB')} different values among these rows, too many to rank as groups. Group by a column with fewer values (a supplier, a department, a year), or filter the rows first.` }])
  }
}
