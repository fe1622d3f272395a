import { eq } from 'drizzle-orm'
import { TestBody } from '#shared/filings'
import { IdParams } from '#shared/schemas/people'
import { projects, testRecords } from '../../../database/schema'

// A new test of the project, checked at once when it has readings.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'rater')
  const { id } = paramsAs(event, IdParams)
  const body = await readBodyAs(event, TestBody)
  const project = await findProjectFor(user, id)
  const test = testSnapshotOfBody(body)
  const { stored } = await checkOfTest(user, projectSnapshotOf(project), test, knownRulebookGeneration(event))
  const db = await useDb()
  const [row] = await db.insert(testRecords).values({ ...testValues(test), ...stored, projectId: project.id }).returning()
  await db.update(projects).set({ updatedAt: new Date() }).where(eq(projects.id, project.id))
  setResponseStatus(event, 201)
  return testRecordOf(user, row!.id)
})
