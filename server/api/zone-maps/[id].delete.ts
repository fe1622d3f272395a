import { eq } from 'drizzle-orm'
import { IdParams } from '#shared/schemas/rule-tables'
import { zoneMaps } from '../../database/schema'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id } = paramsAs(event, IdParams)
  const map = await findZoneMapOr404(id)
  const users = await zoneMapUsers(id)
  if (users.length) throw conflict(`This zone map is in use by ${users.join(', ')}; choose another map there first.`)
  const rows = await loadZoneRows(id)
  const db = await useDb()
  await runBatch([
    db.delete(zoneMaps).where(eq(zoneMaps.id, id)),
    bumpGeneration(db),
    audit(db, user, 'zone-map.delete', 'zone-map', id, `Deleted zone map "${map.name}" (${rows.length} rows)`, { ...map, rowCount: rows.length, rows: rows.slice(0, 1000) }, null),
  ])
  setResponseStatus(event, 204)
  return null
})
