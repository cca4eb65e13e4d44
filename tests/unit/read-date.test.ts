import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { dayNumber, dayPart, dayText, detectDateOrder, looksLikeDate, periodOf, periodRange, readDate } from '#shared/dates/read-date'

// The oracle is JavaScript's own calendar (Date.UTC, the proleptic Gregorian calendar of ECMA-262
// §21.4.1), a general-purpose reference outside this project's reader.
const utcDay = (year: number, month: number, day: number) => Date.UTC(year, month - 1, day) / 86_400_000
const MONTHS = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December']
const two = (n: number) => String(n).padStart(2, '0')

describe('reading dates as people write them', () => {
  it('reads a date written with a time of day (timestamps) as the day written, whatever the time form', () => {
    // Forms of ISO 8601 / RFC 3339 date-times (from memory): a space or T, seconds and fractions
    // optional, Z or an offset; the day is the written one, the offset is not applied.
    fc.assert(fc.property(fc.integer({ min: Date.UTC(1970, 0, 1), max: Date.UTC(2068, 11, 31) }), fc.integer({ min: 0, max: 23 }), fc.integer({ min: 0, max: 59 }), (ms, h, min) => {
      const date = new Date(ms - (ms % 86_400_000))
      const [y, m, d] = [date.getUTCFullYear(), date.getUTCMonth() + 1, date.getUTCDate()]
      const day = utcDay(y, m, d)
      const iso = `${y}-${two(m)}-${two(d)}`
      for (const text of [`${iso} ${two(h)}:${two(min)}`, `${iso}T${two(h)}:${two(min)}:07Z`, `${iso}T${two(h)}:${two(min)}:07.250+01:00`, `${iso}T${two(h)}:${two(min)}:00-0500`]) {
        expect(dayPart(text), text).toBe(iso)
        expect(readDate(text, 'ymd'), text).toBe(day)
        expect(looksLikeDate(text), text).toBe(true)
      }
      expect(readDate(`${two(d)}/${two(m)}/${y} ${h}:${two(min)}`, 'dmy')).toBe(day)
    }), { numRuns: 200 })
    expect(dayPart('2026-03-31')).toBeNull()
    expect(dayPart('invoice 14:05')).toBeNull()
    expect(dayPart('2026-02-30 10:00')).toBe('2026-02-30')
    expect(readDate('2026-02-30 10:00', 'ymd')).toBeNull()
  })

  it('reads every usual written form of the same day as the same day', () => {
    fc.assert(fc.property(fc.integer({ min: Date.UTC(1970, 0, 1), max: Date.UTC(2068, 11, 31) }), (ms) => {
      const date = new Date(ms - (ms % 86_400_000))
      const [y, m, d] = [date.getUTCFullYear(), date.getUTCMonth() + 1, date.getUTCDate()]
      const day = utcDay(y, m, d)
      expect(readDate(`${y}-${two(m)}-${two(d)}`, 'ymd')).toBe(day)
      expect(readDate(`${y}-${two(m)}-${two(d)}T10:22:05Z`, 'ymd')).toBe(day)
      expect(readDate(`${y}/${m}/${d}`, 'ymd')).toBe(day)
      expect(readDate(`${two(d)}/${two(m)}/${y}`, 'dmy')).toBe(day)
      expect(readDate(`${d}.${m}.${y}`, 'dmy')).toBe(day)
      expect(readDate(`${m}/${d}/${y}`, 'mdy')).toBe(day)
      expect(readDate(`${d}-${two(m)}-${String(y).slice(2)}`, 'dmy')).toBe(day)
      expect(readDate(`${d} ${MONTHS[m - 1]} ${y}`, 'dmy')).toBe(day)
      expect(readDate(`${two(d)}-${MONTHS[m - 1]!.slice(0, 3)}-${y}`, 'mdy')).toBe(day)
      expect(readDate(`${MONTHS[m - 1]} ${d}, ${y}`, 'dmy')).toBe(day)
      expect(dayText(day)).toBe(`${y}-${two(m)}-${two(d)}`)
    }), { numRuns: 300 })
  })

  it('refuses days that do not exist and texts that are no dates', () => {
    // 2024 is a leap year and 2025 is not; 1900 is not (divisible by 100, not by 400); 2000 is.
    expect(readDate('2024-02-29', 'ymd')).toBe(utcDay(2024, 2, 29))
    expect(readDate('2025-02-29', 'ymd')).toBeNull()
    expect(readDate('29/02/1900', 'dmy')).toBeNull()
    expect(readDate('29/02/2000', 'dmy')).toBe(utcDay(2000, 2, 29))
    expect(readDate('31/04/2025', 'dmy')).toBeNull()
    expect(readDate('13/13/2025', 'dmy')).toBeNull()
    for (const text of ['pending', '12345', '2025', 'Marzipan 3, 2025', '15 Mars 2025', '1.5']) {
      expect(readDate(text, 'dmy'), text).toBeNull()
      expect(looksLikeDate(text), text).toBe(false)
    }
    expect(dayNumber(1970, 1, 1)).toBe(0)
  })

  it('reads two-digit years as POSIX strptime %y does: 69–99 in the 1900s, 00–68 in the 2000s', () => {
    expect(readDate('01/01/69', 'dmy')).toBe(utcDay(1969, 1, 1))
    expect(readDate('31/12/68', 'dmy')).toBe(utcDay(2068, 12, 31))
  })

  it('settles day or month first from the column\'s own values', () => {
    expect(detectDateOrder(['03/04/2025', '25/12/2025'])).toEqual({ order: 'dmy', settled: true })
    expect(detectDateOrder(['03/04/2025', '12/25/2025'])).toEqual({ order: 'mdy', settled: true })
    expect(detectDateOrder(['03/04/2025', '01/02/2025'])).toEqual({ order: 'dmy', settled: false })
    expect(detectDateOrder(['13/04/2025', '12/25/2025'])).toEqual({ order: 'dmy', settled: false })
    expect(detectDateOrder(['2025-03-04'])).toEqual({ order: 'ymd', settled: true })
    expect(readDate('03/04/2025', 'dmy')).toBe(utcDay(2025, 4, 3))
    expect(readDate('03/04/2025', 'mdy')).toBe(utcDay(2025, 3, 4))
  })

  it('names periods and gives their first and last day', () => {
    const day = utcDay(2025, 8, 17)
    expect([periodOf(day, 'year'), periodOf(day, 'quarter'), periodOf(day, 'month')]).toEqual(['2025', '2025-Q3', '2025-08'])
    expect(periodRange('2025')).toEqual({ from: '2025-01-01', to: '2025-12-31' })
    expect(periodRange('2024-Q1')).toEqual({ from: '2024-01-01', to: '2024-03-31' })
    expect(periodRange('2024-02')).toEqual({ from: '2024-02-01', to: '2024-02-29' })
    expect(periodRange('2025-Q4')).toEqual({ from: '2025-10-01', to: '2025-12-31' })
    expect(periodRange('')).toBeNull()
  })
})
