import { and, eq, ne } from 'drizzle-orm'
import { IdParams, ZoneMapBody } from '#shared/schemas/rule-tables'
import { zoneMaps } from '../../database/schema'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id } = paramsAs(event, IdParams)
  const body = await readBodyAs(event, ZoneMapBody)
  const before = await findZoneMapOr404(id)
  const db = await useDb()
  if (await db.query.zoneMaps.findFirst({ where: and(eq(zoneMaps.name, body.name), ne(zoneMaps.id, id)) })) throw conflict(`name: a zone map is already called "${body.name}".`, 'name')
  await runBatch([
    db.update(zoneMaps).set({ ...body, updatedAt: new Date() }).where(eq(zoneMaps.id, id)),
    bumpGeneration(db),
    audit(db, user, 'zone-map.update', 'zone-map', id, `Renamed or described zone map "${body.name}"`, { name: before.name, edition: before.edition, source: before.source }, body),
  ])
  return findZoneMapOr404(id)
})
