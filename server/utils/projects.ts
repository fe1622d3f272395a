import type { H3Event } from 'h3'
import type { User } from '#auth-utils'
import { and, asc, desc, eq, inArray } from 'drizzle-orm'
import { CheckRequest, type CheckResponse } from '../../shared/checks'
import type { ProjectBody, TestBody } from '../../shared/filings/schemas'
import { checkRequestOf, type ProjectSnapshot, type TestSnapshot } from '../../shared/filings/snapshot'
import { FROZEN_STATES, type FilingState } from '../../shared/filings/states'
import type { ProjectDetail, ProjectInfo, TestCheckSummary, TestRecord, UploadInfo } from '../../shared/filings/types'
import type { Reading } from '../../shared/leakage/types'
import { filings, jurisdictions, projects, testRecords, uploads, users, type ProjectRow, type TestRecordRow, type UploadRow } from '../database/schema'

/** A project or test that is not yours answers 404, the same as one that does not exist. */
export function rowNotFound(what: string, id: number) {
  return createError({ statusCode: 404, statusMessage: 'Not Found', message: `No ${what} ${id} that you may see.` })
}

export function frozenConflict(state: FilingState, what: string) {
  const message = state === 'accepted'
    ? `This ${what} belongs to an accepted filing and is frozen; record a retest instead.`
    : `This ${what} is filed with the jurisdiction and frozen while it is reviewed; it can change if the reviewer returns it (the next filing makes a new revision).`
  return createError({ statusCode: 409, statusMessage: 'Conflict', message, data: { field: '(body)', reason: message, status: state } })
}

export function projectSnapshotOf(row: ProjectRow): ProjectSnapshot {
  return {
    addressLine: row.addressLine,
    city: row.city,
    stateCode: row.stateCode,
    postalCode: row.postalCode,
    countyFips: row.countyFips,
    jurisdictionId: row.jurisdictionId,
    permitNumber: row.permitNumber,
    permitDate: row.permitDate,
    builderCompany: row.builderCompany,
    builderContact: row.builderContact,
    buildingType: row.buildingType,
    units: row.units,
    volume: row.volume,
    floorArea: row.floorArea,
    enclosureArea: row.enclosureArea,
    height: row.height,
    notes: row.notes,
  }
}

export function testSnapshotOf(row: TestRecordRow): TestSnapshot {
  return {
    testedOn: row.testedOn,
    stage: row.stage,
    tester: row.tester,
    equipment: row.equipment,
    wind: row.wind,
    insideTemperature: row.insideTemperature,
    outsideTemperature: row.outsideTemperature,
    direction: row.direction,
    baselineBefore: row.baselineBefore,
    baselineAfter: row.baselineAfter,
    readings: JSON.parse(row.readings) as Reading[],
    assumedExponent: row.assumedExponent,
    safety: JSON.parse(row.safety) as string[],
    statedCfm50: row.statedCfm50,
    statedAch50: row.statedAch50,
    notes: row.notes,
  }
}

/** Project columns from a validated body (county already decided). */
export function projectValues(body: ProjectBody, countyFips: string) {
  return {
    jurisdictionId: body.jurisdictionId ?? null,
    addressLine: body.address.line1,
    city: body.address.city,
    stateCode: body.address.state,
    postalCode: body.address.postalCode,
    countyFips,
    permitNumber: body.permitNumber,
    permitDate: body.permitDate,
    builderCompany: body.builderCompany,
    builderContact: body.builderContact,
    buildingType: body.buildingType,
    units: body.units,
    volume: body.building.volume,
    floorArea: body.building.floorArea ?? null,
    enclosureArea: body.building.enclosureArea ?? null,
    height: body.building.height ?? null,
    notes: body.notes,
  }
}

export function testSnapshotOfBody(body: TestBody): TestSnapshot {
  return {
    testedOn: body.testedOn,
    stage: body.stage,
    tester: body.tester,
    equipment: body.equipment,
    wind: body.wind,
    insideTemperature: body.insideTemperature ?? null,
    outsideTemperature: body.outsideTemperature ?? null,
    direction: body.direction,
    baselineBefore: body.baseline?.before ?? null,
    baselineAfter: body.baseline?.after ?? null,
    readings: body.readings.map(r => ({ pressure: r.pressure, flow: r.flow })),
    assumedExponent: body.assumedExponent ?? null,
    safety: [...new Set(body.safety)],
    statedCfm50: body.statedCfm50 ?? null,
    statedAch50: body.statedAch50 ?? null,
    notes: body.notes,
  }
}

/** Test columns from a snapshot (readings and checklist as JSON). */
export function testValues(test: TestSnapshot) {
  return { ...test, readings: JSON.stringify(test.readings), safety: JSON.stringify(test.safety) }
}

/**
 * The county of a project's address (as given, or from the postal code: 422 when it spans
 * several), and a refusal when the county is shared by jurisdictions and none was named.
 */
export async function projectCounty(body: ProjectBody, event: H3Event): Promise<string> {
  const county = await countyOf({ address: body.address })
  const resolved = await resolveRules({
    jurisdictionId: body.jurisdictionId ?? undefined,
    countyFips: county.fips,
    stateCode: body.address.state,
    postalCode: body.address.postalCode,
    permitDate: body.permitDate,
    buildingType: body.buildingType,
  }, knownRulebookGeneration(event))
  if (!resolved.ok) {
    if (resolved.reason === 'ambiguous-jurisdiction') throw needsChoice('jurisdictionId', resolved.message, resolved.candidates ?? [])
    if (body.jurisdictionId != null && (resolved.reason === 'no-jurisdiction' || resolved.reason === 'county-not-covered')) throw badRequest([{ field: 'jurisdictionId', reason: resolved.message }])
  }
  return county.fips
}

/** A project with its tests (oldest first, for the plot over time). */
export async function projectDetail(row: ProjectRow): Promise<ProjectDetail> {
  const db = await useDb()
  const [info, tests, filingRows] = await Promise.all([
    projectInfo(row),
    db.select().from(testRecords).where(eq(testRecords.projectId, row.id)).orderBy(asc(testRecords.testedOn), asc(testRecords.id)),
    db.select({ id: filings.id, testId: filings.testId, status: filings.status }).from(filings).where(eq(filings.projectId, row.id)),
  ])
  const byTest = new Map(filingRows.map(f => [f.testId, f]))
  // Without a chosen jurisdiction, name the one the latest check found for the address.
  const checked = [...tests].reverse().find(t => t.check)
  const found = checked ? (JSON.parse(checked.check!) as CheckResponse).jurisdiction?.name ?? null : null
  return {
    ...info,
    jurisdictionName: info.jurisdictionName ?? found,
    frozen: filingRows.some(f => FROZEN_STATES.includes(f.status)),
    tests: tests.map((t) => {
      const f = byTest.get(t.id)
      return {
        id: t.id,
        projectId: t.projectId,
        testedOn: t.testedOn,
        stage: t.stage,
        tester: t.tester,
        readingCount: (JSON.parse(t.readings) as Reading[]).length,
        check: checkSummaryOf(t),
        filing: f ? { id: f.id, status: f.status } : null,
      }
    }),
  }
}

/** A test record as the test page shows it. */
export async function testRecordOf(user: User, id: number): Promise<TestRecord> {
  const { test, project } = await findTestFor(user, id)
  const db = await useDb()
  const [info, files, filing] = await Promise.all([
    projectInfo(project),
    uploadsOfTest(test.id),
    db.query.filings.findFirst({ columns: { id: true, status: true, version: true }, where: eq(filings.testId, test.id) }),
  ])
  return {
    ...testSnapshotOf(test),
    id: test.id,
    projectId: test.projectId,
    check: test.check ? JSON.parse(test.check) as CheckResponse : null,
    checkProblem: test.checkProblem,
    uploads: files.map(uploadInfo),
    filing: filing ?? null,
    frozen: filing ? FROZEN_STATES.includes(filing.status) : false,
    project: info,
  }
}

export interface StoredCheck {
  verdict: CheckResponse['verdict'] | null
  cfm50: number | null
  ach50: number | null
  ruleSetVersionId: number | null
  checkedAt: Date | null
  check: string | null
  checkProblem: string | null
}

const NO_CHECK: StoredCheck = { verdict: null, cfm50: null, ach50: null, ruleSetVersionId: null, checkedAt: null, check: null, checkProblem: null }

/**
 * The check of a project's test through the same checker as POST /api/checks. A test without
 * readings has none; a check that cannot run (a county the postal code does not settle, a permit
 * date out of range) is stored as its reason, so the rater sees why.
 */
export async function checkOfTest(user: Pick<User, 'id' | 'name'> | null, project: ProjectSnapshot, test: TestSnapshot, generation?: number): Promise<{ stored: StoredCheck, response: CheckResponse | null }> {
  if (test.readings.length === 0) return { stored: NO_CHECK, response: null }
  const parsed = CheckRequest.safeParse(checkRequestOf(project, test))
  if (!parsed.success) {
    const problem = problemsOf(parsed.error)[0]
    return { stored: { ...NO_CHECK, checkProblem: problem ? `${problem.field}: ${problem.reason}` : 'The test cannot be checked.' }, response: null }
  }
  try {
    const response = await checkFor(user, parsed.data, generation)
    return {
      response,
      stored: {
        verdict: response.verdict,
        cfm50: response.metrics.cfm50,
        ach50: response.metrics.ach50,
        ruleSetVersionId: response.ruleSetVersion?.id ?? null,
        checkedAt: new Date(response.checkedAt),
        check: JSON.stringify(response),
        checkProblem: null,
      },
    }
  }
  catch (error) {
    const status = (error as { statusCode?: number }).statusCode
    if (status === 400 || status === 422) return { stored: { ...NO_CHECK, checkProblem: (error as Error).message }, response: null }
    throw error
  }
}

/** The check summary a list or the plot needs, from a stored check. */
export function checkSummaryOf(row: Pick<TestRecordRow, 'check'>): TestCheckSummary | null {
  if (!row.check) return null
  const c = JSON.parse(row.check) as CheckResponse
  const first = c.rules[0]
  return {
    verdict: c.verdict,
    cfm50: c.metrics.cfm50,
    ach50: c.metrics.ach50,
    cfm50PerEnclosureArea: c.metrics.cfm50PerEnclosureArea,
    limit: first ? { metric: first.metric, value: first.limit, summary: first.summary, citation: first.citation } : null,
    ruleSetVersion: c.ruleSetVersion,
    checkedAt: c.checkedAt,
  }
}

/** Projects are the rater's own (admins see all); plan reviewers see filings, not projects (403 by role). */
export async function findProjectFor(user: User, id: number): Promise<ProjectRow> {
  const db = await useDb()
  const row = await db.query.projects.findFirst({ where: user.role === 'admin' ? eq(projects.id, id) : and(eq(projects.id, id), eq(projects.ownerId, user.id)) })
  if (!row) throw rowNotFound('project', id)
  return row
}

export async function findTestFor(user: User, id: number): Promise<{ test: TestRecordRow, project: ProjectRow }> {
  const db = await useDb()
  const [row] = await db.select({ test: testRecords, project: projects }).from(testRecords)
    .innerJoin(projects, eq(projects.id, testRecords.projectId))
    .where(user.role === 'admin' ? eq(testRecords.id, id) : and(eq(testRecords.id, id), eq(projects.ownerId, user.id)))
  if (!row) throw rowNotFound('test', id)
  return row
}

/** The filing of a test that freezes it, if any. */
export async function freezingFiling(testId: number): Promise<{ id: number, status: FilingState } | null> {
  const db = await useDb()
  const row = await db.query.filings.findFirst({ columns: { id: true, status: true }, where: eq(filings.testId, testId) })
  return row && FROZEN_STATES.includes(row.status) ? row : null
}

/** Any filing of the project that freezes it (its address, permit and geometry are on file). */
export async function projectFreezingFiling(projectId: number): Promise<{ id: number, status: FilingState } | null> {
  const db = await useDb()
  const row = await db.query.filings.findFirst({ columns: { id: true, status: true }, where: and(eq(filings.projectId, projectId), inArray(filings.status, [...FROZEN_STATES])) })
  return row ?? null
}

export async function projectInfo(row: ProjectRow): Promise<ProjectInfo> {
  const db = await useDb()
  const [owner, jurisdiction, covering] = await Promise.all([
    db.query.users.findFirst({ columns: { name: true }, where: eq(users.id, row.ownerId) }),
    row.jurisdictionId === null ? undefined : db.query.jurisdictions.findFirst({ columns: { name: true }, where: eq(jurisdictions.id, row.jurisdictionId) }),
    jurisdictionsCovering(row.countyFips),
  ])
  return {
    ...projectSnapshotOf(row),
    id: row.id,
    ownerId: row.ownerId,
    ownerName: owner?.name ?? '',
    jurisdictionName: jurisdiction?.name ?? null,
    jurisdictionChoices: covering.length > 1 ? covering : [],
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
  }
}

export function uploadInfo(row: UploadRow): UploadInfo {
  return {
    id: row.id,
    testId: row.testId,
    kind: row.kind,
    name: row.name,
    contentType: row.contentType,
    size: row.size,
    sha256: row.sha256,
    createdAt: row.createdAt.toISOString(),
    url: `/api/uploads/${row.id}`,
  }
}

export async function uploadsOfTest(testId: number): Promise<UploadRow[]> {
  const db = await useDb()
  return db.select().from(uploads).where(eq(uploads.testId, testId)).orderBy(desc(uploads.id))
}
