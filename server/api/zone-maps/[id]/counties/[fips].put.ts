import { eq, sql } from 'drizzle-orm'
import { FipsParams, ZoneCountyBody } from '#shared/schemas/rule-tables'
import { stateForFips } from '#shared/rules/fips'
import { zoneMapCounties, zoneMaps } from '../../../../database/schema'

/** Adds a county to a map or changes its zone / name / state (inline edit). */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id, fips } = paramsAs(event, FipsParams)
  const body = await readBodyAs(event, ZoneCountyBody)
  await findZoneMapOr404(id)
  const fromFips = stateForFips(fips)
  if (body.stateCode && fromFips && body.stateCode !== fromFips) {
    throw badRequest([{ field: 'stateCode', reason: `${body.stateCode} does not match the FIPS state code ${fips.slice(0, 2)} (${fromFips})` }])
  }
  const before = await countyRow(id, fips)
  const after = {
    countyFips: fips,
    zone: body.zone,
    countyName: body.countyName === undefined ? before?.countyName ?? null : (body.countyName || null),
    stateCode: body.stateCode === undefined ? before?.stateCode ?? fromFips ?? null : body.stateCode ?? fromFips ?? null,
  }
  const db = await useDb()
  await runBatch([
    db.insert(zoneMapCounties).values({ ...after, zoneMapId: id }).onConflictDoUpdate({
      target: [zoneMapCounties.zoneMapId, zoneMapCounties.countyFips],
      set: { zone: after.zone, countyName: after.countyName, stateCode: after.stateCode },
    }),
    db.update(zoneMaps).set({ revision: sql`${zoneMaps.revision} + 1`, updatedAt: new Date() }).where(eq(zoneMaps.id, id)),
    bumpGeneration(db),
    audit(db, user, before ? 'zone-map.row.update' : 'zone-map.row.add', 'zone-map', id,
      before ? `County ${fips}: zone ${before.zone} → ${after.zone}` : `Added county ${fips} in zone ${after.zone}`, before ?? null, after),
  ])
  setResponseStatus(event, before ? 200 : 201)
  return after
})
