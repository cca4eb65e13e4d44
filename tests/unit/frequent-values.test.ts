import { describe, expect, it } from 'vitest'
import { COUNTERS, FrequentValues } from '../../server/services/datasets/frequent-values'

// Misra & Gries 1982 ("Finding repeated elements", Science of Computer Programming 2(2)): with k
// counters, any value making up more than 1/(k+1) of the stream survives to the end, and a held
// count falls short of the true count by at most the number of times every counter was lowered.
function stream(length: number, heavy: string, share: number, seed = 1): string[] {
  let state = seed
  const next = () => {
    state = (state * 48271) % 2147483647
    return state / 2147483647
  }
  return Array.from({ length }, (_, i) => (next() < share ? heavy : `${i}.${Math.floor(next() * 100)}`))
}

/** Exact counts, the reference the bounds are checked against. */
function exactCount(values: string[], value: string): number {
  return values.filter(v => v === value).length
}

describe('the most frequent value in bounded memory', () => {
  it.each([0.002, 0.01, 0.05, 0.5])('keeps a value that makes up %f of 200,000 distinct others as the leader', (share) => {
    const values = new FrequentValues()
    const input = stream(200_000, '25000', share)
    for (const value of input) values.add(value)
    const leader = values.leader()!
    expect(leader.value).toBe('25000')
    const exact = exactCount(input, '25000')
    expect(leader.count).toBeLessThanOrEqual(exact)
    expect(leader.count + leader.slack).toBeGreaterThanOrEqual(exact)
    // Each lowering cancels COUNTERS + 1 values, so it happens at most n / (k + 1) times.
    expect(leader.slack).toBeLessThanOrEqual(200_000 / (COUNTERS + 1))
  })

  it('counts exactly, with no slack, while the distinct values fit its counters', () => {
    const values = new FrequentValues()
    const input = Array.from({ length: 30_000 }, (_, i) => String(i % 1500))
    for (const value of input) values.add(value)
    expect(values.leader()).toEqual({ value: '0', count: exactCount(input, '0'), slack: 0 })
  })

  it('holds no more than its counters, whatever the stream', () => {
    const values = new FrequentValues()
    for (let i = 0; i < 50_000; i++) values.add(String(i))
    // Every value is distinct, so the leader is one of the last few seen; the point is the size.
    expect(values.size).toBeLessThanOrEqual(COUNTERS)
  })

  it('has no leader for an empty stream', () => {
    expect(new FrequentValues().leader()).toBeNull()
  })
})
