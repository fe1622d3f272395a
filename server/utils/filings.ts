import { randomUUID } from 'node:crypto'
import type { H3Event } from 'h3'
import type { User } from '#auth-utils'
import type { InStatement, InValue } from '@libsql/client'
import { and, asc, desc, eq, gte, inArray, like, lte, ne, or, sql, type SQL } from 'drizzle-orm'
import { CheckRequest, VERDICT_WORDS, type CheckResponse } from '../../shared/checks'
import { TEST_STAGE_WORDS } from '../../shared/filings/constants'
import type { QueueQuery } from '../../shared/filings/schemas'
import { checkRequestOf, compareStated, diffSnapshots, type FilingSnapshot } from '../../shared/filings/snapshot'
import { FILING_STATE_WORDS, nextState, refusal, type FilingAction, type FilingState } from '../../shared/filings/states'
import type { CertificateData, FilingDetail, QueuePage, QueueRow, RevisionInfo } from '../../shared/filings/types'
import {
  certificates, filingComments, filingRevisions, filings, filingTransitions, jurisdictions, mailOutbox, projects, testRecords,
  uploads, users, type FilingRow,
} from '../database/schema'

/** Which filings a user may see: admins all; raters their own; reviewers their jurisdiction's, once filed. */
export function filingScope(user: User): SQL | undefined {
  if (user.role === 'admin') return undefined
  if (user.role === 'rater') return eq(filings.raterId, user.id)
  if (user.jurisdictionId === null) return sql`0`
  return and(eq(filings.jurisdictionId, user.jurisdictionId), ne(filings.status, 'draft'))
}

export async function findFilingFor(user: User, id: number): Promise<FilingRow> {
  const db = await useDb()
  const scope = filingScope(user)
  const row = await db.query.filings.findFirst({ where: scope ? and(eq(filings.id, id), scope) : eq(filings.id, id) })
  if (!row) throw rowNotFound('filing', id)
  return row
}

export function stateConflict(filing: Pick<FilingRow, 'status' | 'version'>, message: string) {
  return createError({ statusCode: 409, statusMessage: 'Conflict', message, data: { field: 'version', reason: message, status: filing.status, version: filing.version } })
}

function forbidden(message: string) {
  return createError({ statusCode: 403, statusMessage: 'Forbidden', message })
}

/** Any drizzle query that can print itself. */
interface Printable { toSQL(): { sql: string, params: unknown[] } }

/**
 * An INSERT that only happens when the filing still carries `token` — i.e. when this request's
 * conditional UPDATE won. Rewrites `insert … values (…)` into `insert … select … where exists (…)`.
 */
function guardedInsert(insert: Printable, filingId: number, token: string): InStatement {
  const { sql: text, params } = insert.toSQL()
  const match = /^(insert into .+?\)) values \((.*)\)$/is.exec(text)
  if (!match) throw new Error(`guardedInsert: unexpected SQL ${text.slice(0, 80)}`)
  return {
    sql: `${match[1]} select ${match[2]} where exists (select 1 from "filings" where "id" = ? and "change_token" = ?)`,
    args: [...(params as InValue[]), filingId, token],
  }
}

function statement(query: Printable): InStatement {
  const { sql: text, params } = query.toSQL()
  return { sql: text, args: params as InValue[] }
}

interface TransitionPlan {
  filing: FilingRow
  user: User
  action: FilingAction
  /** The version the user acted on. */
  version: number
  note?: string
  set?: Partial<typeof filings.$inferInsert>
  /** Rows written only when the change wins (revision, certificate, mail). */
  rows?: (db: Db) => Printable[]
}

/**
 * One change of state, all or nothing, with no interactive transaction: a conditional UPDATE
 * (same status, same version) that sets a fresh change token, then the rows that belong to it
 * (transition, revision, certificate, mail), each inserted only if the token is the one just
 * set. One batch = one transaction. Zero rows updated → 409, and nothing else was written.
 */
export async function transition(plan: TransitionPlan): Promise<FilingState> {
  const { filing, user, action } = plan
  const to = nextState(filing.status, action)
  if (!to) throw stateConflict(filing, refusal(filing.status, action))
  if (plan.version !== filing.version) throw stateConflict(filing, `This filing changed since you opened it (version ${plan.version}; it is now version ${filing.version}, ${FILING_STATE_WORDS[filing.status].title.toLowerCase()}). Reload it; nothing you typed was sent.`)
  const db = await useDb()
  const token = randomUUID()
  const now = new Date()
  const update = db.update(filings)
    .set({ ...plan.set, status: to, version: filing.version + 1, changeToken: token, updatedAt: now })
    .where(and(eq(filings.id, filing.id), eq(filings.status, filing.status), eq(filings.version, plan.version)))
  const record = db.insert(filingTransitions).values({
    filingId: filing.id,
    action,
    fromState: filing.status,
    toState: to,
    userId: user.id,
    userName: user.name,
    note: plan.note ?? '',
    revision: plan.set?.revision ?? filing.revision,
    at: now,
  })
  const rows = [record, ...(plan.rows?.(db) ?? [])]
  const client = await useClient()
  const results = await client.batch([statement(update), ...rows.map(r => guardedInsert(r, filing.id, token))], 'write')
  if (results[0]!.rowsAffected !== 1) {
    const current = await db.query.filings.findFirst({ where: eq(filings.id, filing.id) })
    const who = current?.reviewerName ? ` by ${current.reviewerName}` : ''
    throw stateConflict(current ?? filing, `Someone else acted on this filing first: it is now ${FILING_STATE_WORDS[current?.status ?? filing.status].title.toLowerCase()}${who}. Your ${action === 'return' ? 'reason was not lost: it is still in the form' : 'request changed nothing'}; reload to see the record.`)
  }
  kickMail()
  return to
}

async function reviewersOf(jurisdictionId: number): Promise<string[]> {
  const db = await useDb()
  const rows = await db.select({ email: users.email }).from(users)
    .where(and(eq(users.role, 'reviewer'), eq(users.jurisdictionId, jurisdictionId), eq(users.active, true)))
  if (rows.length) return rows.map(r => r.email)
  const j = await db.query.jurisdictions.findFirst({ columns: { contactEmail: true }, where: eq(jurisdictions.id, jurisdictionId) })
  return j?.contactEmail ? [j.contactEmail] : []
}

function figures(check: CheckResponse): string {
  return `${Number(check.metrics.cfm50.toPrecision(4))} CFM50, ${Number(check.metrics.ach50.toPrecision(3))} ACH50 — ${VERDICT_WORDS[check.verdict].title.toLowerCase()}`
}

/** The snapshot of a test as it stands, for a new revision. */
export async function currentSnapshot(filing: FilingRow, note: string): Promise<FilingSnapshot> {
  const db = await useDb()
  const [project, test, files] = await Promise.all([
    db.query.projects.findFirst({ where: eq(projects.id, filing.projectId) }),
    db.query.testRecords.findFirst({ where: eq(testRecords.id, filing.testId) }),
    db.select().from(uploads).where(eq(uploads.testId, filing.testId)).orderBy(asc(uploads.id)),
  ])
  if (!project || !test) throw rowNotFound('filing', filing.id)
  return {
    project: projectSnapshotOf(project),
    test: testSnapshotOf(test),
    files: files.map(f => ({ id: f.id, name: f.name, kind: f.kind, size: f.size, sha256: f.sha256 })),
    note,
  }
}

/** The check of a snapshot, now, through the checker (null with the reason when it cannot run). */
export async function checkSnapshot(user: Pick<User, 'id' | 'name'> | null, snapshot: FilingSnapshot, generation?: number): Promise<{ check: CheckResponse | null, problem: string | null }> {
  const { stored, response } = await checkOfTest(user, snapshot.project, snapshot.test, generation)
  return { check: response, problem: stored.checkProblem }
}

/** Rater files (or files again) a test: a new frozen revision, the check made now, mail to the jurisdiction's reviewers. */
export async function submitFiling(event: H3Event, user: User, filing: FilingRow, note: string): Promise<FilingState> {
  if (filing.raterId !== user.id) throw forbidden('Only the rater who prepared this filing can file it.')
  if (!nextState(filing.status, 'submit')) throw stateConflict(filing, refusal(filing.status, 'submit'))
  const snapshot = await currentSnapshot(filing, note)
  if (snapshot.test.readings.length === 0) throw badRequest([{ field: 'test.readings', reason: 'the test has no readings yet: type them or import a readings file first' }])
  const { check, problem } = await checkSnapshot(user, snapshot, knownRulebookGeneration(event))
  if (!check) throw badRequest([{ field: 'test', reason: problem ?? 'the test cannot be checked' }])
  if (!check.jurisdiction) throw createError({ statusCode: 422, statusMessage: 'Unprocessable Entity', message: `No jurisdiction takes this filing: ${check.noRule?.message ?? 'the address is not covered.'}`, data: { field: 'project.address', reason: check.noRule?.message ?? 'not covered' } })
  const revision = filing.revision + 1
  const now = new Date()
  const base = publicBaseUrl(event)
  const address = `${snapshot.project.addressLine}, ${snapshot.project.city} ${snapshot.project.stateCode}`
  const recipients = await reviewersOf(check.jurisdiction.id)
  const body = [
    `${user.name} ${revision > 1 ? `filed again (revision ${revision})` : 'filed'} the ${TEST_STAGE_WORDS[snapshot.test.stage].toLowerCase()} air-leakage test of ${address}, permit ${snapshot.project.permitNumber}, with ${check.jurisdiction.name}.`,
    `Tightwell's recomputation from the readings: ${figures(check)}${check.ruleSetVersion ? ` (limits table version ${check.ruleSetVersion.number})` : ''}.`,
    note ? `Note from the rater: ${note}` : '',
    `Open the filing: ${base}/filings/${filing.id}`,
  ].filter(Boolean).join('\n\n')
  return transition({
    filing, user, action: 'submit', version: filing.version, note,
    set: {
      revision,
      jurisdictionId: check.jurisdiction.id,
      submittedAt: now,
      firstSubmittedAt: filing.firstSubmittedAt ?? now,
      returnReason: null,
      reviewerId: null,
      reviewerName: null,
      addressLine: snapshot.project.addressLine,
      city: snapshot.project.city,
      permitNumber: snapshot.project.permitNumber,
      permitDate: snapshot.project.permitDate,
      stage: snapshot.test.stage,
      testedOn: snapshot.test.testedOn,
      zone: check.zone,
      verdict: check.verdict,
      cfm50: check.metrics.cfm50,
      ach50: check.metrics.ach50,
    },
    rows: db => [
      db.insert(filingRevisions).values({
        filingId: filing.id,
        number: revision,
        snapshot: JSON.stringify(snapshot),
        check: JSON.stringify(check),
        verdict: check.verdict,
        ruleSetVersionId: check.ruleSetVersion?.id ?? null,
        submittedById: user.id,
        submittedByName: user.name,
        submittedAt: now,
      }),
      ...recipients.map(to => db.insert(mailOutbox).values(outboxValues({
        kind: 'filing-submitted', to, filingId: filing.id,
        subject: `${revision > 1 ? 'Filed again' : 'Filed'} for review: ${address} (permit ${snapshot.project.permitNumber})`,
        body,
      }, now))),
    ],
  })
}

function assertReviewerMayAct(user: User, filing: FilingRow): void {
  if (user.role !== 'reviewer') throw forbidden('Decisions are made by the jurisdiction\'s plan reviewers.')
  if (filing.raterId === user.id) throw forbidden('You filed this test; another plan reviewer must review it.')
}

export async function takeUpFiling(user: User, filing: FilingRow, version: number): Promise<FilingState> {
  assertReviewerMayAct(user, filing)
  return transition({ filing, user, action: 'take-up', version, set: { reviewerId: user.id, reviewerName: user.name } })
}

async function raterEmail(raterId: number): Promise<string | null> {
  const db = await useDb()
  const row = await db.query.users.findFirst({ columns: { email: true }, where: eq(users.id, raterId) })
  return row?.email ?? null
}

/** Accept (with a certificate) or return (with the reason); the rater is told by mail either way. */
export async function decideFiling(event: H3Event, user: User, filing: FilingRow, decision: 'accept' | 'return', reason: string, version: number): Promise<FilingState> {
  assertReviewerMayAct(user, filing)
  const action: FilingAction = decision
  if (!nextState(filing.status, action)) throw stateConflict(filing, refusal(filing.status, action))
  const db = await useDb()
  const [revision, jurisdiction] = await Promise.all([
    db.query.filingRevisions.findFirst({ where: and(eq(filingRevisions.filingId, filing.id), eq(filingRevisions.number, filing.revision)) }),
    db.query.jurisdictions.findFirst({ columns: { name: true }, where: eq(jurisdictions.id, filing.jurisdictionId) }),
  ])
  if (!revision) throw stateConflict(filing, 'This filing has no filed revision to decide.')
  const snapshot = JSON.parse(revision.snapshot) as FilingSnapshot
  const check = JSON.parse(revision.check) as CheckResponse
  const now = new Date()
  const base = publicBaseUrl(event)
  const address = `${snapshot.project.addressLine}, ${snapshot.project.city} ${snapshot.project.stateCode}`
  const to = await raterEmail(filing.raterId)
  const link = `${base}/filings/${filing.id}`

  if (decision === 'return') {
    return transition({
      filing, user, action, version, note: reason,
      set: { returnReason: reason, decidedAt: now, reviewerId: user.id, reviewerName: user.name },
      rows: d => to
        ? [d.insert(mailOutbox).values(outboxValues({
            kind: 'filing-returned', to, filingId: filing.id,
            subject: `Returned: ${address} (permit ${snapshot.project.permitNumber})`,
            body: `${user.name} of ${jurisdiction?.name ?? 'the jurisdiction'} returned your filing of ${address}, permit ${snapshot.project.permitNumber} (revision ${filing.revision}).\n\nReason: ${reason}\n\nRevise the test and file it again: ${link}`,
          }, now))]
        : [],
    })
  }

  const code = newVerificationCode()
  const url = verifyUrl(base, code)
  const data: CertificateData = {
    code,
    verifyUrl: url,
    address: `${snapshot.project.addressLine}, ${snapshot.project.city} ${snapshot.project.stateCode} ${snapshot.project.postalCode}`,
    permitNumber: snapshot.project.permitNumber,
    permitDate: snapshot.project.permitDate,
    testedOn: snapshot.test.testedOn,
    stage: snapshot.test.stage,
    units: snapshot.project.units,
    cfm50: check.metrics.cfm50,
    ach50: check.metrics.ach50,
    cfm50PerEnclosureArea: check.metrics.cfm50PerEnclosureArea,
    limits: check.rules.map(r => ({ summary: r.summary, citation: r.citation })),
    jurisdictionName: jurisdiction?.name ?? '',
    edition: check.edition?.name ?? null,
    ruleSetVersion: check.ruleSetVersion ? { id: check.ruleSetVersion.id, number: check.ruleSetVersion.number } : null,
    decidedAt: now.toISOString(),
    decidedByName: user.name,
    raterName: filing.raterName,
  }
  return transition({
    filing, user, action, version, note: reason,
    set: { decidedAt: now, reviewerId: user.id, reviewerName: user.name, returnReason: null },
    rows: d => [
      d.insert(certificates).values({ filingId: filing.id, code, data: JSON.stringify(data), issuedAt: now }),
      ...(to
        ? [d.insert(mailOutbox).values(outboxValues({
            kind: 'filing-accepted', to, filingId: filing.id,
            subject: `Accepted: ${address} (permit ${snapshot.project.permitNumber})`,
            body: `${user.name} of ${jurisdiction?.name ?? 'the jurisdiction'} accepted your filing of ${address}, permit ${snapshot.project.permitNumber}: ${figures(check)}.${reason ? `\n\nNote: ${reason}` : ''}\n\nCertificate: ${link}/certificate\nVerification code ${code}: ${url}`,
          }, now))]
        : []),
    ],
  })
}

function revisionChecks(rows: { snapshot: string }[]): FilingSnapshot[] {
  return rows.map(r => JSON.parse(r.snapshot) as FilingSnapshot)
}

/** Everything the filing page shows, with the recomputation made now. */
export async function filingDetail(event: H3Event, user: User, filing: FilingRow): Promise<FilingDetail> {
  const db = await useDb()
  const [revisionRows, transitionRows, commentRows, fileRows, certificate, jurisdiction] = await Promise.all([
    db.select().from(filingRevisions).where(eq(filingRevisions.filingId, filing.id)).orderBy(asc(filingRevisions.number)),
    db.select().from(filingTransitions).where(eq(filingTransitions.filingId, filing.id)).orderBy(asc(filingTransitions.at), asc(filingTransitions.id)),
    db.select().from(filingComments).where(eq(filingComments.filingId, filing.id)).orderBy(asc(filingComments.at), asc(filingComments.id)),
    db.select().from(uploads).where(eq(uploads.testId, filing.testId)).orderBy(asc(uploads.id)),
    db.query.certificates.findFirst({ where: eq(certificates.filingId, filing.id) }),
    db.query.jurisdictions.findFirst({ columns: { id: true, name: true }, where: eq(jurisdictions.id, filing.jurisdictionId) }),
  ])
  const snapshots = revisionChecks(revisionRows)
  const revisions: RevisionInfo[] = revisionRows.map((r, i) => {
    const filed = JSON.parse(r.check) as CheckResponse
    return {
      number: r.number,
      submittedAt: r.submittedAt.toISOString(),
      submittedByName: r.submittedByName,
      verdict: r.verdict,
      ruleSetVersion: filed.ruleSetVersion,
      changes: i === 0 ? [] : diffSnapshots(snapshots[i - 1]!, snapshots[i]!),
    }
  })
  const current = revisionRows.at(-1)
  const snapshot = snapshots.at(-1) ?? null
  const filedCheck = current ? JSON.parse(current.check) as CheckResponse : null
  let recheck: CheckResponse | null = null
  const differences: string[] = []
  if (snapshot) {
    const again = await checkSnapshot(user, snapshot, knownRulebookGeneration(event))
    recheck = again.check
    if (!recheck) differences.push(`Tightwell cannot recompute this filing now: ${again.problem ?? 'the check failed'}.`)
  }
  if (filedCheck && recheck) {
    if (filedCheck.verdict !== recheck.verdict) differences.push(`Verdict: ${VERDICT_WORDS[filedCheck.verdict].title} when filed, ${VERDICT_WORDS[recheck.verdict].title} now.`)
    if (filedCheck.ruleSetVersion?.id !== recheck.ruleSetVersion?.id) differences.push(`Rules: limits table version ${filedCheck.ruleSetVersion?.number ?? '—'} when filed, version ${recheck.ruleSetVersion?.number ?? '—'} in force now${recheck.edition ? ` (${recheck.edition.name})` : ''}.`)
    if (filedCheck.zone !== recheck.zone) differences.push(`Climate zone: ${filedCheck.zone ?? '—'} when filed, ${recheck.zone ?? '—'} now.`)
    if (Math.abs(filedCheck.metrics.cfm50 - recheck.metrics.cfm50) > 1e-9 * Math.max(1, recheck.metrics.cfm50)) differences.push(`CFM50: ${filedCheck.metrics.cfm50} when filed, ${recheck.metrics.cfm50} recomputed now.`)
  }
  const stated = snapshot && recheck ? compareStated({ cfm50: snapshot.test.statedCfm50, ach50: snapshot.test.statedAch50 }, recheck.metrics) : []
  for (const s of stated) {
    if (s.differs) differences.push(`Stated ${s.metric === 'cfm50' ? 'CFM50' : 'ACH50'} ${s.stated} differs from the recomputed ${Number(s.recomputed.toPrecision(4))} by ${s.differencePercent!.toFixed(1)} %.`)
  }
  const inJurisdiction = user.role === 'reviewer' && user.jurisdictionId === filing.jurisdictionId
  const own = filing.raterId === user.id
  const data = certificate ? JSON.parse(certificate.data) as CertificateData : null
  return {
    id: filing.id,
    status: filing.status,
    version: filing.version,
    revision: filing.revision,
    raterId: filing.raterId,
    raterName: filing.raterName,
    reviewerName: filing.reviewerName,
    jurisdiction: jurisdiction ?? { id: filing.jurisdictionId, name: '' },
    projectId: filing.projectId,
    testId: filing.testId,
    returnReason: filing.returnReason,
    submittedAt: filing.submittedAt?.toISOString() ?? null,
    decidedAt: filing.decidedAt?.toISOString() ?? null,
    snapshot,
    filedCheck,
    recheck,
    stated,
    differences,
    revisions,
    transitions: transitionRows.map(t => ({ id: t.id, action: t.action, fromState: t.fromState, toState: t.toState, userName: t.userName, note: t.note, revision: t.revision, at: t.at.toISOString() })),
    comments: commentRows.map(c => ({ id: c.id, userId: c.userId, userName: c.userName, role: c.role, body: c.body, at: c.at.toISOString() })),
    files: fileRows.map(uploadInfo),
    certificate: certificate && data ? { code: certificate.code, verifyUrl: data.verifyUrl, issuedAt: certificate.issuedAt.toISOString(), pdfUrl: `/api/filings/${filing.id}/certificate.pdf` } : null,
    can: {
      submit: user.role === 'rater' && own && nextState(filing.status, 'submit') !== null,
      takeUp: inJurisdiction && !own && nextState(filing.status, 'take-up') !== null,
      decide: inJurisdiction && !own && filing.status === 'in-review',
      comment: user.role === 'admin' || (user.role === 'rater' && own) || inJurisdiction,
    },
  }
}

const SORT_COLUMNS = {
  submittedAt: filings.submittedAt,
  permitDate: filings.permitDate,
  address: filings.addressLine,
  ach50: filings.ach50,
  status: filings.status,
  verdict: filings.verdict,
  rater: filings.raterName,
  zone: filings.zone,
} as const

function dayStart(date: string): Date {
  return new Date(`${date}T00:00:00.000Z`)
}

/**
 * The queue, sorted, filtered and paged in SQL on the filings table alone (the queue columns are
 * copied there at each submission and indexed per jurisdiction).
 */
export async function queuePage(user: User, query: QueueQuery, withFacets: boolean): Promise<QueuePage> {
  const db = await useDb()
  const conditions: (SQL | undefined)[] = [filingScope(user)]
  if (query.jurisdictionId !== undefined) conditions.push(eq(filings.jurisdictionId, query.jurisdictionId))
  if (query.status?.length) conditions.push(inArray(filings.status, query.status))
  if (query.verdict?.length) conditions.push(inArray(filings.verdict, query.verdict))
  if (query.zone) conditions.push(eq(filings.zone, query.zone))
  if (query.raterId !== undefined) conditions.push(eq(filings.raterId, query.raterId))
  if (query.from) conditions.push(gte(filings.submittedAt, dayStart(query.from)))
  if (query.to) conditions.push(lte(filings.submittedAt, new Date(dayStart(query.to).getTime() + 86_400_000 - 1)))
  if (query.q && [...query.q].length >= 3) {
    // Any part of the text, through the trigram index (drizzle/0004_filing-search.sql): the same
    // matches as LIKE '%q%' (case-insensitive), without reading every filing.
    const phrase = `"${query.q.replace(/"/g, '""')}"`
    conditions.push(sql`${filings.id} in (select rowid from filings_search where filings_search match ${phrase})`)
  }
  else if (query.q) {
    // One or two characters are shorter than a trigram: a scan.
    const pattern = `%${query.q.replace(/[\\%_]/g, c => `\\${c}`)}%`
    conditions.push(or(
      sql`${filings.addressLine} like ${pattern} escape '\\'`,
      sql`${filings.city} like ${pattern} escape '\\'`,
      sql`${filings.permitNumber} like ${pattern} escape '\\'`,
      sql`${filings.raterName} like ${pattern} escape '\\'`,
    ))
  }
  const where = and(...conditions.filter((c): c is SQL => c !== undefined))
  const column = SORT_COLUMNS[query.sort]
  const order = query.dir === 'asc' ? [asc(column), asc(filings.id)] : [desc(column), desc(filings.id)]
  const [rows, [count]] = await Promise.all([
    db.select({
      id: filings.id, status: filings.status, version: filings.version, submittedAt: filings.submittedAt,
      addressLine: filings.addressLine, city: filings.city, permitNumber: filings.permitNumber, permitDate: filings.permitDate,
      zone: filings.zone, verdict: filings.verdict, cfm50: filings.cfm50, ach50: filings.ach50, stage: filings.stage,
      testedOn: filings.testedOn, raterId: filings.raterId, raterName: filings.raterName, reviewerName: filings.reviewerName,
      jurisdictionId: filings.jurisdictionId, revision: filings.revision,
    }).from(filings).where(where).orderBy(...order).limit(query.pageSize).offset((query.page - 1) * query.pageSize),
    db.select({ total: sql<number>`count(*)` }).from(filings).where(where),
  ])
  const names = new Map((await db.select({ id: jurisdictions.id, name: jurisdictions.name }).from(jurisdictions)).map(j => [j.id, j.name]))
  const out: QueueRow[] = rows.map(({ submittedAt, jurisdictionId, ...r }) => ({ ...r, submittedAt: submittedAt?.toISOString() ?? null, jurisdictionName: names.get(jurisdictionId) ?? '' }))
  let raters: QueuePage['raters'] = []
  let zones: string[] = []
  if (withFacets) {
    const scope = filingScope(user)
    const [raterIds, zoneRows] = await Promise.all([
      db.selectDistinct({ id: filings.raterId }).from(filings).where(scope),
      db.selectDistinct({ zone: filings.zone }).from(filings).where(scope),
    ])
    const ids = raterIds.map(r => r.id)
    raters = ids.length ? await db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, ids)).orderBy(asc(users.name)) : []
    zones = zoneRows.map(z => z.zone).filter((z): z is string => z !== null).sort()
  }
  return { rows: out, total: Number(count?.total ?? 0), page: query.page, pageSize: query.pageSize, raters, zones }
}
