import type { ColumnKind, ColumnReading, ColumnReadings } from '#shared/types/dataset'

export const KIND_CHOICES: { value: ColumnKind, label: string }[] = [
  { value: 'amount', label: 'Amount' }, { value: 'count', label: 'Count' }, { value: 'identifier', label: 'Identifier (numbers)' },
  { value: 'date', label: 'Date' }, { value: 'text', label: 'Text' },
]
export const DECIMAL_CHOICES = [{ value: '.', label: 'Point: 1,234.50' }, { value: ',', label: 'Comma: 1.234,50' }] as const
export const NEGATIVE_CHOICES = [
  { value: 'leading-minus', label: 'Leading minus: -12' }, { value: 'trailing-minus', label: 'Trailing minus: 12-' },
  { value: 'parentheses', label: 'Parentheses: (12)' },
] as const
export const DATE_CHOICES = [
  { value: 'ymd', label: 'Year first: 2026-02-13' }, { value: 'dmy', label: 'Day first: 13/02/2026' }, { value: 'mdy', label: 'Month first: 02/13/2026' },
] as const

const NEGATIVE_WORDS = { 'leading-minus': 'negatives with a leading minus only', 'trailing-minus': 'negatives with a trailing minus only', 'parentheses': 'negatives in parentheses only' }
const DATE_WORDS = { ymd: 'dates year first', dmy: 'dates day first', mdy: 'dates month first' }

/** One column's reading in words: "read as an amount, decimal comma, currency KSh stripped". */
export function readingWords(reading: ColumnReading): string {
  return [
    reading.kind && `read as ${reading.kind === 'amount' || reading.kind === 'identifier' ? 'an' : 'a'} ${reading.kind}`,
    reading.decimalMark && (reading.decimalMark === ',' ? 'decimal comma' : 'decimal point'),
    reading.negatives && NEGATIVE_WORDS[reading.negatives],
    reading.currency && `“${reading.currency}” stripped`,
    reading.dateOrder && DATE_WORDS[reading.dateOrder],
  ].filter(Boolean).join(', ')
}

/** A version's readings in words, column by column; empty for a version read as detected. */
export function readingsWords(readings: ColumnReadings): string {
  return Object.entries(readings).map(([name, reading]) => `“${name}”: ${readingWords(reading)}`).join('; ')
}
