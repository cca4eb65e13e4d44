import type { Conformity, Reading, TestName } from '../digits'

export const TEST_LABELS: Record<TestName, string> = {
  'first-digit': 'First digit',
  'second-digit': 'Second digit',
  'first-two-digits': 'First two digits',
  'first-three-digits': 'First three digits',
  'last-two-digits': 'Last two digits',
  'summation': 'Summation by first two digits',
  'duplicates': 'Repeated amounts',
  'round-numbers': 'Round amounts',
  'threshold': 'Amounts just under a limit',
}

export const TEST_DESCRIPTIONS: Record<TestName, string> = {
  'first-digit': 'How often each leading digit 1–9 occurs, against Benford’s law.',
  'second-digit': 'How often each second digit 0–9 occurs, against Benford’s law.',
  'first-two-digits': 'Leading pairs 10–99 (values of 10 and more): finer than the first digit, needs more values.',
  'first-three-digits': 'Leading triples 100–999 (values of 100 and more): needs many thousands of values.',
  'last-two-digits': 'The integer part’s last two digits (values of 10 and more), against an even spread of endings (1% each).',
  'summation': 'The total amount behind each leading pair: a few large amounts stand out here.',
  'duplicates': 'The amounts that occur most often, exactly repeated.',
  'round-numbers': 'How many amounts are multiples of 10, 100 and 1,000, against what the law predicts.',
  'threshold': 'Whether amounts bunch just under a limit you give, such as an approval limit.',
}

export const CONFORMITY_LABELS: Record<Conformity, string> = {
  close: 'close conformity',
  acceptable: 'acceptable conformity',
  marginal: 'marginally acceptable conformity',
  nonconforming: 'nonconformity',
}

/** What a MAD reading says, in the words every surface prints (see shared/digits/mad.ts). */
export const READING_LABELS: Record<Reading, string> = {
  'too-few': 'too few values to read',
  'chance': 'within chance at this size',
  'deviates': 'beyond chance at this size',
  ...CONFORMITY_LABELS,
}

/** What each test leaves out as outside its range, for the exclusions row and the appendix. */
export const OUTSIDE_RANGE_RULES: Record<TestName, string> = {
  'first-digit': 'none: every non-zero value has a first digit',
  'second-digit': 'none: every non-zero value has a second digit (5 counts as 5.0)',
  'first-two-digits': 'values under 10',
  'first-three-digits': 'values under 100',
  'last-two-digits': 'values under 10',
  'summation': 'values under 10',
  'duplicates': 'none: every value counts',
  'round-numbers': 'values under 10',
  'threshold': 'values outside the ten bands around the limit',
}

/** What the distribution tests compare with. */
export function referenceOf(test: TestName): string {
  return test === 'last-two-digits' ? 'an even spread of endings' : 'Benford’s law'
}
