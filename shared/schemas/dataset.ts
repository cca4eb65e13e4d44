import { z } from './zod'
import { TEST_NAMES } from '../digits'
import { oneLine } from './text'
import { PERIODS } from '../dates/read-date'

const optionalText = (max: number) => z.string().trim().max(max).optional().transform(v => v || undefined)

/**
 * A day that exists, in years PostgreSQL's date holds: Date.parse alone takes 2026-02-30 (it rolls
 * over to March) and year 0000, which the database refused with a 500.
 */
function isCalendarDate(text: string): boolean {
  const match = /^(\d{4})-(\d{2})-(\d{2})$/.exec(text)
  if (!match) return false
  const [year, month, day] = [Number(match[1]), Number(match[2]), Number(match[3])]
  const date = new Date(Date.UTC(year, month - 1, day))
  return year >= 1 && date.getUTCFullYear() === year && date.getUTCMonth() === month - 1 && date.getUTCDate() === day
}

export const datasetUploadSchema = z.object({
  title: z.string().transform(oneLine).pipe(z.string().min(1, 'Give the dataset a title').max(200)),
  sourceNote: optionalText(2000),
  sourceUrl: z.string().trim().max(2000).optional().transform(v => v || undefined)
    .refine(v => !v || /^https?:\/\//i.test(v), 'A source link starts with http:// or https://'),
  obtainedOn: z.string().trim().optional().transform(v => v || undefined)
    .refine(v => !v || isCalendarDate(v), 'Use a date that exists, like 2026-03-31'),
  replacesId: z.string().uuid().optional().or(z.literal('').transform(() => undefined)),
  /** The sheet of a workbook to read; unset, the first visible one. */
  sheet: optionalText(31),
})
export type DatasetUpload = z.output<typeof datasetUploadSchema>

/** Another sheet of an imported workbook, read into a dataset of its own. */
export const sheetImportSchema = z.object({
  sheet: z.string().min(1).max(31),
  // One line, as an uploaded dataset's title: it is a line of the published methodology.
  title: z.string().transform(oneLine).pipe(z.string().min(1, 'Give the dataset a title').max(200)).optional(),
})

const filterColumn = z.string().min(1).max(200)
const day = z.string().refine(isCalendarDate, 'Use a date that exists, like 2026-03-31')
const textValues = z.array(z.string().max(1000)).min(1, 'Give at least one value').max(500)

/** Rows a test keeps; several filters all hold at once. Text values compare with their spaces trimmed. */
export const filterSchema = z.discriminatedUnion('op', [
  z.object({ column: filterColumn, op: z.literal('equals'), value: z.string().max(1000) }),
  z.object({ column: filterColumn, op: z.literal('one-of'), values: textValues }),
  z.object({ column: filterColumn, op: z.literal('not-one-of'), values: textValues }),
  z.object({ column: filterColumn, op: z.literal('between'), min: z.number().finite().optional(), max: z.number().finite().optional() })
    .refine(f => f.min === undefined || f.max === undefined || f.min <= f.max, { path: ['max'], message: 'The upper bound is below the lower one' }),
  z.object({ column: filterColumn, op: z.literal('dates'), from: day.optional(), to: day.optional() })
    .refine(f => !f.from || !f.to || f.from <= f.to, { path: ['to'], message: 'The end date is before the start date' }),
])
export type DatasetFilter = z.output<typeof filterSchema>
export const periodSchema = z.enum(PERIODS)

export const digitTestRequestSchema = z.object({
  column: z.string().min(1, 'Choose a number column').max(200),
  test: z.enum(TEST_NAMES),
  filters: z.array(filterSchema).max(10).optional(),
  groupBy: z.string().min(1).max(200).optional(),
  /** With groupBy naming a date column: group by its year, quarter or month instead of each date. */
  period: periodSchema.optional(),
  threshold: z.number().positive().finite().optional(),
  sign: z.enum(['positive', 'negative']).optional(),
}).refine(v => v.test !== 'threshold' || v.threshold !== undefined, { path: ['threshold'], message: 'The threshold test needs the limit, e.g. an approval limit of 10000' })
  .refine(v => !v.period || v.groupBy, { path: ['period'], message: 'A period needs a date column to group by' })
export type DigitTestRequestBody = z.output<typeof digitTestRequestSchema>

export const previewQuerySchema = z.object({
  page: z.coerce.number().int().min(1).max(1_000_000).default(1),
  sort: z.string().max(200).optional(),
  dir: z.enum(['asc', 'desc']).default('asc'),
})

const KEY_LENGTH_TESTS: Record<number, typeof TEST_NAMES[number]> = { 1: 'first-digit', 2: 'first-two-digits', 3: 'first-three-digits' }

export const drillDownQuerySchema = z.object({
  test: z.enum(TEST_NAMES).optional(),
  column: z.string().min(1).max(200),
  key: z.string().min(1).max(60),
  page: z.coerce.number().int().min(1).max(1_000_000).default(1),
  /** Rows a page: 50 unless asked; up to 5,000 for the browser's own table and downloads. */
  pageSize: z.coerce.number().int().min(1).max(5000).default(50),
  sign: z.enum(['positive', 'negative']).optional(),
  threshold: z.coerce.number().positive().finite().optional(),
  filters: z.string().max(20_000).optional()
    .transform((text, ctx) => {
      if (!text) return undefined
      try {
        return JSON.parse(text) as unknown
      }
      catch {
        ctx.addIssue({ code: 'custom', message: 'filters must be JSON' })
        return z.NEVER
      }
    })
    .pipe(z.array(filterSchema).max(10).optional()),
  groupBy: z.string().max(200).optional(),
  period: periodSchema.optional(),
  group: z.string().max(1000).optional(),
}).transform(query => ({ ...query, test: query.test ?? KEY_LENGTH_TESTS[query.key.length] ?? 'first-digit' }))
