import { MAD_RANGES, MAD_RANGES_FROM } from '../digits'
import type { DistributionTest, TestResult } from '../digits'
import { describeFilters, describeGrouping } from '../charts/filters'
import { OUTSIDE_RANGE_RULES, READING_LABELS, TEST_DESCRIPTIONS, TEST_LABELS } from '../charts/labels'
import { formatP } from '../charts/p-value'
import type { AnalysisSettings } from '../types/investigation'
import type { DatasetFingerprint, PublishedChecks } from '../types/publication'
import { oneLine } from '../schemas/text'
import { formatDate } from '../format/dates'

export interface AppendixAnalysis {
  settings: AnalysisSettings
  result: TestResult | null
}

const count = (n: number) => n.toLocaleString('en-GB')

function excluded(result: TestResult): string {
  const e = result.excluded
  const parts = [
    e.blank && `${count(e.blank)} blank`, e.unreadable && `${count(e.unreadable)} unreadable`, e.zero && `${count(e.zero)} zero`,
    e.negative && `${count(e.negative)} negative (tested apart)`, e.positive && `${count(e.positive)} positive (tested apart)`,
    e.belowMinimum && `${count(e.belowMinimum)} outside the test's range (${OUTSIDE_RANGE_RULES[result.test]})`,
  ].filter(Boolean)
  return parts.length ? parts.join(', ') : 'none'
}

function ranges(test: DistributionTest): string | null {
  const r = MAD_RANGES[test]
  return r ? `MAD up to ${r[0]} close, up to ${r[1]} acceptable, up to ${r[2]} marginally acceptable conformity, above that nonconformity (Nigrini 2012, *Benford's Law*, Wiley), read only from ${count(MAD_RANGES_FROM[test]!)} values, where a sample that follows the law falls in the close range at least 99% of the time; below that the reading says only whether the departure is more than chance explains (chi-square p < 0.01)` : null
}

function analysisSection(index: number, { settings, result }: AppendixAnalysis, datasets: Map<string, DatasetFingerprint>): string {
  const test = settings.test
  const dataset = settings.datasetId ? datasets.get(settings.datasetId) : undefined
  const column = settings.column && oneLine(settings.column)
  const lines = [`### ${index}. ${test ? TEST_LABELS[test] : 'Analysis'}${column ? ` of “${column}”` : ''}`, '']
  if (test) lines.push(TEST_DESCRIPTIONS[test], '')
  if (dataset) lines.push(`- Dataset: ${oneLine(dataset.title)} (${oneLine(dataset.originalName)}, SHA-256 \`${dataset.sha256}\`, ${dataset.rowCount === null ? '?' : count(dataset.rowCount)} rows)`)
  if (settings.filters?.length) lines.push(`- Rows: only where ${oneLine(describeFilters(settings.filters) ?? '')}`)
  if (settings.groupBy) lines.push(`- Groups: one test per ${oneLine((settings.period ? describeGrouping(settings.groupBy, settings.period) : null) ?? `value of “${settings.groupBy}”`)}, ranked by ${test === 'summation' ? 'MAD × √n' : 'chi-square p'} so that small groups do not rise by chance alone, with Benjamini–Hochberg q-values for testing many groups at once (Benjamini & Hochberg 1995); each group's reading uses its q (under 0.05 to read as a departure)`)
  if (settings.threshold) lines.push(`- Limit: ${count(settings.threshold)}; ten bands of a twentieth of the limit around it. The two beside the limit are compared with a straight line through the outer eight, allowing for the scatter those eight show around it (quasi-Poisson; McCullagh & Nelder 1989)`)
  lines.push(`- Amounts tested: ${settings.sign === 'negative' ? 'negative' : 'positive'}`)
  if (result) {
    lines.push(`- Values tested (n): ${count(result.n)}; left out: ${excluded(result)}`)
    if (result.chiSquare) lines.push(`- Chi-square ${result.chiSquare.statistic.toFixed(2)} with ${result.chiSquare.df} degrees of freedom, ${formatP(result.chiSquare.p)}`)
    if (result.mad) lines.push(`- MAD ${result.mad.value.toFixed(5)}${result.mad.reading ? `, ${READING_LABELS[result.mad.reading]}` : ''}${result.mad.expected !== null ? `; a conforming sample of this size averages ${result.mad.expected.toFixed(5)}` : ''}`)
    const t = result.threshold
    if (t?.excess !== undefined) lines.push(`- Just under the limit: ${count(t.below)} against ${t.expectedBelow.toFixed(1)} predicted, an excess of ${t.excess.toFixed(1)} (95% interval ${t.excessLow.toFixed(1)} to ${t.excessHigh.toFixed(1)}); an excess at least this large turns up where no limit acts with ${formatP(t.pBunching)} under that model`)
    if (result.ks) lines.push(`- Kolmogorov–Smirnov D ${result.ks.d.toFixed(4)} against a 5% critical value of ${result.ks.critical.toFixed(4)} (1.36/√n; Massey 1951)`)
    for (const finding of result.suitability) lines.push(`- Suitability (${finding.severity}): ${finding.message}`)
  }
  const rangeText = test && test in MAD_RANGES ? ranges(test as DistributionTest) : null
  if (rangeText) lines.push(`- Conformity ranges: ${rangeText}`)
  return lines.join('\n')
}

/** What the record shows was done before publication, and nothing more. */
export interface PublicationRecord {
  checks: PublishedChecks
  /** The publisher confirmed, in so many words, that every deviation was followed up. */
  followUpConfirmed: boolean
}

const of = (done: number, total: number, one: string, many: string) => `${count(done)} of ${count(total)} ${total === 1 ? one : many}`

function checksSection({ checks, followUpConfirmed }: PublicationRecord): string[] {
  const { methods, claims } = checks
  const lines = [
    '## Checks before publication',
    '',
    `- Method: ${of(methods.approved, methods.total, 'analysis', 'analyses')} approved in the newsroom’s method review.`,
    `- Claims: ${of(claims.verified, claims.total, 'marked claim', 'marked claims')} verified in the newsroom’s fact-check${claims.disputed ? `; ${count(claims.disputed)} published while disputed` : ''}. Only verified passages are marked in the text; verifying a claim locked its words.`,
  ]
  if (checks.independent && (methods.approved || claims.verified)) lines.push('- Each approval and verification was made by someone other than the person who created the analysis block or marked the claim.')
  if (followUpConfirmed) lines.push('- The newsroom confirmed at publication that every deviation reported here was followed up in the records and with the people and organisations concerned.')
  return [...lines, '']
}

/**
 * The methodology appendix of a published investigation, in Markdown: what each test did, on
 * which exact file, what was left out, which thresholds were used and where they come from, the
 * checks the record shows, and the limits of the method. It states only what `record` shows.
 */
export function methodologyAppendix(title: string, analyses: AppendixAnalysis[], datasets: DatasetFingerprint[], record: PublicationRecord): string {
  const byId = new Map(datasets.map(d => [d.id, d]))
  return [
    `# Methodology: ${oneLine(title)}`,
    '',
    '## What these tests can and cannot say',
    '',
    'Benford’s law describes how often each leading digit appears in many collections of naturally occurring amounts: a 1 leads about 30% of the time, a 9 under 5% (Benford 1938; Hill 1995). The tests below compare the amounts in the datasets with that pattern and with related expectations. A digit test is a screen, not proof: a deviation says where to look, never that anything is wrong. Rounding rules, price lists, caps, fees and many ordinary business practices make honest data deviate. The newsroom’s legal review applies before anyone is named.',
    '',
    ...checksSection(record),
    '',
    '## Statistics used',
    '',
    '- Each bin’s count is compared with the count the law expects at this sample size; the chart’s band is the range a conforming sample of this size shows 95% of the time (binomial).',
    '- Z per bin with a continuity correction (Nigrini 2012, after Fleiss 1981); |Z| above 1.96 is unusual at the 5% level, one bin at a time.',
    '- Chi-square over all bins; at large n it flags even tiny, harmless departures, which is why the MAD is reported beside it.',
    '- Mean absolute deviation (MAD) and the MAD a conforming sample of this size shows on average (Barney & Schulzke 2016). The published conformity ranges (Nigrini 2012) are read only where the sample is large enough for them to mean what they say; below that size the reading says whether the departure is more than chance explains (chi-square p < 0.01), and below the test’s minimum it says there are too few values to read.',
    '- Every p-value is the chance, under the stated model, of a departure at least as large as the one seen; it is not the chance that the data are honest. Values below 1e-300 are given as “p < 1e-300”.',
    '',
    '## The analyses',
    '',
    ...analyses.map((analysis, i) => `${analysisSection(i + 1, analysis, byId)}\n`),
    '## Datasets',
    '',
    // Titles, file names and notes come from people: each stays on its list item's one line.
    ...datasets.map(d => `- **${oneLine(d.title)}** — ${oneLine(d.originalName)}; SHA-256 \`${d.sha256}\`; ${d.rowCount === null ? '?' : count(d.rowCount)} rows${d.period ? `; dated ${formatDate(d.period.from)} to ${formatDate(d.period.to)} (“${oneLine(d.period.column)}”)` : ''}; obtained ${d.obtainedOn ? formatDate(d.obtainedOn) : 'on an unrecorded date'}${d.sourceUrl ? `; source ${oneLine(d.sourceUrl)}` : ''}${d.sourceNote ? `. ${oneLine(d.sourceNote)}` : ''}`),
    '',
  ].join('\n')
}
