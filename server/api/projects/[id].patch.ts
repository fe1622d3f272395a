import { eq } from 'drizzle-orm'
import { ProjectBody } from '#shared/filings'
import { IdParams } from '#shared/schemas/people'
import { projects, testRecords } from '../../database/schema'

// The whole project again. Frozen while a filing of it is with the jurisdiction or accepted.
// Its tests' checks are redone (address, permit date and geometry decide them), in one batch.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'rater')
  const { id } = paramsAs(event, IdParams)
  const body = await readBodyAs(event, ProjectBody)
  const project = await findProjectFor(user, id)
  const frozen = await projectFreezingFiling(project.id)
  if (frozen) throw frozenConflict(frozen.status, 'project')
  const county = await projectCounty(body, event)
  const values = projectValues(body, county)
  const db = await useDb()
  const next = { ...project, ...values }
  const tests = await db.select().from(testRecords).where(eq(testRecords.projectId, project.id))
  const updates = []
  for (const test of tests) {
    const { stored } = await checkOfTest(user, projectSnapshotOf(next), testSnapshotOf(test), knownRulebookGeneration(event))
    updates.push(db.update(testRecords).set(stored).where(eq(testRecords.id, test.id)))
  }
  await db.batch([db.update(projects).set(values).where(eq(projects.id, project.id)), ...updates])
  return projectDetail(await findProjectFor(user, id))
})
