import { QueryTypes } from 'sequelize'
import type { DuplicateCounts, SignFilter } from '#shared/digits'
import { signCode, STATUS_CODES } from './digit-columns'
import type { CodeFilter } from './digit-query'
import { rawSelect } from './digit-query'

type Repeats = Omit<DuplicateCounts, 'status'>

/**
 * A number column's repeated values per value of one text column and per sign, counted once after
 * an import into dataset_code_repeats, as duplicateCounts (digit-tests.ts) counts them for one
 * selection: how many distinct values, how many repeat and in how many rows, the 50 most repeated.
 * Repeated amounts filtered to one department (or vendor, or date) then read them.
 */
export async function countCodeRepeats(datasetId: string, digits: string, columnPos: number, textPos: number) {
  await useDb().sequelize.query(`
    INSERT INTO dataset_code_repeats (dataset_id, column_pos, group_pos, group_code, sign, repeats)
    WITH g AS MATERIALIZED (
      SELECT d.group_codes[${textPos + 1}] AS code, d.sign, d.value, count(*)::int AS c FROM ${digits} d
      WHERE d.column_pos = ${columnPos} AND d.status = ${STATUS_CODES.number} AND d.group_codes[${textPos + 1}] > 0 GROUP BY 1, 2, 3),
    ranked AS (
      SELECT code, sign, value, c, row_number() OVER (PARTITION BY code, sign ORDER BY c DESC, value) AS rank FROM g WHERE c > 1),
    -- Each group's top list made once by GROUP BY: a subquery per group over all the tops took a minute at 1M rows.
    tops AS (
      SELECT code, sign, jsonb_agg(jsonb_build_object('value', value::text, 'count', c) ORDER BY c DESC, value) AS top
      FROM ranked WHERE rank <= 50 GROUP BY 1, 2),
    s AS (
      SELECT code, sign, count(*)::int AS distinct, (count(*) FILTER (WHERE c > 1))::int AS values, coalesce(sum(c) FILTER (WHERE c > 1), 0)::int AS rows
      FROM g GROUP BY 1, 2)
    SELECT :datasetId, ${columnPos}, ${textPos}, s.code, s.sign, jsonb_build_object(
      'distinct', s.distinct, 'repeated', jsonb_build_object('values', s.values, 'rows', s.rows), 'top', coalesce(tops.top, '[]'::jsonb))
    FROM s LEFT JOIN tops ON tops.code = s.code AND tops.sign = s.sign
    ON CONFLICT DO NOTHING`, { replacements: { datasetId }, type: QueryTypes.INSERT })
}

/**
 * The repeated values kept for a selection that is one value of one text column (its filters keep
 * exactly one code of it), or null: then they are counted from the records.
 */
export async function codeRepeats(datasetId: string, columnPos: number, filters: CodeFilter[] | null, sign: SignFilter): Promise<Repeats | null> {
  const [filter] = filters ?? []
  if (!filter || filters!.length !== 1 || filter.negate || filter.codes.length !== 1) return null
  const [row] = await rawSelect<{ repeats: Repeats }>(
    `SELECT repeats FROM dataset_code_repeats WHERE dataset_id = :datasetId AND column_pos = :columnPos AND group_pos = :textPos AND group_code = :code AND sign = ${signCode(sign)}`,
    { datasetId, columnPos, textPos: filter.position, code: filter.codes[0] },
  )
  return row?.repeats ?? null
}
