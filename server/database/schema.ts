import { sql } from 'drizzle-orm'
import { type AnySQLiteColumn, index, integer, primaryKey, real, sqliteTable, text, uniqueIndex } from 'drizzle-orm/sqlite-core'
import { JURISDICTION_KINDS, ROLES } from '../../shared/types/roles'
import { BUILDING_TYPES, RULE_BUILDING_TYPES, RULE_KINDS } from '../../shared/rules/variables'
import { VERDICTS } from '../../shared/checks/verdicts'

const timestamps = {
  createdAt: integer({ mode: 'timestamp_ms' }).notNull().$defaultFn(() => new Date()),
  updatedAt: integer({ mode: 'timestamp_ms' }).notNull().$defaultFn(() => new Date()).$onUpdateFn(() => new Date()),
}

/** An authority having jurisdiction (AHJ). */
export const jurisdictions = sqliteTable('jurisdictions', {
  id: integer().primaryKey({ autoIncrement: true }),
  name: text().notNull(),
  kind: text({ enum: JURISDICTION_KINDS }).notNull(),
  stateCode: text().notNull(),
  contactEmail: text(),
  /** The zone map its editions use unless an edition names its own. */
  zoneMapId: integer().references((): AnySQLiteColumn => zoneMaps.id, { onDelete: 'restrict' }),
  notes: text().notNull().default(''),
  ...timestamps,
}, t => [uniqueIndex('jurisdictions_name_unique').on(t.name), index('jurisdictions_zone_map_idx').on(t.zoneMapId)])

/** What a jurisdiction covers: counties by FIPS (5 digits as text). */
export const jurisdictionCounties = sqliteTable('jurisdiction_counties', {
  jurisdictionId: integer().notNull().references(() => jurisdictions.id, { onDelete: 'cascade' }),
  countyFips: text().notNull(),
}, t => [primaryKey({ columns: [t.jurisdictionId, t.countyFips] }), index('jurisdiction_counties_fips_idx').on(t.countyFips)])

/** Optional: postal codes a jurisdiction covers (a city inside a county). */
export const jurisdictionPostalCodes = sqliteTable('jurisdiction_postal_codes', {
  jurisdictionId: integer().notNull().references(() => jurisdictions.id, { onDelete: 'cascade' }),
  postalCode: text().notNull(),
}, t => [primaryKey({ columns: [t.jurisdictionId, t.postalCode] }), index('jurisdiction_postal_codes_code_idx').on(t.postalCode)])

/**
 * A named climate-zone map (e.g. the 2021-edition map and the older one). Edited in place, every
 * change audited; `revision` counts changes so a check can record which state of the map it used.
 */
export const zoneMaps = sqliteTable('zone_maps', {
  id: integer().primaryKey({ autoIncrement: true }),
  name: text().notNull(),
  /** Which code edition's map this is, e.g. "IECC 2021". */
  edition: text().notNull().default(''),
  /** Where the admin took it from (data set, date). */
  source: text().notNull().default(''),
  revision: integer().notNull().default(0),
  ...timestamps,
}, t => [uniqueIndex('zone_maps_name_unique').on(t.name)])

/** County FIPS → climate zone, one row per county per map. */
export const zoneMapCounties = sqliteTable('zone_map_counties', {
  zoneMapId: integer().notNull().references(() => zoneMaps.id, { onDelete: 'cascade' }),
  countyFips: text().notNull(),
  zone: text().notNull(),
  countyName: text(),
  stateCode: text(),
}, t => [primaryKey({ columns: [t.zoneMapId, t.countyFips] })])

/**
 * A limits table for one code edition (e.g. "IECC 2015 air leakage"). Admins edit the draft
 * (`draftRules`); publishing freezes it into an immutable `ruleSetVersions` row.
 */
export const ruleSets = sqliteTable('rule_sets', {
  id: integer().primaryKey({ autoIncrement: true }),
  name: text().notNull(),
  /** The code, e.g. "IECC", "IRC", a program name. */
  code: text().notNull(),
  /** The edition, e.g. "2015". */
  edition: text().notNull(),
  description: text().notNull().default(''),
  /** Counts draft saves, so two admins cannot overwrite each other's draft unknowingly. */
  draftRevision: integer().notNull().default(0),
  ...timestamps,
}, t => [uniqueIndex('rule_sets_name_unique').on(t.name)])

/** The editable draft of a rule set: one row per rule. */
export const draftRules = sqliteTable('draft_rules', {
  id: integer().primaryKey({ autoIncrement: true }),
  ruleSetId: integer().notNull().references(() => ruleSets.id, { onDelete: 'cascade' }),
  key: text().notNull(),
  position: integer().notNull(),
  zones: text().notNull(),
  buildingType: text({ enum: RULE_BUILDING_TYPES }).notNull(),
  kind: text({ enum: RULE_KINDS }).notNull(),
  /** json-logic as JSON text. */
  logic: text().notNull(),
  summary: text().notNull().default(''),
  citationCode: text().notNull(),
  citationEdition: text().notNull(),
  citationSection: text().notNull(),
  notes: text().notNull().default(''),
}, t => [uniqueIndex('draft_rules_set_key_unique').on(t.ruleSetId, t.key), index('draft_rules_set_position_idx').on(t.ruleSetId, t.position)])

/**
 * A published version: the rules frozen as JSON (an array of RuleRow). Never updated or deleted;
 * checks record the id of the version that decided them.
 */
export const ruleSetVersions = sqliteTable('rule_set_versions', {
  id: integer().primaryKey({ autoIncrement: true }),
  ruleSetId: integer().notNull().references(() => ruleSets.id, { onDelete: 'restrict' }),
  number: integer().notNull(),
  note: text().notNull(),
  rules: text().notNull(),
  publishedById: integer().references(() => users.id, { onDelete: 'set null' }),
  /** Frozen with the version, so it reads the same after the account changes. */
  publishedByName: text().notNull(),
  publishedAt: integer({ mode: 'timestamp_ms' }).notNull().$defaultFn(() => new Date()),
}, t => [uniqueIndex('rule_set_versions_set_number_unique').on(t.ruleSetId, t.number)])

/**
 * A code edition a jurisdiction adopted, in force from `effectiveFrom` to `effectiveUntil`
 * (inclusive ISO dates; no end = still in force). Its limits come from a rule set, its zones from
 * its own zone map or else the jurisdiction's.
 */
export const adoptedEditions = sqliteTable('adopted_editions', {
  id: integer().primaryKey({ autoIncrement: true }),
  jurisdictionId: integer().notNull().references(() => jurisdictions.id, { onDelete: 'cascade' }),
  name: text().notNull(),
  ruleSetId: integer().notNull().references(() => ruleSets.id, { onDelete: 'restrict' }),
  zoneMapId: integer().references(() => zoneMaps.id, { onDelete: 'restrict' }),
  effectiveFrom: text().notNull(),
  effectiveUntil: text(),
  notes: text().notNull().default(''),
  ...timestamps,
}, t => [index('adopted_editions_jurisdiction_idx').on(t.jurisdictionId, t.effectiveFrom), index('adopted_editions_rule_set_idx').on(t.ruleSetId), index('adopted_editions_zone_map_idx').on(t.zoneMapId)])

/** Every change to the rule tables: who, when, what, before and after (JSON). */
export const auditLog = sqliteTable('audit_log', {
  id: integer().primaryKey({ autoIncrement: true }),
  at: integer({ mode: 'timestamp_ms' }).notNull().$defaultFn(() => new Date()),
  userId: integer().references(() => users.id, { onDelete: 'set null' }),
  userName: text().notNull(),
  action: text().notNull(),
  entityType: text().notNull(),
  entityId: integer().notNull(),
  summary: text().notNull(),
  before: text(),
  after: text(),
}, t => [index('audit_log_entity_idx').on(t.entityType, t.entityId, t.at), index('audit_log_at_idx').on(t.at)])

/**
 * One row (id 1): a counter bumped in the same transaction as every change to jurisdictions,
 * coverage, editions, zone maps and published versions. Each server process compares it with the
 * generation its in-memory rulebook was built from (server/utils/rulebook.ts).
 */
export const rulebookState = sqliteTable('rulebook_state', {
  id: integer().primaryKey(),
  generation: integer().notNull(),
})

export const users = sqliteTable('users', {
  id: integer().primaryKey({ autoIncrement: true }),
  // Stored lower-cased; the unique index on lower(email) guards against a writer that forgets.
  email: text().notNull(),
  name: text().notNull(),
  passwordHash: text().notNull(),
  role: text({ enum: ROLES }).notNull(),
  active: integer({ mode: 'boolean' }).notNull().default(true),
  jurisdictionId: integer().references(() => jurisdictions.id, { onDelete: 'set null' }),
  ...timestamps,
}, t => [
  uniqueIndex('users_email_unique').on(sql`lower(${t.email})`),
  index('users_jurisdiction_idx').on(t.jurisdictionId),
])

/**
 * Failed sign-in attempts, one row each, keyed by "email:<address>" and "ip:<address>".
 * Kept in the database so that several server processes share one limit.
 */
export const signInFailures = sqliteTable('sign_in_failures', {
  id: integer().primaryKey({ autoIncrement: true }),
  key: text().notNull(),
  at: integer().notNull(),
}, t => [index('sign_in_failures_key_at_idx').on(t.key, t.at)])

export type UserRow = typeof users.$inferSelect
export type NewUserRow = typeof users.$inferInsert
export type JurisdictionRow = typeof jurisdictions.$inferSelect
export type ZoneMapRow = typeof zoneMaps.$inferSelect
export type ZoneMapCountyRow = typeof zoneMapCounties.$inferSelect
export type RuleSetRow = typeof ruleSets.$inferSelect
export type DraftRuleRow = typeof draftRules.$inferSelect
export type RuleSetVersionRow = typeof ruleSetVersions.$inferSelect
export type AdoptedEditionRow = typeof adoptedEditions.$inferSelect
export type AuditRow = typeof auditLog.$inferSelect

/**
 * A self-check: inputs, the whole answer and the rule-set version that decided, as run.
 * The columns beside the JSON serve the "My checks" list and later queries.
 */
export const checks = sqliteTable('checks', {
  id: integer().primaryKey({ autoIncrement: true }),
  userId: integer().notNull().references(() => users.id, { onDelete: 'cascade' }),
  createdAt: integer({ mode: 'timestamp_ms' }).notNull().$defaultFn(() => new Date()),
  verdict: text({ enum: VERDICTS }).notNull(),
  jurisdictionId: integer().references(() => jurisdictions.id, { onDelete: 'set null' }),
  ruleSetVersionId: integer().references(() => ruleSetVersions.id, { onDelete: 'restrict' }),
  zone: text(),
  countyFips: text(),
  addressLine: text().notNull(),
  city: text().notNull(),
  stateCode: text().notNull(),
  postalCode: text().notNull(),
  permitDate: text().notNull(),
  buildingType: text({ enum: BUILDING_TYPES }).notNull(),
  cfm50: real().notNull(),
  ach50: real().notNull(),
  /** The validated request body, JSON. */
  request: text().notNull(),
  /** The answer as given (without its id), JSON. */
  response: text().notNull(),
}, t => [index('checks_user_idx').on(t.userId, t.id)])

export type CheckRow = typeof checks.$inferSelect
