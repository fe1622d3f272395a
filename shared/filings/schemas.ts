/** Bodies and queries of the project, test and filing routes (zod 4), shared with the forms. */
import { z } from 'zod'
import { AddressSchema } from '../checks/schema'
import { VERDICTS } from '../checks/verdicts'
import { MAX_READINGS, baselineShape, buildingShape, checkTestReadings, readingShape, testDirectionSchema, unitSystemSchema } from '../leakage/schema'
import { isIsoDate } from '../rules/resolve'
import { BUILDING_TYPES } from '../rules/variables'
import { SAFETY_CHECK_IDS, TEST_STAGES, WIND_CONDITIONS } from './constants'
import { FILING_STATES } from './states'

const text = (max: number) => z.string({ error: 'must be text' }).trim().max(max, `must be at most ${max} characters`)
const isoDate = z.string({ error: 'is required (YYYY-MM-DD)' }).refine(isIsoDate, 'must be a real date written YYYY-MM-DD')
const finite = z.number({ error: 'must be a finite number' })
const positive = finite.positive('must be greater than zero')

export const ProjectBody = z.strictObject({
  address: AddressSchema,
  permitNumber: text(60).min(1, 'is required'),
  permitDate: isoDate,
  builderCompany: text(120).default(''),
  builderContact: text(200).default(''),
  buildingType: z.enum(BUILDING_TYPES, { error: 'must be "detached" or "attached"' }),
  units: unitSystemSchema,
  building: buildingShape,
  /** Only when a county is shared by several jurisdictions: which one. */
  jurisdictionId: z.number().int().positive().nullable().optional(),
  notes: text(4000).default(''),
})
export type ProjectBody = z.output<typeof ProjectBody>
export type ProjectBodyInput = z.input<typeof ProjectBody>

export const TestBody = z.strictObject({
  testedOn: isoDate,
  stage: z.enum(TEST_STAGES, { error: 'must be rough-in, final or retest' }),
  tester: text(120).default(''),
  equipment: text(500).default(''),
  wind: z.enum(WIND_CONDITIONS, { error: 'must be calm, light or gusty' }),
  insideTemperature: finite.nullable().optional(),
  outsideTemperature: finite.nullable().optional(),
  direction: testDirectionSchema,
  baseline: baselineShape.optional(),
  // Empty until the readings are typed or imported from a file.
  readings: z.array(readingShape, { error: 'must be a list' }).max(MAX_READINGS, `at most ${MAX_READINGS} readings are accepted`).default([]),
  assumedExponent: finite.min(0.4, 'must be between 0.4 and 1.0').max(1, 'must be between 0.4 and 1.0').nullable().optional(),
  safety: z.array(z.enum(SAFETY_CHECK_IDS, { error: `must be one of ${SAFETY_CHECK_IDS.join(', ')}` })).max(SAFETY_CHECK_IDS.length).default([]),
  statedCfm50: positive.nullable().optional(),
  statedAch50: positive.nullable().optional(),
  notes: text(4000).default(''),
}).superRefine((value, ctx) => {
  if (value.readings.length > 0) checkTestReadings({ ...value, insideTemperature: undefined, outsideTemperature: undefined, assumedExponent: undefined }, ctx)
})
export type TestBody = z.output<typeof TestBody>
export type TestBodyInput = z.input<typeof TestBody>

export const ReadingsImportBody = z.strictObject({
  uploadId: z.number().int().positive(),
  pressureColumn: z.number().int('must be a whole number').min(0, 'must be 0 or more'),
  flowColumn: z.number().int('must be a whole number').min(0, 'must be 0 or more'),
  hasHeader: z.boolean(),
  flipSign: z.boolean().default(false),
})

export const FilingNoteBody = z.strictObject({ note: text(2000).default('') })

export const DecisionBody = z.strictObject({
  decision: z.enum(['accept', 'return'], { error: 'must be "accept" or "return"' }),
  reason: text(4000).default(''),
  /** The filing version the reviewer saw: a decision on a changed filing is refused (409). */
  version: z.number({ error: 'is required (the version you saw)' }).int().positive(),
}).superRefine((value, ctx) => {
  if (value.decision === 'return' && value.reason === '') ctx.addIssue({ code: 'custom', path: ['reason'], message: 'is required when returning a filing: say what the rater must change' })
})

export const TakeUpBody = z.strictObject({ version: z.number({ error: 'is required (the version you saw)' }).int().positive() })

export const CommentBody = z.strictObject({ body: text(4000).min(1, 'is required') })

export const QUEUE_SORTS = ['submittedAt', 'permitDate', 'address', 'ach50', 'status', 'verdict', 'rater', 'zone'] as const
export type QueueSort = (typeof QUEUE_SORTS)[number]
export const MAX_PAGE_SIZE = 100

const csvList = <T extends readonly [string, ...string[]]>(values: T, what: string) => z.string().transform(s => s.split(',').map(v => v.trim()).filter(Boolean))
  .pipe(z.array(z.enum(values, { error: `must be ${what}` })))

export const QueueQuery = z.object({
  status: csvList(FILING_STATES, `one or more of ${FILING_STATES.join(', ')}`).optional(),
  verdict: csvList(VERDICTS, `one or more of ${VERDICTS.join(', ')}`).optional(),
  zone: z.string().trim().toUpperCase().regex(/^[1-8][ABC]?$/, 'must be a climate zone such as 5B').optional(),
  raterId: z.coerce.number('must be a number').int().positive().optional(),
  jurisdictionId: z.coerce.number('must be a number').int().positive().optional(),
  from: isoDate.optional(),
  to: isoDate.optional(),
  q: z.string().trim().max(100, 'must be at most 100 characters').optional(),
  sort: z.enum(QUEUE_SORTS, { error: `must be one of ${QUEUE_SORTS.join(', ')}` }).default('submittedAt'),
  dir: z.enum(['asc', 'desc'], { error: 'must be asc or desc' }).default('desc'),
  page: z.coerce.number('must be a number').int('must be a whole number').min(1, 'must be 1 or more').max(100_000).default(1),
  pageSize: z.coerce.number('must be a number').int('must be a whole number').min(1, 'must be 1 or more').max(MAX_PAGE_SIZE, `must be at most ${MAX_PAGE_SIZE}`).default(25),
})
export type QueueQuery = z.output<typeof QueueQuery>

/** Verification codes: 16 characters of RFC 4648 base32 (80 random bits), shown in groups of four. */
export const VERIFY_CODE = /^[A-Z2-7]{16}$/
export function normaliseCode(code: string): string {
  return code.toUpperCase().replace(/[\s-]/g, '')
}
export function groupCode(code: string): string {
  return code.replace(/(.{4})(?=.)/g, '$1-')
}
