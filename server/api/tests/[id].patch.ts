import { eq } from 'drizzle-orm'
import { TestBody } from '#shared/filings'
import { IdParams } from '#shared/schemas/people'
import { projects, testRecords } from '../../database/schema'

// The whole test record again, re-checked. Frozen (409) while its filing is with the jurisdiction
// or accepted: a change after a return is filed again as a new revision.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'rater')
  const { id } = paramsAs(event, IdParams)
  const body = await readBodyAs(event, TestBody)
  const { test, project } = await findTestFor(user, id)
  const frozen = await freezingFiling(test.id)
  if (frozen) throw frozenConflict(frozen.status, 'test')
  const next = testSnapshotOfBody(body)
  const { stored } = await checkOfTest(user, projectSnapshotOf(project), next, knownRulebookGeneration(event))
  const db = await useDb()
  await db.batch([
    db.update(testRecords).set({ ...testValues(next), ...stored }).where(eq(testRecords.id, test.id)),
    db.update(projects).set({ updatedAt: new Date() }).where(eq(projects.id, project.id)),
  ])
  return testRecordOf(user, id)
})
