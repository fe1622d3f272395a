import { eq } from 'drizzle-orm'
import { ZoneMapBody } from '#shared/schemas/rule-tables'
import { zoneMaps } from '../../database/schema'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const body = await readBodyAs(event, ZoneMapBody)
  const db = await useDb()
  if (await db.query.zoneMaps.findFirst({ where: eq(zoneMaps.name, body.name) })) throw conflict(`name: a zone map is already called "${body.name}".`, 'name')
  const [row] = await db.insert(zoneMaps).values(body).returning()
  await runBatch([audit(db, user, 'zone-map.create', 'zone-map', row!.id, `Created zone map "${row!.name}"`, null, body)])
  setResponseStatus(event, 201)
  return row
})
