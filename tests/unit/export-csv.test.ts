import Papa from 'papaparse'
import { describe, expect, it } from 'vitest'
import { toCsv } from '../../shared/export/csv'
import { FORMULA_PAYLOADS, MARKUP_PAYLOADS } from '../fixtures/hostile/payloads'

// papaparse, a general-purpose CSV parser, reads the text back as a spreadsheet would receive it.
const cellsOf = (csv: string) => Papa.parse<string[]>(csv, { skipEmptyLines: true }).data

describe('CSV export (shared/export/csv.ts)', () => {
  it('prefixes every formula-starting text with an apostrophe (OWASP, "CSV Injection")', () => {
    const payloads = Object.values(FORMULA_PAYLOADS)
    const [cells] = cellsOf(toCsv([payloads]))
    expect(cells).toEqual(payloads.map(p => `'${p}`))
  })

  it('writes plain decimal numbers, as numbers or as text, without a prefix', () => {
    expect(cellsOf(toCsv([[-1250.5, '-1250.5', '-0.001', '42', 0]]))[0]).toEqual(['-1250.5', '-1250.5', '-0.001', '42', '0'])
    // Text that only starts like a number still runs as a formula.
    expect(cellsOf(toCsv([['-1+2', '-1250.5e3']]))[0]).toEqual(['\'-1+2', '\'-1250.5e3'])
  })

  it('keeps markup, quotes, separators and line ends inside one cell', () => {
    const cells = [...Object.values(MARKUP_PAYLOADS), 'a,b', 'two\r\nlines', '"quoted"']
    expect(cellsOf(toCsv([cells]))).toEqual([cells])
  })

  it('leaves blanks and non-finite numbers empty', () => {
    expect(toCsv([[null, undefined, Number.NaN, Number.POSITIVE_INFINITY]])).toBe(',,,\r\n')
  })
})
