// The questions the import benchmark puts to Mantissa and, as the same counts, to DuckDB (its peer):
// filters alone and together, periods, groups. The peer's table holds each positive amount with its
// digits worked out once at load, as Mantissa's digit records do, so each of its queries is the
// counting alone (a stricter peer than one that reads the digits on every query).
import { DuckDBInstance } from '@duckdb/node-api'

const ft = (label, body, where = '', by = '') => ({
  label,
  body: { column: 'amount', test: 'first-two-digits', ...body },
  sql: `SELECT ${by ? `${by} AS g, ` : ''}first_two, count(*) FROM digits ${where ? `WHERE ${where}` : ''} GROUP BY ALL`,
})

export const QUESTIONS = [
  ft('whole column, by vendor', { groupBy: 'vendor' }, '', 'vendor'),
  ft('department = one value, by vendor', { groupBy: 'vendor', filters: [{ column: 'department', op: 'equals', value: 'Dept 3' }] }, `department = 'Dept 3'`, 'vendor'),
  ft('amount ≥ 100', { filters: [{ column: 'amount', op: 'between', min: 100 }] }, 'amount >= 100'),
  ft('amount ≥ 100, by vendor', { groupBy: 'vendor', filters: [{ column: 'amount', op: 'between', min: 100 }] }, 'amount >= 100', 'vendor'),
  {
    label: 'repeated amounts (duplicates), whole column',
    body: { column: 'amount', test: 'duplicates' },
    sql: `WITH g AS (SELECT amount, count(*) AS c FROM digits GROUP BY amount)
          SELECT (SELECT count(*) FROM g), (SELECT count(*) FROM g WHERE c > 1), (SELECT sum(c) FROM g WHERE c > 1),
                 (SELECT list(amount ORDER BY c DESC, amount) FROM (SELECT * FROM g WHERE c > 1 ORDER BY c DESC, amount LIMIT 50))`,
  },
  { label: 'last two digits, whole column', body: { column: 'amount', test: 'last-two-digits' }, sql: 'SELECT last_two, count(*) FROM digits WHERE amount >= 10 GROUP BY ALL' },
  ft('amount ≥ 150 (a floor between powers of ten)', { filters: [{ column: 'amount', op: 'between', min: 150 }] }, 'amount >= 150'),
  ft('amount 150 to 20,000, by vendor', { groupBy: 'vendor', filters: [{ column: 'amount', op: 'between', min: 150, max: 20000 }] }, 'amount BETWEEN 150 AND 20000', 'vendor'),
  ft('department one of three, by vendor', { groupBy: 'vendor', filters: [{ column: 'department', op: 'one-of', values: ['Dept 1', 'Dept 4', 'Dept 7'] }] }, `department IN ('Dept 1', 'Dept 4', 'Dept 7')`, 'vendor'),
  ft('department not one of two', { filters: [{ column: 'department', op: 'not-one-of', values: ['Dept 0', 'Dept 8'] }] }, `department NOT IN ('Dept 0', 'Dept 8')`),
  ft('vendor one of five, by vendor', { groupBy: 'vendor', filters: [{ column: 'vendor', op: 'one-of', values: ['Vendor 1', 'Vendor 2', 'Vendor 3', 'Vendor 4', 'Vendor 5'] }] }, `vendor IN ('Vendor 1', 'Vendor 2', 'Vendor 3', 'Vendor 4', 'Vendor 5')`, 'vendor'),
  ft('paid 2025-03-01 to 2025-06-30', { filters: [{ column: 'paid_on', op: 'dates', from: '2025-03-01', to: '2025-06-30' }] }, `paid_on BETWEEN DATE '2025-03-01' AND DATE '2025-06-30'`),
  ft('by month of paid_on', { groupBy: 'paid_on', period: 'month' }, '', `date_trunc('month', paid_on)`),
  ft('by quarter of paid_on, paid in 2025', { groupBy: 'paid_on', period: 'quarter', filters: [{ column: 'paid_on', op: 'dates', from: '2025-01-01', to: '2025-12-31' }] }, `paid_on BETWEEN DATE '2025-01-01' AND DATE '2025-12-31'`, `date_trunc('quarter', paid_on)`),
  ft('three filters (department, amount, date), by vendor', {
    groupBy: 'vendor',
    filters: [{ column: 'department', op: 'one-of', values: ['Dept 2', 'Dept 5'] }, { column: 'amount', op: 'between', min: 100 }, { column: 'paid_on', op: 'dates', from: '2024-07-01' }],
  }, `department IN ('Dept 2', 'Dept 5') AND amount >= 100 AND paid_on >= DATE '2024-07-01'`, 'vendor'),
  ft('amount 100 to 5,000 (number range)', { filters: [{ column: 'amount', op: 'between', min: 100, max: 5000 }] }, 'amount BETWEEN 100 AND 5000'),
  ft('amount 99.995 to 12,345.67 (ends between cents)', { filters: [{ column: 'amount', op: 'between', min: 99.995, max: 12345.67 }] }, 'amount BETWEEN 99.995 AND 12345.67'),
  ft('amount ≥ 100, by department', { groupBy: 'department', filters: [{ column: 'amount', op: 'between', min: 100 }] }, 'amount >= 100', 'department'),
  ft('amount ≥ 1,000, department = one value, by vendor', { groupBy: 'vendor', filters: [{ column: 'amount', op: 'between', min: 1000 }, { column: 'department', op: 'equals', value: 'Dept 3' }] }, `amount >= 1000 AND department = 'Dept 3'`, 'vendor'),
  {
    label: 'repeated amounts, vendor = one value',
    body: { column: 'amount', test: 'duplicates', filters: [{ column: 'vendor', op: 'equals', value: 'Vendor 17' }] },
    sql: `WITH g AS (SELECT amount, count(*) AS c FROM digits WHERE vendor = 'Vendor 17' GROUP BY amount)
          SELECT (SELECT count(*) FROM g), (SELECT count(*) FROM g WHERE c > 1), (SELECT sum(c) FROM g WHERE c > 1),
                 (SELECT list(amount ORDER BY c DESC, amount) FROM (SELECT * FROM g WHERE c > 1 ORDER BY c DESC, amount LIMIT 50))`,
  },
  {
    label: 'repeated amounts, department = one value',
    body: { column: 'amount', test: 'duplicates', filters: [{ column: 'department', op: 'equals', value: 'Dept 3' }] },
    sql: `WITH g AS (SELECT amount, count(*) AS c FROM digits WHERE department = 'Dept 3' GROUP BY amount)
          SELECT (SELECT count(*) FROM g), (SELECT count(*) FROM g WHERE c > 1), (SELECT sum(c) FROM g WHERE c > 1),
                 (SELECT list(amount ORDER BY c DESC, amount) FROM (SELECT * FROM g WHERE c > 1 ORDER BY c DESC, amount LIMIT 50))`,
  },
]

/** The ledger file in an in-memory DuckDB, with each positive amount's digits (from its exact decimal value). */
export async function openPeer(file) {
  const instance = await DuckDBInstance.create(':memory:')
  const connection = await instance.connect()
  await connection.run(`CREATE TABLE ledger AS SELECT * FROM read_csv('${file.replaceAll('\'', '\'\'')}', header = true,
    columns = { 'payment_ref': 'VARCHAR', 'paid_on': 'DATE', 'vendor': 'VARCHAR', 'department': 'VARCHAR', 'amount': 'DECIMAL(18,2)' })`)
  // The digits from the decimal text, as Mantissa reads them (no floating-point logarithm).
  await connection.run(`CREATE TABLE digits AS SELECT *,
      CAST(substr(regexp_replace(CAST(amount AS VARCHAR), '[^0-9]|^[0.]+', '', 'g'), 1, 2) AS INTEGER) AS first_two,
      CAST(floor(amount) % 100 AS INTEGER) AS last_two
    FROM ledger WHERE amount > 0`)
  return {
    run: sql => connection.runAndReadAll(sql),
    close: () => connection.closeSync(),
  }
}
