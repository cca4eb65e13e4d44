import { describe, expect, it } from 'vitest'
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
