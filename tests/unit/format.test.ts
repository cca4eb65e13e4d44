import { describe, expect, it } from 'vitest'
import { formatDate, formatDateTime } from '#shared/format/dates'
import { formatDifference } from '../../app/utils/format'

describe('differences in tables', () => {
  it('shows fixed decimals and never a negative zero or an exponent', () => {
    expect(formatDifference(0.00018)).toBe('0.00018')
    expect(formatDifference(-0.00012)).toBe('-0.00012')
    expect(formatDifference(-0.000004)).toBe('0.00000')
    expect(formatDifference(0.0000004)).toBe('0.00000')
    expect(formatDifference(null)).toBe('—')
  })
})

describe('dates, written one way everywhere', () => {
  // Expected strings read off the ISO instants by hand: day without a leading zero, English short month, 24-hour UTC time.
  it('writes a moment as day, short month, year and UTC time', () => {
    expect(formatDateTime('2026-12-03T09:32:10.000Z')).toBe('3 Dec 2026, 09:32 UTC')
    expect(formatDateTime(new Date('2026-01-31T23:59:59.999Z'))).toBe('31 Jan 2026, 23:59 UTC')
    expect(formatDateTime('2026-07-01T00:00:00.000Z')).toBe('1 Jul 2026, 00:00 UTC')
    expect(formatDateTime(null)).toBe('—')
  })

  it('writes a day the same way, in UTC, so a date-only value never moves to the day before', () => {
    expect(formatDate('2025-03-09')).toBe('9 Mar 2025')
    expect(formatDate('2026-12-31T23:30:00.000Z')).toBe('31 Dec 2026')
    expect(formatDate(undefined)).toBe('—')
  })
})
