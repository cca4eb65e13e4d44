import { cochranMinimum } from './cochran'
import { mantissaOf } from './digit-record'
import { DISTRIBUTIONS } from './distribution-tests'
import { readNumber } from './read-number'
import type { Bin, ColumnProfile, DistributionTest, Finding, TestName } from './types'

export interface SuitabilityInput {
  test: TestName
  /** Values the test uses, after exclusions. */
  n: number
  /** Column facts for the tested sign; without them only the size is checked. */
  profile?: ColumnProfile | null
  /**
   * The result's bins. Round numbers expect shares that depend on the column's lengths and
   * precision (multiples of 1,000 are ten times rarer than multiples of 100, and rarer still in a
   * column of cents), so their size check reads the expected counts rather than a fixed minimum.
   */
  bins?: readonly Bin[]
}

interface Minimum {
  /** Below this, more than a fifth of the bins expect fewer than 5 values (Cochran's rule); below `stop`, the rarest expects fewer than 1. */
  warning: number
  stop: number
  rarest: string
}

const COCHRAN = 'no bin expecting fewer than 1 value and no more than a fifth of them fewer than 5 before trusting a chi-square test (Cochran 1954)'

function minimumFor(shares: readonly number[], rarest: string): Minimum {
  return { warning: cochranMinimum(shares), stop: Math.ceil(1 / Math.min(...shares)), rarest }
}

function distributionMinimum(test: DistributionTest): Minimum {
  const { keys, shares } = DISTRIBUTIONS[test]
  return minimumFor(shares, `"${keys[shares.indexOf(Math.min(...shares))]}"`)
}

/** Smallest useful sizes per test, all from Cochran's rule for the expected counts. */
export const MINIMUM_VALUES: Record<TestName, Minimum | null> = {
  'first-digit': distributionMinimum('first-digit'),
  'second-digit': distributionMinimum('second-digit'),
  'first-two-digits': distributionMinimum('first-two-digits'),
  'first-three-digits': distributionMinimum('first-three-digits'),
  'last-two-digits': distributionMinimum('last-two-digits'),
  'summation': distributionMinimum('first-two-digits'),
  'round-numbers': minimumFor([0.001], 'multiples of 1,000 (about 1 in 1,000 whole amounts of four or more digits)'),
  'threshold': { warning: 50, stop: 10, rarest: 'the ten buckets around the limit' },
  'duplicates': null,
}

/** Tests whose expectation comes from Benford's law, and so depend on the data being of its kind. */
const LAW_BASED = new Set<TestName>([
  'first-digit', 'second-digit', 'first-two-digits', 'first-three-digits', 'last-two-digits', 'summation', 'round-numbers',
])

/** Mantissa's own rules of thumb for the column checks below (not published thresholds). */
export const RULES = {
  narrowSpan: 3,
  tooNarrowSpan: 1,
  assignedWhole: 0.99,
  assignedSameLength: 0.9,
  pileUp: 0.05,
  roundHundreds: 0.1,
  repeated: 0.05,
} as const

/**
 * Whether a test is expected to apply, in plain words, before any result: too few values, a span
 * under three orders of magnitude, values that look assigned, a cap or floor, many rounded or
 * repeated amounts. Each finding names its rule of thumb and where it comes from. A finding is a
 * reason for care, and a clean bill is no proof that the law applies.
 */
export function checkSuitability({ test, n, profile, bins }: SuitabilityInput): Finding[] {
  const findings: Finding[] = []
  const minimum = MINIMUM_VALUES[test]
  const rarest = test === 'round-numbers' && bins && n > 0 ? rarestBin(bins) : null
  if (rarest) {
    if (rarest.expected! < 5) {
      findings.push({
        code: 'too-few-values',
        severity: rarest.expected! < 1 ? 'stop' : 'warning',
        message: `Only ${n} values. At this column's lengths and precision the rarest bin (${ROUND_NAMES[rarest.key] ?? rarest.key}) `
          + `is expected ${Number(rarest.expected!.toPrecision(2))} times; the test wants at least 5: ${COCHRAN}.`,
      })
    }
  }
  else if (minimum && n < minimum.warning) {
    findings.push({
      code: 'too-few-values',
      severity: n < minimum.stop ? 'stop' : 'warning',
      message: `Only ${n} values. The ${test} test wants at least ${minimum.warning}, so that few of its bins `
        + `expect fewer than 5 values and even the rarest (${minimum.rarest}) at least 1: ${COCHRAN}.`,
    })
  }
  if (profile && profile.n > 0 && LAW_BASED.has(test)) findings.push(...columnFindings(profile))
  return findings
}

const ROUND_NAMES: Record<string, string> = { '0': 'multiples of 10', '00': 'multiples of 100', '000': 'multiples of 1,000' }

/** The bin with the smallest expected count above zero (a bin the law rules out entirely needs no values). */
function rarestBin(bins: readonly Bin[]): Bin | null {
  const possible = bins.filter(bin => bin.expected !== null && bin.expected > 0)
  return possible.length ? possible.reduce((a, b) => (b.expected! < a.expected! ? b : a)) : null
}

function percent(part: number, whole: number): string {
  return `${Math.round((100 * part) / whole)}%`
}

function magnitudeSpan(profile: ColumnProfile): number {
  const log10Of = (text: string) => {
    const read = readNumber(text)
    return read.exponent + mantissaOf(read.digits)
  }
  return log10Of(profile.max) - log10Of(profile.min)
}

function columnFindings(profile: ColumnProfile): Finding[] {
  const findings: Finding[] = []
  const { n } = profile
  const span = magnitudeSpan(profile)
  if (span < RULES.narrowSpan) {
    findings.push({
      code: 'narrow-span',
      severity: span < RULES.tooNarrowSpan ? 'stop' : 'warning',
      message: `The values run from ${profile.min} to ${profile.max}, ${span.toFixed(1)} orders of magnitude. `
        + `Benford's law is expected of data that spread over several orders of magnitude; under three calls for care `
        + `and under one means the law is not expected to apply (common practice; e.g. Nigrini 2012, from memory).`,
    })
  }
  if (profile.whole >= RULES.assignedWhole * n && profile.commonLength >= RULES.assignedSameLength * n) {
    findings.push({
      code: 'looks-assigned',
      severity: 'warning',
      message: `${percent(profile.whole, n)} of values are whole numbers and ${percent(profile.commonLength, n)} have `
        + `the same number of digits, as codes, ids and phone numbers do. Assigned numbers do not follow the law `
        + `(common practice; Mantissa flags 99% whole and 90% one length).`,
    })
  }
  if (profile.min !== profile.max) {
    for (const [end, count, word] of [['largest', profile.atMax, 'cap'], ['smallest', profile.atMin, 'floor']] as const) {
      if (count > 1 && count >= RULES.pileUp * n) {
        findings.push({
          code: `pile-up-at-${word}`,
          severity: 'warning',
          message: `${percent(count, n)} of values sit exactly at the ${end} value (${end === 'largest' ? profile.max : profile.min}), `
            + `which looks like a ${word}. Values cut off or held at a limit bend the digit distribution `
            + `(Mantissa's rule of thumb: 5% or more at one end).`,
        })
      }
    }
  }
  if (profile.roundHundreds >= RULES.roundHundreds * n) {
    findings.push({
      code: 'many-round',
      severity: 'warning',
      message: `${percent(profile.roundHundreds, n)} of values are whole multiples of 100; the law expects about 1% `
        + `of whole numbers to be. Rounded amounts (estimates, budgets) crowd a few digits (Mantissa's rule of thumb: 10%).`,
    })
  }
  if (profile.topValue > 1 && profile.topValue >= RULES.repeated * n) {
    findings.push({
      code: 'many-repeated',
      severity: 'warning',
      message: `One value makes up ${percent(profile.topValue, n)} of all values. Repeated amounts (fees, fixed prices) `
        + `show as spikes in every digit test; the duplicates test lists them (Mantissa's rule of thumb: 5%).`,
    })
  }
  return findings
}
