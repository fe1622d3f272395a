import { and, eq } from 'drizzle-orm'
import { ReadingsImportBody, mapReadings, readCsvTable } from '#shared/filings'
import { IdParams } from '#shared/schemas/people'
import { projects, testRecords, uploads } from '../../../database/schema'

// Step 2: the readings file mapped as the user chose, all or nothing. One bad row → 400 listing
// every problem with its line, and the test keeps its readings.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'rater')
  const { id } = paramsAs(event, IdParams)
  const body = await readBodyAs(event, ReadingsImportBody)
  const { test, project } = await findTestFor(user, id)
  const frozen = await freezingFiling(test.id)
  if (frozen) throw frozenConflict(frozen.status, 'test')
  const db = await useDb()
  const upload = await db.query.uploads.findFirst({ where: and(eq(uploads.id, body.uploadId), eq(uploads.testId, test.id), eq(uploads.kind, 'readings')) })
  if (!upload) throw badRequest([{ field: 'uploadId', reason: `no readings file ${body.uploadId} is attached to this test` }])
  const bytes = await readUploadBytes(upload)
  if (!bytes) throw createError({ statusCode: 410, statusMessage: 'Gone', message: 'The stored readings file is missing; upload it again.' })
  const table = readCsvTable(new TextDecoder('utf-8').decode(bytes))
  const current = testSnapshotOf(test)
  const mapped = mapReadings(table, body, { direction: current.direction, baseline: { before: current.baselineBefore ?? undefined, after: current.baselineAfter ?? undefined } })
  if (mapped.problems.length) {
    const first = mapped.problems[0]!
    const where = first.line > 0 ? `line ${first.line}, ${first.column}` : first.column
    throw createError({
      statusCode: 400,
      statusMessage: 'Bad Request',
      message: `${where}: ${first.reason}${mapped.problems.length > 1 ? ` (and ${mapped.problems.length - 1} more; nothing was imported)` : ' (nothing was imported)'}`,
      data: { field: 'file', reason: first.reason, problems: mapped.problems },
    })
  }
  const next = { ...current, readings: mapped.readings.map(r => ({ pressure: r.pressure, flow: r.flow })) }
  const { stored } = await checkOfTest(user, projectSnapshotOf(project), next, knownRulebookGeneration(event))
  await db.batch([
    db.update(testRecords).set({ readings: JSON.stringify(next.readings), ...stored }).where(eq(testRecords.id, test.id)),
    db.update(projects).set({ updatedAt: new Date() }).where(eq(projects.id, project.id)),
  ])
  return testRecordOf(user, id)
})
