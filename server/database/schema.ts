import { sql } from 'drizzle-orm'
import { type AnySQLiteColumn, index, integer, primaryKey, real, sqliteTable, text, uniqueIndex } from 'drizzle-orm/sqlite-core'
import { JURISDICTION_KINDS, ROLES } from '../../shared/types/roles'
import { BUILDING_TYPES, RULE_BUILDING_TYPES, RULE_KINDS } from '../../shared/rules/variables'
import { VERDICTS } from '../../shared/checks/verdicts'
import { MAIL_KINDS, MAIL_STATUSES, TEST_STAGES, UPLOAD_KINDS, WIND_CONDITIONS } from '../../shared/filings/constants'
import { FILING_ACTIONS, FILING_STATES } from '../../shared/filings/states'

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

/**
 * A house a rater tests over time (rough-in, final, retests). Address and permit decide the
 * rules; the building's geometry is in the project's units (ft/ft²/ft³ or m/m²/m³).
 */
export const projects = sqliteTable('projects', {
  id: integer().primaryKey({ autoIncrement: true }),
  ownerId: integer().notNull().references(() => users.id, { onDelete: 'restrict' }),
  /** Chosen by the rater only when several jurisdictions cover the county. */
  jurisdictionId: integer().references(() => jurisdictions.id, { onDelete: 'set null' }),
  addressLine: text().notNull(),
  city: text().notNull(),
  stateCode: text().notNull(),
  postalCode: text().notNull(),
  countyFips: text().notNull(),
  permitNumber: text().notNull(),
  permitDate: text().notNull(),
  builderCompany: text().notNull().default(''),
  builderContact: text().notNull().default(''),
  buildingType: text({ enum: BUILDING_TYPES }).notNull(),
  units: text({ enum: ['ip', 'si'] }).notNull(),
  volume: real().notNull(),
  floorArea: real(),
  enclosureArea: real(),
  height: real(),
  notes: text().notNull().default(''),
  ...timestamps,
}, t => [index('projects_owner_idx').on(t.ownerId, t.updatedAt)])

/** One blower-door test of a project, with its stored check (verdict, metrics, rule version). */
export const testRecords = sqliteTable('test_records', {
  id: integer().primaryKey({ autoIncrement: true }),
  projectId: integer().notNull().references(() => projects.id, { onDelete: 'cascade' }),
  testedOn: text().notNull(),
  stage: text({ enum: TEST_STAGES }).notNull(),
  tester: text().notNull().default(''),
  equipment: text().notNull().default(''),
  wind: text({ enum: WIND_CONDITIONS }).notNull(),
  insideTemperature: real(),
  outsideTemperature: real(),
  direction: text({ enum: ['depressurization', 'pressurization'] }).notNull(),
  baselineBefore: real(),
  baselineAfter: real(),
  /** [{ pressure, flow }] as JSON, in the project's units. */
  readings: text().notNull().default('[]'),
  assumedExponent: real(),
  /** The safety checklist ids ticked, JSON. */
  safety: text().notNull().default('[]'),
  statedCfm50: real(),
  statedAch50: real(),
  notes: text().notNull().default(''),
  // The stored check of the current readings (null without readings or when it could not run).
  verdict: text({ enum: VERDICTS }),
  cfm50: real(),
  ach50: real(),
  ruleSetVersionId: integer().references(() => ruleSetVersions.id, { onDelete: 'restrict' }),
  checkedAt: integer({ mode: 'timestamp_ms' }),
  /** The whole CheckResponse, JSON. */
  check: text(),
  checkProblem: text(),
  ...timestamps,
}, t => [index('test_records_project_idx').on(t.projectId, t.testedOn)])

/**
 * A test filed with its jurisdiction. `version` counts every change of state: a decision names
 * the version it was made on, and a conditional UPDATE refuses it when the filing moved (409).
 * The columns after `revision` copy the current revision's key figures for the review queue, so
 * the queue sorts and filters on indexed columns of this one table.
 */
export const filings = sqliteTable('filings', {
  id: integer().primaryKey({ autoIncrement: true }),
  testId: integer().notNull().references(() => testRecords.id, { onDelete: 'restrict' }),
  projectId: integer().notNull().references(() => projects.id, { onDelete: 'restrict' }),
  raterId: integer().notNull().references(() => users.id, { onDelete: 'restrict' }),
  jurisdictionId: integer().notNull().references(() => jurisdictions.id, { onDelete: 'restrict' }),
  status: text({ enum: FILING_STATES }).notNull(),
  version: integer().notNull().default(1),
  /** Set by each state change; the rows written with it (transition, revision, mail) carry a guard on it. */
  changeToken: text().notNull(),
  revision: integer().notNull().default(0),
  reviewerId: integer().references(() => users.id, { onDelete: 'set null' }),
  reviewerName: text(),
  returnReason: text(),
  firstSubmittedAt: integer({ mode: 'timestamp_ms' }),
  submittedAt: integer({ mode: 'timestamp_ms' }),
  decidedAt: integer({ mode: 'timestamp_ms' }),
  addressLine: text().notNull(),
  city: text().notNull(),
  permitNumber: text().notNull(),
  permitDate: text().notNull(),
  raterName: text().notNull(),
  stage: text({ enum: TEST_STAGES }).notNull(),
  testedOn: text().notNull(),
  zone: text(),
  verdict: text({ enum: VERDICTS }),
  cfm50: real(),
  ach50: real(),
  ...timestamps,
}, t => [
  uniqueIndex('filings_test_unique').on(t.testId),
  index('filings_rater_idx').on(t.raterId, t.updatedAt),
  index('filings_project_idx').on(t.projectId),
  // The review queue: one index per sort within a jurisdiction, and per filter + default sort.
  index('filings_queue_submitted_idx').on(t.jurisdictionId, t.submittedAt),
  index('filings_queue_status_idx').on(t.jurisdictionId, t.status, t.submittedAt),
  // Counting a filtered queue (status, verdict, zone, rater in any mix) from the index alone.
  index('filings_queue_count_idx').on(t.jurisdictionId, t.status, t.verdict, t.zone, t.raterId),
  index('filings_queue_verdict_idx').on(t.jurisdictionId, t.verdict, t.submittedAt),
  index('filings_queue_zone_idx').on(t.jurisdictionId, t.zone, t.submittedAt),
  index('filings_queue_rater_idx').on(t.jurisdictionId, t.raterId, t.submittedAt),
  index('filings_queue_permit_idx').on(t.jurisdictionId, t.permitDate),
  index('filings_queue_address_idx').on(t.jurisdictionId, t.addressLine),
  index('filings_queue_ach50_idx').on(t.jurisdictionId, t.ach50),
  index('filings_submitted_idx').on(t.submittedAt),
])

/** Each submission frozen: the project, test and files as filed, and the check made then. */
export const filingRevisions = sqliteTable('filing_revisions', {
  id: integer().primaryKey({ autoIncrement: true }),
  filingId: integer().notNull().references(() => filings.id, { onDelete: 'cascade' }),
  number: integer().notNull(),
  /** FilingSnapshot, JSON. */
  snapshot: text().notNull(),
  /** The CheckResponse at submission, JSON. */
  check: text().notNull(),
  verdict: text({ enum: VERDICTS }).notNull(),
  ruleSetVersionId: integer().references(() => ruleSetVersions.id, { onDelete: 'restrict' }),
  submittedById: integer().references(() => users.id, { onDelete: 'set null' }),
  submittedByName: text().notNull(),
  submittedAt: integer({ mode: 'timestamp_ms' }).notNull(),
}, t => [uniqueIndex('filing_revisions_number_unique').on(t.filingId, t.number)])

/** Every change of state, on the record: who, when, from, to, and the note (a return's reason). */
export const filingTransitions = sqliteTable('filing_transitions', {
  id: integer().primaryKey({ autoIncrement: true }),
  filingId: integer().notNull().references(() => filings.id, { onDelete: 'cascade' }),
  action: text({ enum: FILING_ACTIONS }).notNull(),
  fromState: text({ enum: FILING_STATES }),
  toState: text({ enum: FILING_STATES }).notNull(),
  userId: integer().references(() => users.id, { onDelete: 'set null' }),
  userName: text().notNull(),
  note: text().notNull().default(''),
  revision: integer(),
  at: integer({ mode: 'timestamp_ms' }).notNull(),
}, t => [index('filing_transitions_filing_idx').on(t.filingId, t.at)])

export const filingComments = sqliteTable('filing_comments', {
  id: integer().primaryKey({ autoIncrement: true }),
  filingId: integer().notNull().references(() => filings.id, { onDelete: 'cascade' }),
  userId: integer().references(() => users.id, { onDelete: 'set null' }),
  userName: text().notNull(),
  role: text({ enum: ROLES }).notNull(),
  body: text().notNull(),
  at: integer({ mode: 'timestamp_ms' }).notNull().$defaultFn(() => new Date()),
}, t => [index('filing_comments_filing_idx').on(t.filingId, t.at)])

/**
 * A file attached to a test (readings CSV, photo, PDF). The bytes live in useStorage('uploads')
 * under `storageKey`, generated here and never derived from the user's file name.
 */
export const uploads = sqliteTable('uploads', {
  id: integer().primaryKey({ autoIncrement: true }),
  projectId: integer().notNull().references(() => projects.id, { onDelete: 'cascade' }),
  testId: integer().references(() => testRecords.id, { onDelete: 'cascade' }),
  storageKey: text().notNull(),
  kind: text({ enum: UPLOAD_KINDS }).notNull(),
  contentType: text().notNull(),
  /** The display name, sanitised (last path segment only). */
  name: text().notNull(),
  size: integer().notNull(),
  sha256: text().notNull(),
  uploadedById: integer().references(() => users.id, { onDelete: 'set null' }),
  createdAt: integer({ mode: 'timestamp_ms' }).notNull().$defaultFn(() => new Date()),
}, t => [uniqueIndex('uploads_key_unique').on(t.storageKey), index('uploads_test_idx').on(t.testId), index('uploads_project_idx').on(t.projectId)])

/** The certificate of an accepted filing; `code` is what /verify/<code> looks up. */
export const certificates = sqliteTable('certificates', {
  id: integer().primaryKey({ autoIncrement: true }),
  filingId: integer().notNull().references(() => filings.id, { onDelete: 'cascade' }),
  code: text().notNull(),
  /** CertificateData, JSON: what the page and the PDF print, frozen at acceptance. */
  data: text().notNull(),
  issuedAt: integer({ mode: 'timestamp_ms' }).notNull(),
}, t => [uniqueIndex('certificates_code_unique').on(t.code), uniqueIndex('certificates_filing_unique').on(t.filingId)])

/**
 * Mail to send, written in the same transaction as the decision it announces (so a decision never
 * exists without its notice, and a failed send never undoes a decision). A worker sends and retries.
 */
export const mailOutbox = sqliteTable('mail_outbox', {
  id: integer().primaryKey({ autoIncrement: true }),
  kind: text({ enum: MAIL_KINDS }).notNull(),
  toAddress: text().notNull(),
  subject: text().notNull(),
  body: text().notNull(),
  filingId: integer().references(() => filings.id, { onDelete: 'set null' }),
  status: text({ enum: MAIL_STATUSES }).notNull().default('queued'),
  attempts: integer().notNull().default(0),
  nextAttemptAt: integer({ mode: 'timestamp_ms' }).notNull(),
  claimedAt: integer({ mode: 'timestamp_ms' }),
  lastError: text(),
  messageId: text(),
  sentAt: integer({ mode: 'timestamp_ms' }),
  createdAt: integer({ mode: 'timestamp_ms' }).notNull().$defaultFn(() => new Date()),
}, t => [index('mail_outbox_due_idx').on(t.status, t.nextAttemptAt), index('mail_outbox_created_idx').on(t.createdAt)])

/** What the local capture SMTP server received (demo and tests only), raw RFC 5322. */
export const mailCaptures = sqliteTable('mail_captures', {
  id: integer().primaryKey({ autoIncrement: true }),
  messageId: text(),
  envelopeFrom: text().notNull(),
  envelopeTo: text().notNull(),
  raw: text().notNull(),
  receivedAt: integer({ mode: 'timestamp_ms' }).notNull().$defaultFn(() => new Date()),
}, t => [index('mail_captures_message_idx').on(t.messageId)])

export type ProjectRow = typeof projects.$inferSelect
export type TestRecordRow = typeof testRecords.$inferSelect
export type FilingRow = typeof filings.$inferSelect
export type FilingRevisionRow = typeof filingRevisions.$inferSelect
export type UploadRow = typeof uploads.$inferSelect
export type MailOutboxRow = typeof mailOutbox.$inferSelect
