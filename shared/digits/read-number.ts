import type { CellStatus, NegativeNotation, NumberStyle } from './types'

/** A number as its decimal text wrote it: value = ±d1.d2d3… × 10^exponent. */
export interface ReadNumber {
  status: CellStatus
  negative: boolean
  /** Significant digits without leading or trailing zeros; '' unless status is 'number'. */
  digits: string
  exponent: number
}

export const DOT_STYLE: NumberStyle = { decimalMark: '.' }
export const COMMA_STYLE: NumberStyle = { decimalMark: ',' }

/**
 * Orders of magnitude beyond this are read as unreadable: no amount has them, and the exact
 * decimal text of such a value would be thousands of characters long.
 */
export const MAX_MAGNITUDE = 1000

/**
 * More significant digits than this are unreadable too: no amount has them, and with the limit
 * above a value keeps under 2,000 digits after the point, which the stored records can hold
 * (a 1 MB run of digits after "0." overflowed them and failed the import).
 */
export const MAX_SIGNIFICANT_DIGITS = 1000

const BLANK: ReadNumber = { status: 'blank', negative: false, digits: '', exponent: 0 }
const UNREADABLE: ReadNumber = { status: 'unreadable', negative: false, digits: '', exponent: 0 }
const ZERO: ReadNumber = { status: 'zero', negative: false, digits: '', exponent: 0 }

// Arabic-Indic, Extended Arabic-Indic and fullwidth digits are read; digits of any other script
// make the cell unreadable, so a column in an unexpected script shows up in the counts.
const FOREIGN_DIGIT = /[\u0660-\u0669\u06F0-\u06F9\uFF10-\uFF19]/g
const FOREIGN_DIGIT_ZEROS = [0x0660, 0x06F0, 0xFF10]
const ARABIC_DECIMAL = '\u066B'
const ARABIC_GROUP = '\u066C'

const SIGN = /^[-+\u2212]/
const TRAILING_SIGN = /[-+\u2212]$/
// Only real ISO 4217 codes are peeled: a reference such as "PAY-100002" is not an amount of "PAY".
const CURRENCY_CODES = [
  'USD', 'EUR', 'GBP', 'JPY', 'CNY', 'CHF', 'CAD', 'AUD', 'NZD', 'HKD', 'SGD', 'SEK', 'NOK', 'DKK', 'ISK', 'PLN', 'CZK', 'HUF',
  'RON', 'BGN', 'TRY', 'RUB', 'UAH', 'ILS', 'INR', 'PKR', 'BDT', 'LKR', 'NPR', 'IDR', 'MYR', 'THB', 'VND', 'PHP', 'KRW', 'TWD',
  'BRL', 'ARS', 'CLP', 'COP', 'MXN', 'PEN', 'UYU', 'ZAR', 'NGN', 'KES', 'GHS', 'EGP', 'MAD', 'TND', 'AED', 'SAR', 'QAR', 'KWD',
  'BHD', 'OMR', 'JOD', 'XOF', 'XAF', 'RSD', 'BAM', 'MKD', 'ALL', 'GEL', 'AMD', 'AZN', 'KZT', 'UZS', 'MNT',
].join('|')
const CURRENCY_CORE = `(?:[A-Z]{1,3}\\$|(?:${CURRENCY_CODES})(?![A-Za-z])|kr\\.?|Rs\\.?|zł|Fr\\.|[$€£¥₹₩₽₺₪₫₦₱฿¢₴₸₲₡₵])`
const LEADING_CURRENCY = new RegExp(`^${CURRENCY_CORE}`)
const TRAILING_CURRENCY = new RegExp(`${CURRENCY_CORE}$`)

interface StyleGrammar {
  plain: RegExp
  body: RegExp
}

function grammarFor(decimalMark: '.' | ','): StyleGrammar {
  const mark = decimalMark === '.' ? '\\.' : ','
  const group = decimalMark === '.' ? `[,'’\\s${ARABIC_GROUP}]` : `[.'’\\s${ARABIC_GROUP}]`
  return {
    plain: new RegExp(`^(-?)(\\d+)(?:${mark}(\\d+))?$`),
    // Western (1,234,567) and Indian (12,34,567) grouping; one separator character per number.
    body: new RegExp(`^(\\d{1,3}(?:(${group})(?:\\d{2,3}\\2)*\\d{3})?|\\d*)(?:${mark}(\\d*))?(?:[eE]([-+]?\\d+))?$`),
  }
}

const GRAMMARS = { '.': grammarFor('.'), ',': grammarFor(',') }

/**
 * Reads one cell's text (or a JS number) into sign, significant digits and order of magnitude.
 * Digits come from the decimal text, never from logarithms. Accepts currency signs and codes,
 * thousands separators of the column's style, -12 / (12) / 12-, percent signs (12% reads as 12:
 * the figure as printed), exponents and surrounding spaces. NaN, Infinity and anything else that
 * is not a number in the column's style are 'unreadable', never dropped.
 */
export function readNumber(cell: string | number | null | undefined, style: NumberStyle = DOT_STYLE): ReadNumber {
  if (cell === null || cell === undefined) return BLANK
  if (typeof cell === 'number') return readJsNumber(cell)
  const grammar = GRAMMARS[style.decimalMark]
  const plain = grammar.plain.exec(cell)
  if (plain) {
    if (plain[1] === '-' && style.negatives && style.negatives !== 'leading-minus') return UNREADABLE
    return fromParts(plain[1] === '-', plain[2]!, plain[3] ?? '', 0)
  }
  return readDecoratedText(cell, style, grammar)
}

function readJsNumber(x: number): ReadNumber {
  if (!Number.isFinite(x)) return UNREADABLE
  if (x === 0) return ZERO
  // toExponential() without an argument gives the shortest digits that round-trip the double.
  const text = Math.abs(x).toExponential()
  const e = text.indexOf('e')
  return fromParts(x < 0, text[0]!, text.slice(2, e), Number(text.slice(e + 1)))
}

function readDecoratedText(cell: string, style: NumberStyle, grammar: StyleGrammar): ReadNumber {
  const text = foldDigits(cell, style).trim()
  if (text === '') return BLANK
  if (/\p{Nd}/u.test(text.replace(/[0-9]/g, ''))) return UNREADABLE

  const peeled = peelDecorations(style.currency ? stripCurrency(text, style.currency) : text)
  if (peeled.signs > 1 || peeled.percents > 1) return UNREADABLE
  if (peeled.negative && style.negatives && peeled.notation !== style.negatives) return UNREADABLE

  const body = grammar.body.exec(peeled.text)
  if (!body) return UNREADABLE
  const integer = (body[1] ?? '').replace(/\D/g, '')
  const fraction = body[3] ?? ''
  if (integer === '' && fraction === '') return UNREADABLE
  const exponent = body[4] === undefined ? 0 : Number(body[4])
  return fromParts(peeled.negative, integer, fraction, exponent)
}

/** The column's own currency mark taken off either end (once), with the spaces beside it. */
function stripCurrency(text: string, currency: string): string {
  const mark = currency.toLowerCase()
  const lower = text.toLowerCase()
  if (lower.startsWith(mark)) return text.slice(mark.length).trim()
  if (lower.endsWith(mark)) return text.slice(0, -mark.length).trim()
  // A sign may stand outside the mark: "-KSh 1,200", "(KSh 1,200)".
  const inner = /^([-\u2212(]\s*)(.*?)(\s*\)?)$/.exec(text)
  if (inner && inner[2]!.toLowerCase().startsWith(mark)) return `${inner[1]}${inner[2]!.slice(mark.length).trim()}${inner[3]}`
  return text
}

/** Strips signs, parentheses, currency and percent marks from both ends, counting the signs. */
function peelDecorations(cell: string) {
  let text = cell
  let negative = false
  let notation: NegativeNotation | null = null
  let signs = 0
  let percents = 0
  let before: string
  do {
    before = text
    if (text.startsWith('(') && text.endsWith(')')) {
      negative = true
      notation = 'parentheses'
      signs++
      text = text.slice(1, -1)
    }
    else if (SIGN.test(text)) {
      negative = text[0] !== '+'
      if (negative) notation = 'leading-minus'
      signs++
      text = text.slice(1)
    }
    else if (TRAILING_SIGN.test(text) && !/[eE][-+]$/.test(text)) {
      negative = !text.endsWith('+')
      if (negative) notation = 'trailing-minus'
      signs++
      text = text.slice(0, -1)
    }
    else if (text.startsWith('%') || text.endsWith('%')) {
      percents++
      text = text.startsWith('%') ? text.slice(1) : text.slice(0, -1)
    }
    else {
      text = text.replace(LEADING_CURRENCY, '').replace(TRAILING_CURRENCY, '')
    }
    text = text.trim()
  } while (text !== before)
  return { text, negative, notation, signs, percents }
}

function foldDigits(cell: string, style: NumberStyle): string {
  return cell
    .replace(FOREIGN_DIGIT, (ch) => {
      const code = ch.charCodeAt(0)
      const zero = FOREIGN_DIGIT_ZEROS.find(z => code >= z && code <= z + 9)!
      return String(code - zero)
    })
    .replaceAll(ARABIC_DECIMAL, style.decimalMark)
}

function fromParts(negative: boolean, integer: string, fraction: string, shift: number): ReadNumber {
  const all = integer + fraction
  let first = 0
  while (first < all.length && all.charCodeAt(first) === 48) first++
  if (first === all.length) return ZERO
  let last = all.length - 1
  while (all.charCodeAt(last) === 48) last--
  const exponent = integer.length - 1 - first + shift
  if (!(Math.abs(exponent) <= MAX_MAGNITUDE) || last + 1 - first > MAX_SIGNIFICANT_DIGITS) return UNREADABLE
  return { status: 'number', negative, digits: all.slice(first, last + 1), exponent }
}
