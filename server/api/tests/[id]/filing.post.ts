import { randomUUID } from 'node:crypto'
import { eq } from 'drizzle-orm'
import { FilingNoteBody } from '#shared/filings'
import { IdParams } from '#shared/schemas/people'
import { filings } from '../../../database/schema'

// Prepare a filing of the test (a draft the jurisdiction does not see yet). One filing per test.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'rater')
  const { id } = paramsAs(event, IdParams)
  await readBodyAs(event, FilingNoteBody)
  const { test, project } = await findTestFor(user, id)
  const db = await useDb()
  const existing = await db.query.filings.findFirst({ columns: { id: true }, where: eq(filings.testId, test.id) })
  if (existing) throw createError({ statusCode: 409, statusMessage: 'Conflict', message: `This test already has filing ${existing.id}.`, data: { field: '(body)', reason: 'already filed', filingId: existing.id } })
  const { response } = await checkOfTest(user, projectSnapshotOf(project), testSnapshotOf(test), knownRulebookGeneration(event))
  if (!response) throw badRequest([{ field: 'test.readings', reason: test.checkProblem ?? 'the test has no readings yet: type them or import a readings file first' }])
  if (!response.jurisdiction) throw createError({ statusCode: 422, statusMessage: 'Unprocessable Entity', message: `No jurisdiction takes this filing: ${response.noRule?.message ?? 'the address is not covered.'}`, data: { field: 'project.address', reason: 'not covered' } })
  const [row] = await db.insert(filings).values({
    testId: test.id,
    projectId: project.id,
    raterId: user.id,
    jurisdictionId: response.jurisdiction.id,
    status: 'draft',
    changeToken: randomUUID(),
    addressLine: project.addressLine,
    city: project.city,
    permitNumber: project.permitNumber,
    permitDate: project.permitDate,
    raterName: user.name,
    stage: test.stage,
    testedOn: test.testedOn,
    zone: response.zone,
    verdict: response.verdict,
    cfm50: response.metrics.cfm50,
    ach50: response.metrics.ach50,
  }).returning()
  setResponseStatus(event, 201)
  return filingDetail(event, user, row!)
})
