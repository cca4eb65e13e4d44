import { describe, expect, it } from 'vitest'
import { chooseBounds, LadderBounds, rangeOnRungs, rungsOf } from '../../server/services/datasets/value-ladder'

// The value ladder's bounds and ranges, checked against exact decimal order worked out by hand here.
// A range's bounds are included (README, the digit-tests route: "bounds included"); a rung holds its
// lower bound and not its upper one (server/services/datasets/value-ladder.ts).

const BOUNDS = ['-5', '0', '0.1', '99.99', '100', '2500']

describe('a value ladder', () => {
  const ladder = new LadderBounds(BOUNDS)
  const rung = (text: string) => ladder.rungOf(Number(text), text)

  it('puts each value on the rung whose lower bound it reaches and whose upper bound it stays under', () => {
    expect(rung('-7')).toBe(0)
    expect(rung('-5')).toBe(1)
    expect(rung('-0.01')).toBe(1)
    expect(rung('0')).toBe(2)
    expect(rung('0.1')).toBe(3)
    expect(rung('99.98')).toBe(3)
    expect(rung('99.99')).toBe(4)
    expect(rung('99.995')).toBe(4)
    expect(rung('100')).toBe(5)
    expect(rung('2500')).toBe(6)
    expect(rung('1000000000')).toBe(6)
  })

  it('tells apart decimals a double cannot (0.1 + 0.2 against 0.3 is the classic case)', () => {
    const fine = new LadderBounds(['0.30000000000000001'])
    // Both texts read as the same double; the exact decimal order puts 0.3 below the bound.
    expect(fine.rungOf(Number('0.3'), '0.3')).toBe(0)
    expect(fine.rungOf(Number('0.30000000000000001'), '0.30000000000000001')).toBe(1)
  })

  it('takes a range\'s whole rungs and the parts it cuts from the rungs beside them', () => {
    const rungs = rungsOf(BOUNDS)
    // [99.995, 2500]: rung 5 ([100, 2500)) whole; [99.995, 100) below; [2500, 2500] above.
    expect(rangeOnRungs(rungs, { min: 99.995, max: 2500 })).toEqual({ codes: [5], below: { min: 99.995, below: '100' }, above: { from: '2500', max: 2500 } })
    // A bound that is a rung's own bound cuts nothing below it.
    expect(rangeOnRungs(rungs, { min: 0 })).toEqual({ codes: [2, 3, 4, 5, 6], below: null, above: null })
    // Open below: the first rung (everything under -5) is whole.
    expect(rangeOnRungs(rungs, { max: 0.1 })).toEqual({ codes: [0, 1, 2], below: null, above: { from: '0.1', max: 0.1 } })
    // Inside one rung: nothing whole, the records answer.
    expect(rangeOnRungs(rungs, { min: 1, max: 50 })).toBeNull()
  })

  it('makes one rung more than it has bounds, open below the first and from the last', () => {
    const rungs = rungsOf(BOUNDS)
    expect(rungs).toHaveLength(BOUNDS.length + 1)
    expect(rungs[0]).toMatchObject({ code: 0, low: null, high: BOUNDS[0], lowValue: null })
    expect(rungs.at(-1)).toMatchObject({ code: BOUNDS.length, low: BOUNDS.at(-1), high: null, highValue: null })
    rungs.slice(1, -1).forEach((r, i) => expect([r.low, r.high]).toEqual([BOUNDS[i], BOUNDS[i + 1]]))
  })

  it('cuts a sample at its quantiles, in exact order, without repeating a bound', () => {
    const sample = Array.from({ length: 640 }, (_, i) => String((i % 320) / 4))
    const bounds = chooseBounds(sample)!
    expect(bounds.texts).toEqual([...new Set(bounds.texts)])
    const numbers = bounds.texts.map(Number)
    expect(numbers).toEqual([...numbers].sort((a, b) => a - b))
    expect(bounds.texts.length).toBeGreaterThan(50)
    expect(chooseBounds(['5'])).toBeNull()
  })

  it('adds the round numbers in the sample\'s span, so ranges between them need no records', () => {
    // Amounts from 3.17 to 48,210.5: 5, 10, 20, 50 … 20,000 are bounds whatever the quantiles are.
    const sample = Array.from({ length: 640 }, (_, i) => (3.17 * 1.0135 ** i).toFixed(2)).concat('48210.5')
    const texts = chooseBounds(sample)!.texts
    for (const round of ['5', '10', '20', '50', '100', '200', '500', '1000', '2000', '5000', '10000', '20000']) expect(texts).toContain(round)
    for (const outside of ['1', '2', '50000']) expect(texts).not.toContain(outside)
    expect(rangeOnRungs(rungsOf(texts), { min: 100, max: 5000 })).toMatchObject({ below: null, above: { from: '5000', max: 5000 } })
    expect(rangeOnRungs(rungsOf(texts), { min: 100 })).toMatchObject({ below: null, above: null })
  })

  it('gives round bounds of both signs, and one bound for a round number the sample also holds', () => {
    const texts = chooseBounds(['-250', '-0.5', '0', '0.20', '3', '75'])!.texts
    for (const round of ['-200', '-100', '-50', '-1', '-0.5', '0.5', '1', '2', '5', '10', '20', '50']) expect(texts.map(Number)).toContain(Number(round))
    // The sample's "0.20" and the round 0.2 are one bound.
    expect(texts.filter(t => Number(t) === 0.2)).toHaveLength(1)
    expect(texts.map(Number)).toEqual([...texts.map(Number)].sort((a, b) => a - b))
  })
})
