/*
 * Digit extraction speed: reads 1M numeric strings into digit records, as an import does.
 * Run: npx tsx bench/digits.bench.ts. Figures are printed for the notes, never asserted.
 */
import { toDigitRecord, runDigitTest } from '../shared/digits'
import { seededRandom } from '../server/services/demo/seeded-random'

const COUNT = 1_000_000
const ROUNDS = 3

/** Deterministic amounts spread over six orders of magnitude. */
function amounts(count: number, seed: number): number[] {
  const next = seededRandom(seed)
  return Array.from({ length: count }, () => Math.round(10 ** (next() * 6) * 100) / 100)
}

function formatted(values: number[]): string[] {
  return values.map((x, i) => (i % 10 === 0 ? `$${x.toLocaleString('en-US')}` : x.toFixed(2)))
}

function measure(label: string, cells: readonly (string | number)[]): void {
  let best = Number.POSITIVE_INFINITY
  let checksum = 0
  for (let round = 0; round < ROUNDS; round++) {
    const start = performance.now()
    for (const cell of cells) checksum += toDigitRecord(cell).firstDigit ?? 0
    best = Math.min(best, performance.now() - start)
  }
  const rate = (cells.length / best) * 1000
  console.log(`${label.padEnd(52)} ${best.toFixed(0).padStart(6)} ms  ${(rate / 1e6).toFixed(2)} M values/s  (checksum ${checksum})`)
}

const values = amounts(COUNT, 20240611)
const plain = values.map(x => x.toFixed(2))
measure('1M plain strings ("1234.56")', plain)
measure('1M strings, 1 in 10 with $ and commas', formatted(values))
measure('1M JS numbers', values)

const start = performance.now()
const result = runDigitTest({ test: 'first-two-digits', input: { values: plain } })
console.log(`${'first-two-digits test on 1M strings (values path)'.padEnd(52)} ${(performance.now() - start).toFixed(0).padStart(6)} ms  (n ${result.n})`)
