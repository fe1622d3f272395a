import { asc, sql } from 'drizzle-orm'
import { jurisdictions } from '../../database/schema'

export default defineEventHandler(async (event) => {
  await requireUser(event)
  const db = await useDb()
  // Correlated subqueries name the outer table literally (drizzle leaves a one-table column unqualified).
  const rows = await db.select({
    id: jurisdictions.id,
    name: jurisdictions.name,
    kind: jurisdictions.kind,
    stateCode: jurisdictions.stateCode,
    zoneMapId: jurisdictions.zoneMapId,
    countyCount: sql<number>`(select count(*) from jurisdiction_counties c where c.jurisdiction_id = jurisdictions.id)`,
    editionCount: sql<number>`(select count(*) from adopted_editions e where e.jurisdiction_id = jurisdictions.id)`,
  }).from(jurisdictions).orderBy(asc(jurisdictions.name))
  return rows
})
