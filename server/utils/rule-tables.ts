import type { H3Event } from 'h3'
import type { User } from '#auth-utils'
import type { BatchItem } from 'drizzle-orm/batch'
import { asc, desc, eq, sql } from 'drizzle-orm'
import { IMPORT_MAX_BYTES, IMPORT_MAX_LABEL, type ImportProblem } from '../../shared/rules/csv'
import type { RuleRow } from '../../shared/rules/table'
import type { RuleLogic } from '../../shared/rules/logic'
import {
  auditLog, draftRules, jurisdictions, rulebookState, ruleSets, ruleSetVersions, zoneMaps,
  type DraftRuleRow, type RuleSetVersionRow,
} from '../database/schema'

export type Statement = BatchItem<'sqlite'>

/** Runs statements as one transaction (db.batch needs a non-empty tuple). */
export async function runBatch(statements: Statement[]): Promise<void> {
  if (statements.length === 0) return
  const db = await useDb()
  await db.batch(statements as [Statement, ...Statement[]])
}

/** Rows per multi-row INSERT: well under SQLite's 32,766 bound parameters. */
export const INSERT_CHUNK = 1000

export function chunks<T>(rows: readonly T[], size = INSERT_CHUNK): T[][] {
  const out: T[][] = []
  for (let i = 0; i < rows.length; i += size) out.push(rows.slice(i, i + size))
  return out
}

/**
 * Bumps the rulebook generation. Put it in the same batch as every change that can alter what
 * resolveRules answers (zone maps, coverage, editions, jurisdictions, published versions).
 */
export function bumpGeneration(db: Db): Statement {
  // Not async on purpose: a query builder is thenable, so returning it from an async function would run it.
  rulebookChanged()
  return db.insert(rulebookState).values({ id: 1, generation: 1 })
    .onConflictDoUpdate({ target: rulebookState.id, set: { generation: sql`${rulebookState.generation} + 1` } })
}

export type AuditEntity = 'zone-map' | 'rule-set' | 'jurisdiction'

/** An audit-log row: who, when, what, before and after (JSON). */
export function audit(db: Db, user: User, action: string, entityType: AuditEntity, entityId: number, summary: string, before: unknown, after: unknown): Statement {
  return db.insert(auditLog).values({
    userId: user.id,
    userName: user.name,
    action,
    entityType,
    entityId,
    summary,
    before: before === undefined ? null : JSON.stringify(before),
    after: after === undefined ? null : JSON.stringify(after),
  })
}

export function notFound(what: string, id: number | string) {
  return createError({ statusCode: 404, statusMessage: 'Not Found', message: `No ${what} with id ${id}.` })
}

export function conflict(message: string, field = '(body)') {
  return createError({ statusCode: 409, statusMessage: 'Conflict', message, data: { field, reason: message } })
}

export async function findZoneMapOr404(id: number) {
  const db = await useDb()
  const row = await db.query.zoneMaps.findFirst({ where: eq(zoneMaps.id, id) })
  if (!row) throw notFound('zone map', id)
  return row
}

export async function findRuleSetOr404(id: number) {
  const db = await useDb()
  const row = await db.query.ruleSets.findFirst({ where: eq(ruleSets.id, id) })
  if (!row) throw notFound('rule set', id)
  return row
}

export async function findJurisdictionOr404(id: number) {
  const db = await useDb()
  const row = await db.query.jurisdictions.findFirst({ where: eq(jurisdictions.id, id) })
  if (!row) throw notFound('jurisdiction', id)
  return row
}

/** A 400 naming a referenced row that does not exist. */
export async function checkZoneMapRef(field: string, id: number | null | undefined): Promise<void> {
  if (id == null) return
  const db = await useDb()
  const row = await db.query.zoneMaps.findFirst({ where: eq(zoneMaps.id, id) })
  if (!row) throw badRequest([{ field, reason: `no zone map has id ${id}` }])
}

export function ruleFromDraft(row: DraftRuleRow): RuleRow {
  return {
    key: row.key,
    zones: row.zones,
    buildingType: row.buildingType,
    kind: row.kind,
    logic: JSON.parse(row.logic) as RuleLogic,
    summary: row.summary,
    citationCode: row.citationCode,
    citationEdition: row.citationEdition,
    citationSection: row.citationSection,
    notes: row.notes,
  }
}

export function draftValues(ruleSetId: number, rules: readonly RuleRow[]) {
  return rules.map((r, position) => ({ ...r, ruleSetId, position, logic: JSON.stringify(r.logic) }))
}

export async function loadDraft(ruleSetId: number): Promise<RuleRow[]> {
  const db = await useDb()
  const rows = await db.select().from(draftRules).where(eq(draftRules.ruleSetId, ruleSetId)).orderBy(asc(draftRules.position))
  return rows.map(ruleFromDraft)
}

export function rulesOfVersion(row: RuleSetVersionRow): RuleRow[] {
  return JSON.parse(row.rules) as RuleRow[]
}

export async function latestVersion(ruleSetId: number): Promise<RuleSetVersionRow | undefined> {
  const db = await useDb()
  const [row] = await db.select().from(ruleSetVersions).where(eq(ruleSetVersions.ruleSetId, ruleSetId)).orderBy(desc(ruleSetVersions.number)).limit(1)
  return row
}

export async function versionOr404(ruleSetId: number, number: number): Promise<RuleSetVersionRow> {
  const db = await useDb()
  const row = await db.query.ruleSetVersions.findFirst({ where: sql`${ruleSetVersions.ruleSetId} = ${ruleSetId} and ${ruleSetVersions.number} = ${number}` })
  if (!row) throw createError({ statusCode: 404, statusMessage: 'Not Found', message: `Rule set ${ruleSetId} has no version ${number}.` })
  return row
}

export function publicVersion(row: RuleSetVersionRow) {
  return {
    id: row.id,
    ruleSetId: row.ruleSetId,
    number: row.number,
    note: row.note,
    publishedBy: row.publishedByName,
    publishedAt: row.publishedAt.toISOString(),
  }
}

/** Most problems a 400 lists; the message says how many there were in all. */
const MAX_LISTED_PROBLEMS = 500

/** 400 for a refused import: every problem with its line, column and reason; nothing written. */
export function importRejected(problems: ImportProblem[]) {
  const first = problems[0]!
  const more = problems.length > 1 ? ` (and ${problems.length - 1} more problem${problems.length > 2 ? 's' : ''}; nothing was imported)` : ' (nothing was imported)'
  return createError({
    statusCode: 400,
    statusMessage: 'Bad Request',
    message: `line ${first.line}, ${first.column}: ${first.reason}${more}`,
    data: { field: 'csv', reason: first.reason, problems: problems.slice(0, MAX_LISTED_PROBLEMS), problemCount: problems.length },
  })
}

/** JSON escaping (quotes, line ends) makes a body bigger than the CSV it carries. */
const BODY_ALLOWANCE = 1.5

function importTooLarge(bytes: number) {
  return createError({
    statusCode: 413,
    statusMessage: 'Payload Too Large',
    message: `The import is ${(bytes / 1024 / 1024).toFixed(1)} MB; the limit is ${IMPORT_MAX_LABEL} (${IMPORT_MAX_BYTES} bytes) of CSV. Split the file, or import it in parts with mode "merge".`,
    data: { field: 'csv', reason: `exceeds the ${IMPORT_MAX_LABEL} limit`, limitBytes: IMPORT_MAX_BYTES },
  })
}

/**
 * Reads an import body: JSON ({ mode, csv, columns? }) or raw text/csv (mode from the query).
 * CSV over the limit is refused with 413 before it is parsed: a body far over it by its
 * Content-Length (or the bytes read), then the CSV text itself.
 */
export async function readImportBody(event: H3Event): Promise<{ json: unknown } | { csv: string }> {
  const bodyLimit = IMPORT_MAX_BYTES * BODY_ALLOWANCE
  const declared = Number(getRequestHeader(event, 'content-length'))
  if (Number.isFinite(declared) && declared > bodyLimit) throw importTooLarge(declared)
  const raw = await readRawBody(event, false)
  const bytes = raw ? raw.byteLength : 0
  if (bytes > bodyLimit) throw importTooLarge(bytes)
  const text = raw ? new TextDecoder('utf-8').decode(raw) : ''
  const type = (getRequestHeader(event, 'content-type') ?? '').toLowerCase()
  if (type.startsWith('text/csv') || type.startsWith('text/plain')) {
    if (bytes > IMPORT_MAX_BYTES) throw importTooLarge(bytes)
    return { csv: text }
  }
  let json: unknown
  try {
    json = text ? JSON.parse(text) : {}
  }
  catch {
    throw badRequest([{ field: '(body)', reason: 'is not valid JSON' }])
  }
  const csv = (json as { csv?: unknown } | null)?.csv
  if (typeof csv === 'string') {
    const csvBytes = Buffer.byteLength(csv, 'utf8')
    if (csvBytes > IMPORT_MAX_BYTES) throw importTooLarge(csvBytes)
  }
  return { json }
}

/** Server-side time of an operation, as a header and in the body. */
export function timing(event: H3Event, name: string, startedAt: number): number {
  const ms = Math.round((performance.now() - startedAt) * 10) / 10
  appendResponseHeader(event, 'Server-Timing', `${name};dur=${ms}`)
  return ms
}

/** Sends a CSV download. */
export function sendCsv(event: H3Event, filename: string, csv: string): string {
  setResponseHeader(event, 'Content-Type', 'text/csv; charset=utf-8')
  setResponseHeader(event, 'Content-Disposition', `attachment; filename="${filename.replace(/[^A-Za-z0-9._-]+/g, '-')}"`)
  setResponseHeader(event, 'X-Content-Type-Options', 'nosniff')
  return csv
}

/** A UNIQUE constraint failure, however drizzle/libSQL wrap it. */
export function isUniqueViolation(error: unknown): boolean {
  for (let e: unknown = error; e; e = (e as { cause?: unknown }).cause) {
    if (/UNIQUE constraint failed|SQLITE_CONSTRAINT_UNIQUE|SQLITE_CONSTRAINT_PRIMARYKEY/.test(String((e as Error).message))) return true
    if (e === (e as { cause?: unknown }).cause) break
  }
  return false
}
