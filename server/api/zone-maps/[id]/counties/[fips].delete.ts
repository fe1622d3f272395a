import { and, eq, sql } from 'drizzle-orm'
import { FipsParams } from '#shared/schemas/rule-tables'
import { zoneMapCounties, zoneMaps } from '../../../../database/schema'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id, fips } = paramsAs(event, FipsParams)
  await findZoneMapOr404(id)
  const before = await countyRow(id, fips)
  if (!before) throw createError({ statusCode: 404, statusMessage: 'Not Found', message: `County ${fips} is not on zone map ${id}.` })
  const db = await useDb()
  await runBatch([
    db.delete(zoneMapCounties).where(and(eq(zoneMapCounties.zoneMapId, id), eq(zoneMapCounties.countyFips, fips))),
    db.update(zoneMaps).set({ revision: sql`${zoneMaps.revision} + 1`, updatedAt: new Date() }).where(eq(zoneMaps.id, id)),
    bumpGeneration(db),
    audit(db, user, 'zone-map.row.delete', 'zone-map', id, `Deleted county ${fips} (zone ${before.zone})`, before, null),
  ])
  setResponseStatus(event, 204)
  return null
})
