import { desc, eq, inArray } from 'drizzle-orm'
import type { ProjectSummary } from '#shared/filings'
import { filings, projects, testRecords, users } from '../../database/schema'

// A rater's projects (admins: everyone's), most recently changed first.
export default defineEventHandler(async (event): Promise<ProjectSummary[]> => {
  const user = await requireRole(event, 'rater', 'admin')
  const db = await useDb()
  const rows = await db.select({ project: projects, ownerName: users.name }).from(projects)
    .innerJoin(users, eq(users.id, projects.ownerId))
    .where(user.role === 'admin' ? undefined : eq(projects.ownerId, user.id))
    .orderBy(desc(projects.updatedAt), desc(projects.id)).limit(500)
  const ids = rows.map(r => r.project.id)
  if (ids.length === 0) return []
  const [tests, filingRows] = await Promise.all([
    db.select({ id: testRecords.id, projectId: testRecords.projectId, testedOn: testRecords.testedOn, stage: testRecords.stage, verdict: testRecords.verdict, ach50: testRecords.ach50 })
      .from(testRecords).where(inArray(testRecords.projectId, ids)).orderBy(desc(testRecords.testedOn), desc(testRecords.id)),
    db.select({ id: filings.id, projectId: filings.projectId, status: filings.status }).from(filings)
      .where(inArray(filings.projectId, ids)).orderBy(desc(filings.updatedAt), desc(filings.id)),
  ])
  const counts = new Map<number, number>()
  for (const t of tests) counts.set(t.projectId, (counts.get(t.projectId) ?? 0) + 1)
  return rows.map(({ project: p, ownerName }) => {
    const latest = tests.find(t => t.projectId === p.id)
    const filing = filingRows.find(f => f.projectId === p.id)
    return {
      id: p.id,
      addressLine: p.addressLine,
      city: p.city,
      stateCode: p.stateCode,
      permitNumber: p.permitNumber,
      permitDate: p.permitDate,
      builderCompany: p.builderCompany,
      ownerName,
      testCount: counts.get(p.id) ?? 0,
      latestTest: latest ? { id: latest.id, testedOn: latest.testedOn, stage: latest.stage, verdict: latest.verdict, ach50: latest.ach50 } : null,
      latestFiling: filing ? { id: filing.id, status: filing.status } : null,
      updatedAt: p.updatedAt.toISOString(),
    }
  })
})
