import { asc, sql } from 'drizzle-orm'
import { zoneMaps } from '../../database/schema'

export default defineEventHandler(async (event) => {
  await requireUser(event)
  const db = await useDb()
  // Correlated subqueries name the outer table literally (drizzle leaves a one-table column unqualified).
  return db.select({
    id: zoneMaps.id,
    name: zoneMaps.name,
    edition: zoneMaps.edition,
    source: zoneMaps.source,
    revision: zoneMaps.revision,
    rowCount: sql<number>`(select count(*) from zone_map_counties c where c.zone_map_id = zone_maps.id)`,
    updatedAt: zoneMaps.updatedAt,
  }).from(zoneMaps).orderBy(asc(zoneMaps.name))
})
