import { randomUUID } from 'node:crypto'
import { describe, expect, it } from 'vitest'
import { countDistribution, DISTRIBUTIONS, DOT_STYLE, profileOf, readNumber, recordOf, toDigitRecord } from '#shared/digits'
import type { DigitRecord, DistributionTest, SignFilter } from '#shared/digits'
import { CopyEncoder, DIGIT_COLUMNS, uuidBytes, writeDigits, writeRow } from '../../server/services/datasets/copy-encoder'
import { STATUS_CODES } from '../../server/services/datasets/digit-columns'
import { CUBE_COLUMNS, countsFromCube, cubeFactSlices, cubeSlices, DigitCubeCounter, profileFromCells } from '../../server/services/datasets/digit-cube'
import { DEPARTMENTS, ledger, VENDORS } from '../fixtures/datasets/ledger'
import { array, copyRows, float4, int2, int4, numeric, text } from '../support/copy-decoder'

// The import writes rows, digit records and the digit cube in PostgreSQL's binary COPY format;
// here they are read back with a decoder written from PostgreSQL's documentation of that format
// (tests/support/copy-decoder.ts), not from the encoder.

const streamOf = (out: CopyEncoder) => Buffer.concat(out.end())

describe('binary COPY encoder', () => {
  it('writes text cells that read back byte for byte, empty and non-Latin text included', () => {
    const cells = ['Alderbank Works', '', 'Ünïcødé ✓ 数字', 'a,b"c\td\ne', '£1,234.50', 'x'.repeat(70_000)]
    const out = new CopyEncoder()
    writeRow(out, 42, cells, 1, 4)
    writeRow(out, 43, cells, 0, cells.length)
    const rows = copyRows(streamOf(out))
    expect(rows.map(row => int4(row[0]!))).toEqual([42, 43])
    expect(array(rows[0]![1]!, text)).toEqual(cells.slice(1, 5))
    expect(array(rows[1]![1]!, text)).toEqual(cells)
  })

  it('writes every digit-record field, numbers as exact NUMERIC values, and reads them back', () => {
    const cells = ['1234.5', '-0.00012', '1,000,000', '(77.10)', '0.1', '99999999.9999', '3', '1e21', '0', '', 'n/a', '100000000000000000000.01']
    const out = new CopyEncoder()
    const records = cells.map(cell => ({ read: readNumber(cell, DOT_STYLE), record: toDigitRecord(cell) }))
    records.forEach(({ read, record }, i) => writeDigits(out, 3, i + 1, read, record, Int32Array.of(0, 5, i)))
    const rows = copyRows(streamOf(out))
    expect(rows).toHaveLength(cells.length)
    rows.forEach((row, i) => {
      const r: DigitRecord = records[i]!.record
      expect(row).toHaveLength(DIGIT_COLUMNS.length)
      const field = (name: string) => row[DIGIT_COLUMNS.indexOf(name)]!
      expect([int2(field('column_pos')), int4(field('row_no'))]).toEqual([3, i + 1])
      expect(int2(field('status'))).toBe(STATUS_CODES[r.status])
      expect(int2(field('sign'))).toBe(r.sign)
      // The exact decimal text the engine worked out, e.g. "-0.00012" and "1000000000000000000000".
      expect(numeric(field('value'))).toBe(r.value)
      expect([field('first_digit'), field('second_digit'), field('first_two'), field('first_three'), field('last_two')].map(int2))
        .toEqual([r.firstDigit, r.secondDigit, r.firstTwo, r.firstThree, r.lastTwo])
      expect([field('integer_digits'), field('trailing_zeros'), field('fraction_digits')].map(int2)).toEqual([r.integerDigits, r.trailingZeros, r.fractionDigits])
      expect(float4(field('mantissa'))).toBe(r.mantissa === null ? null : Math.fround(r.mantissa))
      // Group code 0 (no code: a number column) is stored as NULL.
      expect(array(field('group_codes'), int4)).toEqual([null, 5, i || null])
    })
    expect(numeric(rows[1]![DIGIT_COLUMNS.indexOf('value')]!)).toBe('-0.00012')
    expect(numeric(rows[7]![DIGIT_COLUMNS.indexOf('value')]!)).toBe('1000000000000000000000')
  })
})

/**
 * The ledger counted into a cube by vendor and department, with `pairs` counted together; `noDepartment`
 * leaves the department of one row out (code 0), which stops a pair of it being counted from there on.
 */
function cubeOfLedger(pairs: [number, number][], noDepartment?: number) {
  const entries = ledger()
  const counter = new DigitCubeCounter([AMOUNT], [VENDOR, DEPARTMENT], pairs)
  const records = entries.map((entry, row) => {
    const record = recordOf(readNumber(entry.amount, DOT_STYLE))
    counter.add(AMOUNT, record, Int32Array.of(VENDORS.indexOf(entry.vendor) + 1, row === noDepartment ? 0 : DEPARTMENTS.indexOf(entry.department) + 1, 0, 0))
    return record
  })
  const out = new CopyEncoder()
  counter.write(out, uuidBytes(randomUUID()))
  const cube = copyRows(streamOf(out)).map(row => ({
    groupPos: int2(row[CUBE_COLUMNS.indexOf('group_pos')]!),
    code: int4(row[CUBE_COLUMNS.indexOf('group_code')]!),
    pairPos: int2(row[CUBE_COLUMNS.indexOf('pair_pos')]!),
    counts: array(row[CUBE_COLUMNS.indexOf('counts')]!, int4) as number[],
    arcs: array(row[CUBE_COLUMNS.indexOf('arcs')]!, field => field!.readDoubleBE(0)),
    ends: array(row[CUBE_COLUMNS.indexOf('ends')]!, text) as string[],
  }))
  return { entries, records, cube }
}
const [VENDOR, DEPARTMENT, AMOUNT] = [0, 1, 2]

/** A slice as PostgreSQL reads `counts[a:b]`: from 1, both ends included. */
function slice(values: number[], sql: string): number[] {
  const [, from, to] = /\[(\d+):(\d+)\]/.exec(sql)!
  return values.slice(Number(from) - 1, Number(to))
}

type CubeRow = ReturnType<typeof cubeOfLedger>['cube'][number]

function expectSameCounts(cube: CubeRow[], test: DistributionTest, sign: SignFilter, groupPos: number, code: number, of: DigitRecord[]) {
  const row = cube.find(r => r.groupPos === groupPos && r.code === code && r.pairPos === -1)
  expect(row, `cube row ${groupPos}/${code}`).toBeDefined()
  const slices = cubeSlices(test, sign)
  const fromCube = countsFromCube(test, sign, { status: slice(row!.counts, slices.status), keys: slice(row!.counts, slices.keys), arc: slice(row!.arcs, slices.arc) })
  const fromEngine = countDistribution(test, of, sign)
  const byKey = (a: { key: number | string | null }, b: { key: number | string | null }) => String(a.key).localeCompare(String(b.key))
  expect(fromCube.status).toEqual(fromEngine.status)
  expect([...fromCube.keys].sort(byKey)).toEqual([...fromEngine.keys].sort(byKey))
  // The cube sums the mantissa as PostgreSQL stores it (real, 24-bit); the engine uses the double.
  expect(fromCube.arc!.cos).toBeCloseTo(fromEngine.arc!.cos, 2)
  expect(fromCube.arc!.sin).toBeCloseTo(fromEngine.arc!.sin, 2)
  // The suitability facts: the smallest and largest value of the sign and how many hold each (the engine's profile).
  const profile = profileOf(of, sign)
  const facts = profileFromCells([{ n: fromCube.status[sign], ...factsOf(row!, sign) }])
  if (profile.n) expect(facts).toMatchObject({ n: profile.n, min: profile.min, max: profile.max, atMin: profile.atMin, atMax: profile.atMax, whole: profile.whole, roundHundreds: profile.roundHundreds })
}

/** A cube row's suitability facts of one sign, as SQL slices them (cubeFactSlices). */
function factsOf(row: CubeRow, sign: SignFilter) {
  const slices = cubeFactSlices(sign)
  return { facts: slice(row.counts, slices.facts), ends: slice(row.ends as unknown as number[], slices.ends) as unknown as string[] }
}

describe('digit cube: the counts the import keeps equal the engine\'s on the ledger fixture', () => {
  const variants: [string, [number, number][], number?][] = [
    ['each column counted on its own', []],
    ['vendor and department also counted together (the pair stands in for both and the whole)', [[VENDOR, DEPARTMENT]]],
    ['the pair stops half-way (a row without a department): what it stood for is made from its cells so far', [[VENDOR, DEPARTMENT]], 1500],
  ]
  for (const [label, pairs, noDepartment] of variants) {
    const { entries, records, cube } = cubeOfLedger(pairs, noDepartment)
    for (const test of Object.keys(DISTRIBUTIONS) as DistributionTest[]) {
      for (const sign of ['positive', 'negative'] as const) {
        it(`${label}: ${test}, ${sign} values, the whole column and every vendor and department`, () => {
          expect(records.filter(r => r.status === 'number').length).toBeGreaterThan(2000)
          expectSameCounts(cube, test, sign, -1, 0, records)
          VENDORS.forEach((vendor, i) => expectSameCounts(cube, test, sign, VENDOR, i + 1, records.filter((_, row) => entries[row]!.vendor === vendor)))
          // A department left out stops the department's grouping: the import then counts records for it.
          if (noDepartment === undefined) DEPARTMENTS.forEach((department, i) => expectSameCounts(cube, test, sign, DEPARTMENT, i + 1, records.filter((_, row) => entries[row]!.department === department)))
          else expect(cube.some(r => r.groupPos === DEPARTMENT && r.pairPos === -1)).toBe(false)
        })
      }
    }
  }
})
