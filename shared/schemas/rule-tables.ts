/** zod schemas of the rule-table routes, shared by the forms and the server. */
import { z } from 'zod'
import { isIsoDate } from '../rules/resolve'
import { normaliseFips, normalisePostalCode, isStateCode } from '../rules/fips'
import { ruleRowProblems, duplicateKeyProblems, normaliseRuleRow, RULE_TEXT_LIMITS, type RuleRow } from '../rules/table'
import { BUILDING_TYPES, RULE_BUILDING_TYPES, RULE_KINDS } from '../rules/variables'
import { normaliseZone } from '../rules/zones'
import { ZONE_FIELDS } from '../rules/csv'
import { JURISDICTION_KINDS } from '../types/roles'

const Id = z.coerce.number('must be a number').int('must be a whole number').positive('must be positive')
export const IdParams = z.object({ id: Id })

export const Fips = z.string('must be text').transform((value, ctx) => {
  const r = normaliseFips(value)
  if (!r.ok) { ctx.addIssue({ code: 'custom', message: r.reason }); return z.NEVER }
  if (r.warning) { ctx.addIssue({ code: 'custom', message: `must keep its leading zero: ${r.warning}` }); return z.NEVER }
  return r.fips
})
export const FipsParams = z.object({ id: Id, fips: Fips })

export const IsoDate = z.string('must be a date').refine(isIsoDate, 'must be a date written YYYY-MM-DD')
const Text = (max: number) => z.string('must be text').trim().max(max, `must be at most ${max} characters`)
const Required = (max: number) => Text(max).min(1, 'is required')

export const ClimateZoneText = z.string('must be text').transform((value, ctx) => {
  const r = normaliseZone(value)
  if (!r.ok) { ctx.addIssue({ code: 'custom', message: r.reason }); return z.NEVER }
  return r.zone
})

const StateCode = z.string('must be text').trim().toUpperCase().refine(isStateCode, 'must be a USPS state code such as WA')

// ─── Zone maps ───
export const ZoneMapBody = z.strictObject({
  name: Required(120),
  edition: Text(60).default(''),
  source: Text(500).default(''),
})

export const ZoneCountyBody = z.strictObject({
  zone: ClimateZoneText,
  countyName: Text(100).nullable().optional(),
  stateCode: StateCode.nullable().optional(),
})

export const IMPORT_MODES = ['replace', 'merge'] as const
export const ZoneColumnsSchema = z.strictObject(Object.fromEntries(ZONE_FIELDS.map(f => [f, z.string().max(200).optional()])) as Record<(typeof ZONE_FIELDS)[number], z.ZodOptional<z.ZodString>>)

export const ZoneImportBody = z.strictObject({
  mode: z.enum(IMPORT_MODES, 'must be replace or merge'),
  csv: z.string('must be the CSV text').min(1, 'is empty'),
  columns: ZoneColumnsSchema.optional(),
})
export const LimitsImportBody = z.strictObject({
  mode: z.enum(IMPORT_MODES, 'must be replace or merge'),
  csv: z.string('must be the CSV text').min(1, 'is empty'),
})
export const ImportQuery = z.object({ mode: z.enum(IMPORT_MODES, 'must be replace or merge').default('merge') })

// ─── Rule sets ───
export const RuleSetBody = z.strictObject({
  name: Required(120),
  code: Required(60),
  edition: Required(40),
  description: Text(1000).default(''),
})

const LogicSchema = z.record(z.string(), z.unknown(), 'must be a json-logic object')

export const RuleRowSchema = z.strictObject({
  key: z.string('must be text').trim(),
  zones: z.string('must be text').trim(),
  buildingType: z.enum(RULE_BUILDING_TYPES, 'must be any, detached or attached'),
  kind: z.enum(RULE_KINDS, 'must be limit or advisory'),
  logic: LogicSchema,
  summary: z.string('must be text').default(''),
  citationCode: z.string('must be text'),
  citationEdition: z.string('must be text'),
  citationSection: z.string('must be text'),
  notes: z.string('must be text').default(''),
}).transform((row, ctx) => {
  const rule = row as RuleRow
  for (const p of ruleRowProblems(rule)) {
    ctx.addIssue({ code: 'custom', path: p.field.split('.').slice(0, 1), message: p.field.includes('.') ? `${p.field.slice(p.field.indexOf('.') + 1)}: ${p.reason}` : p.reason })
  }
  return normaliseRuleRow(rule)
})

export const DraftBody = z.strictObject({
  rules: z.array(RuleRowSchema).max(500, 'a rule set holds at most 500 rules'),
  /** The draft revision the editor started from; a newer draft on the server → 409. */
  baseRevision: z.number().int().nonnegative().optional(),
}).superRefine((body, ctx) => {
  for (const d of duplicateKeyProblems(body.rules)) ctx.addIssue({ code: 'custom', path: ['rules', d.index, 'key'], message: d.reason })
})

export const PublishBody = z.strictObject({
  note: Required(500),
})

const VersionRef = z.union([z.literal('draft'), z.coerce.number().int().positive()], 'must be a version number or "draft"')
export const DiffQuery = z.object({ from: VersionRef, to: VersionRef.default('draft') })
export const ExportQuery = z.object({ version: VersionRef.default('draft') })
export const VersionParams = z.object({ id: Id, number: z.coerce.number('must be a number').int().positive('must be positive') })

// ─── Jurisdictions ───
export const JurisdictionBody = z.strictObject({
  name: Required(120),
  kind: z.enum(JURISDICTION_KINDS, 'must be state, county, city or program'),
  stateCode: StateCode,
  contactEmail: z.string().trim().toLowerCase().pipe(z.email('must be an e-mail address').max(254)).nullable().optional(),
  zoneMapId: z.number().int().positive().nullable().optional(),
  notes: Text(2000).default(''),
})

export const CoverageBody = z.strictObject({
  counties: z.array(Fips).max(5000, 'at most 5,000 counties'),
  postalCodes: z.array(z.string().transform((value, ctx) => {
    const r = normalisePostalCode(value)
    if (!r.ok) { ctx.addIssue({ code: 'custom', message: r.reason }); return z.NEVER }
    return r.postalCode
  })).max(5000, 'at most 5,000 postal codes').default([]),
})

export const EditionBody = z.strictObject({
  name: Required(120),
  ruleSetId: z.number('must be a rule set id').int().positive(),
  zoneMapId: z.number().int().positive().nullable().optional(),
  effectiveFrom: IsoDate,
  effectiveUntil: IsoDate.nullable().optional(),
  notes: Text(2000).default(''),
}).superRefine((e, ctx) => {
  if (e.effectiveUntil && e.effectiveUntil < e.effectiveFrom) ctx.addIssue({ code: 'custom', path: ['effectiveUntil'], message: 'must be on or after effectiveFrom' })
})

// ─── Resolving ───
export const ResolveQuery = z.object({
  jurisdictionId: z.coerce.number().int().positive().optional(),
  stateCode: StateCode.optional(),
  countyFips: Fips.optional(),
  postalCode: z.string().regex(/^\d{5}$/, 'must be 5 digits').optional(),
  permitDate: IsoDate,
  buildingType: z.enum(BUILDING_TYPES, 'must be detached or attached'),
}).refine(q => q.jurisdictionId !== undefined || q.countyFips !== undefined || q.postalCode !== undefined, { message: 'give jurisdictionId, countyFips or postalCode', path: ['countyFips'] })

export const AuditQuery = z.object({
  entityType: z.enum(['zone-map', 'rule-set', 'jurisdiction'], 'must be zone-map, rule-set or jurisdiction').optional(),
  entityId: z.coerce.number().int().positive().optional(),
  limit: z.coerce.number().int().min(1).max(500).default(100),
})

export { RULE_TEXT_LIMITS }
