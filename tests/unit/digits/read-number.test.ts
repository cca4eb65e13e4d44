import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { decimalText, detectNumberStyle, COMMA_STYLE, DOT_STYLE, readNumber } from '#shared/digits'

function read(cell: string | number, style = DOT_STYLE) {
  const r = readNumber(cell, style)
  return r.status === 'number' ? `${r.negative ? '-' : ''}${r.digits}e${r.exponent}` : r.status
}

describe('reading numbers from text', () => {
  it('avoids the floating-point traps listed in docs/check-values.md', () => {
    // docs/check-values.md: Math.log(1000)/Math.LN10 = 2.9999999999999996 gives a "first digit" of 10.
    expect(Math.log(1000) / Math.LN10).toBe(2.9999999999999996)
    expect(read('1000')).toBe('1e3')
    expect(read(1000)).toBe('1e3')
    // docs/check-values.md: String(1e21) = "1e+21", String(1e-7) = "1e-7".
    expect(read(1e21)).toBe('1e21')
    expect(read(1e-7)).toBe('1e-7')
    // docs/check-values.md: 5e-324 (the smallest double) gives Infinity through division.
    expect(read(5e-324)).toBe('5e-324')
    // docs/product-rules.md: 0.1 + 0.2 must not go wrong; the double's shortest text is 0.30000000000000004.
    expect(read(0.1 + 0.2)).toBe('30000000000000004e-1')
    expect(read('0.3')).toBe('3e-1')
  })

  it('reads currency signs and codes, before or after the number', () => {
    expect(read('$1,234.50')).toBe('12345e3')
    expect(read('€ 1.234,50', COMMA_STYLE)).toBe('12345e3')
    expect(read('£12')).toBe('12e1')
    expect(read('¥1,000')).toBe('1e3')
    expect(read('USD 12.5')).toBe('125e1')
    expect(read('12.5 EUR')).toBe('125e1')
    expect(read('US$ 7')).toBe('7e0')
    expect(read('12 kr')).toBe('12e1')
  })

  it('reads the thousands separators of each style', () => {
    expect(read('1,234.50')).toBe('12345e3')
    expect(read('1.234,50', COMMA_STYLE)).toBe('12345e3')
    expect(read('1 234,50', COMMA_STYLE)).toBe('12345e3')
    expect(read('1\u00A0234,50', COMMA_STYLE)).toBe('12345e3')
    expect(read('1\u202F234,50', COMMA_STYLE)).toBe('12345e3')
    expect(read('1\'234.50')).toBe('12345e3')
    expect(read('1,234,567.8')).toBe('12345678e6')
    expect(read('12,34,567')).toBe('1234567e6')
  })

  it('reads a mark by the column style, never by the cell', () => {
    expect(read('1,234')).toBe('1234e3')
    expect(read('1,234', COMMA_STYLE)).toBe('1234e0')
    expect(read('1.234')).toBe('1234e0')
    expect(read('1.234', COMMA_STYLE)).toBe('1234e3')
  })

  it('counts malformed grouping and a foreign decimal mark as unreadable', () => {
    expect(read('1,23')).toBe('unreadable')
    expect(read('1.234.567')).toBe('unreadable')
    expect(read('1 234,50')).toBe('unreadable')
    expect(read('1,234 567')).toBe('unreadable')
    expect(read('12.34.56', COMMA_STYLE)).toBe('unreadable')
  })

  it('reads negatives written as -12, (12), 12- and with a Unicode minus', () => {
    expect(read('-12')).toBe('-12e1')
    expect(read('(12)')).toBe('-12e1')
    expect(read('12-')).toBe('-12e1')
    expect(read('\u221212')).toBe('-12e1')
    expect(read('($1,200.00)')).toBe('-12e3')
    expect(read('-$12')).toBe('-12e1')
    expect(read('$-12')).toBe('-12e1')
    expect(read('+12')).toBe('12e1')
    expect(read('--12')).toBe('unreadable')
    expect(read('-(12)')).toBe('unreadable')
  })

  it('reads percent signs as the figure printed, exponents and surrounding spaces', () => {
    expect(read('12%')).toBe('12e1')
    expect(read('%12')).toBe('12e1')
    expect(read('1.5E-7')).toBe('15e-7')
    expect(read('2e+3')).toBe('2e3')
    expect(read('  42 ')).toBe('42e1')
    expect(read('\t7\u00A0')).toBe('7e0')
    expect(read('.5')).toBe('5e-1')
    expect(read('0012.500')).toBe('125e1')
  })

  it('tells blanks, zeros and unreadable text apart', () => {
    expect(read('')).toBe('blank')
    expect(read('   ')).toBe('blank')
    expect(readNumber(null).status).toBe('blank')
    expect(read('0')).toBe('zero')
    expect(read('-0.00')).toBe('zero')
    expect(read('$0')).toBe('zero')
    expect(read(-0)).toBe('zero')
    expect(read('n/a')).toBe('unreadable')
    expect(read('-')).toBe('unreadable')
    expect(read('12abc')).toBe('unreadable')
    expect(read('0x1F')).toBe('unreadable')
  })

  it('counts NaN and Infinity, as text or as numbers, as unreadable', () => {
    for (const cell of ['NaN', 'nan', 'Infinity', '-Infinity', 'INF', '∞']) expect(read(cell)).toBe('unreadable')
    for (const x of [Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY]) expect(read(x)).toBe('unreadable')
  })

  it('reads Arabic-Indic, Extended Arabic-Indic and fullwidth digits, and refuses other scripts', () => {
    expect(read('١٢٣')).toBe('123e2')
    expect(read('۱۲۳٫۵')).toBe('1235e2')
    expect(read('١٬٢٣٤')).toBe('1234e3')
    expect(read('１２３')).toBe('123e2')
    // Devanagari digits are left unread on purpose, so an unexpected script shows in the counts.
    expect(read('१२३')).toBe('unreadable')
  })

  it('keeps 1e308, larger exponents and very long digit strings exact', () => {
    expect(read(1e308)).toBe('1e308')
    expect(read('1e308')).toBe('1e308')
    expect(read('1e400')).toBe('1e400')
    expect(read(Number.MAX_VALUE)).toBe('17976931348623157e308')
    const long = '9'.repeat(500)
    expect(read(long)).toBe(`${long}e499`)
    expect(read(`0.${'0'.repeat(300)}12`)).toBe('12e-301')
    // Beyond a thousand orders of magnitude the cell is unreadable rather than a huge NUMERIC.
    expect(read('1e1001')).toBe('unreadable')
    expect(read(`1${'0'.repeat(5000)}`)).toBe('unreadable')
    expect(read('1e99999999999999999999')).toBe('unreadable')
  })

  it('reads up to a thousand significant digits and no more', () => {
    // MAX_SIGNIFICANT_DIGITS in read-number.ts: a value beyond it could not be stored exactly.
    const most = `0.${'3'.repeat(1000)}`
    expect(read(most)).toBe(`${'3'.repeat(1000)}e-1`)
    expect(read(`${most}3`)).toBe('unreadable')
    expect(read(`0.${'3'.repeat(1 << 20)}`)).toBe('unreadable')
    expect(read(`${'1'.repeat(1001)}e-995`)).toBe('unreadable')
  })

  it('gives back every double exactly (property)', () => {
    fc.assert(fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }).filter(x => x !== 0), (x) => {
      expect(Number(decimalText(readNumber(x)))).toBe(x)
    }))
  })

  it('reads what Intl formats, once the column style is detected (property)', () => {
    const amount = fc.integer({ min: 1, max: 10 ** 9 }).map(cents => cents / 100)
    fc.assert(fc.property(fc.constantFrom('en-US', 'de-DE', 'fr-FR', 'de-CH', 'en-IN'), fc.array(amount, { minLength: 20, maxLength: 60 }), (locale, amounts) => {
      const format = new Intl.NumberFormat(locale, { minimumFractionDigits: 2, maximumFractionDigits: 2 })
      const cells = amounts.map(x => format.format(x))
      const style = detectNumberStyle(cells)
      amounts.forEach((x, i) => {
        expect(decimalText(readNumber(cells[i]!, style))).toBe(decimalText(readNumber(x.toFixed(2))))
      })
    }), { numRuns: 60 })
  })
})

describe('deciding a column\'s decimal mark', () => {
  it('uses the last mark when a cell has both', () => {
    expect(detectNumberStyle(['1.234,50', '2.000,00']).decimalMark).toBe(',')
    expect(detectNumberStyle(['1,234.50', '2,000.00']).decimalMark).toBe('.')
  })

  it('reads a repeated mark as a thousands separator and a short tail as decimals', () => {
    expect(detectNumberStyle(['1.234.567']).decimalMark).toBe(',')
    expect(detectNumberStyle(['12,5', '7,25']).decimalMark).toBe(',')
    expect(detectNumberStyle(['0,125']).decimalMark).toBe(',')
    expect(detectNumberStyle(['1234,567']).decimalMark).toBe(',')
  })

  it('leaves 1,234 undecided and falls back to a dot', () => {
    const guess = detectNumberStyle(['1,234', '5,678', '12'])
    expect(guess.evidence).toEqual({ dot: 0, comma: 0, undecided: 2 })
    expect(guess.decimalMark).toBe('.')
  })

  it('decides by the majority of cells, so one odd cell does not flip the column', () => {
    const cells = ['1.234,50', '99,95', '12,00', '3.5']
    expect(detectNumberStyle(cells)).toEqual({ decimalMark: ',', evidence: { dot: 1, comma: 3, undecided: 0 } })
  })
})

describe('codes that are not currencies', () => {
  // ISO 4217 lists USD and GBP; "PAY" and "INV" are not currency codes, so a reference such as
  // PAY-100002 is an identifier, not an amount of −100,002 (found in the demo ledger's ref column).
  it('reads currency codes but leaves references unreadable', () => {
    expect(readNumber('PAY-100002').status).toBe('unreadable')
    expect(readNumber('INV 2024').status).toBe('unreadable')
    expect(readNumber('USD 1,234.50')).toMatchObject({ status: 'number', negative: false, digits: '12345', exponent: 3 })
    expect(readNumber('GBP-12')).toMatchObject({ status: 'number', negative: true, digits: '12' })
  })
})
