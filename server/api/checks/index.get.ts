import { desc, eq } from 'drizzle-orm'
import type { CheckSummary } from '#shared/checks'
import { checks, jurisdictions } from '../../database/schema'

// "My checks": only the signed-in user's own, newest first.
export default defineEventHandler(async (event): Promise<CheckSummary[]> => {
  const user = await requireUser(event)
  const db = await useDb()
  const rows = await db.select({
    id: checks.id,
    createdAt: checks.createdAt,
    addressLine: checks.addressLine,
    city: checks.city,
    state: checks.stateCode,
    permitDate: checks.permitDate,
    buildingType: checks.buildingType,
    verdict: checks.verdict,
    zone: checks.zone,
    jurisdictionName: jurisdictions.name,
    cfm50: checks.cfm50,
    ach50: checks.ach50,
  }).from(checks)
    .leftJoin(jurisdictions, eq(jurisdictions.id, checks.jurisdictionId))
    .where(eq(checks.userId, user.id))
    .orderBy(desc(checks.id))
    .limit(1000)
  return rows.map(({ createdAt, ...r }) => ({ ...r, checkedAt: createdAt.toISOString() }))
})
