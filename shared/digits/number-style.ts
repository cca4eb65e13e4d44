import type { NumberStyle } from './types'

export interface NumberStyleGuess extends NumberStyle {
  /** Cells that pointed to each decimal mark, and cells that could be read either way (1,234). */
  evidence: { dot: number, comma: number, undecided: number }
}

export const STYLE_SAMPLE = 10_000

/**
 * Decides a column's decimal mark from a sample of its cells, so that one column is read one way:
 * "1,234" is a thousand in one column and one-and-a-bit in another, never both. A cell with both
 * marks votes for the last one; one mark used twice is a thousands separator; one mark followed by
 * other than a possible thousands group (1–3 digits, mark, 3 digits) is the decimal mark. When nothing decides, the mark is '.'.
 * Looks at up to STYLE_SAMPLE cells spread evenly over the column.
 */
export function detectNumberStyle(cells: readonly (string | number | null | undefined)[]): NumberStyleGuess {
  const evidence = { dot: 0, comma: 0, undecided: 0 }
  const step = Math.ceil(cells.length / STYLE_SAMPLE)
  for (let i = 0; i < cells.length; i += step) {
    const cell = cells[i]
    if (typeof cell !== 'string') continue
    const vote = voteOf(cell)
    if (vote) evidence[vote]++
  }
  return { decimalMark: evidence.comma > evidence.dot ? ',' : '.', evidence }
}

function voteOf(cell: string): 'dot' | 'comma' | 'undecided' | null {
  const marks = cell.replace(/[eE][-+]?\d+\s*$/, '').replace(/[^\d.,]/g, '')
  const lastDot = marks.lastIndexOf('.')
  const lastComma = marks.lastIndexOf(',')
  if (lastDot < 0 && lastComma < 0) return null
  if (lastDot >= 0 && lastComma >= 0) return lastDot > lastComma ? 'dot' : 'comma'
  const mark = lastDot >= 0 ? '.' : ','
  const uses = marks.split(mark).length - 1
  const decimalWhenSingle = mark === '.' ? 'dot' : 'comma'
  const decimalWhenRepeated = mark === '.' ? 'comma' : 'dot'
  if (uses > 1) return decimalWhenRepeated
  const at = marks.indexOf(mark)
  const digitsBefore = marks.slice(0, at).replace(/^0+/, '').length
  const digitsAfter = marks.length - at - 1
  // A group separator needs 1–3 non-zero-led digits before it and exactly 3 after.
  const couldBeGroup = digitsAfter === 3 && digitsBefore >= 1 && digitsBefore <= 3
  return couldBeGroup ? 'undecided' : decimalWhenSingle
}
