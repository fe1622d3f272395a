import { eq } from 'drizzle-orm'
import { JurisdictionBody } from '#shared/schemas/rule-tables'
import { jurisdictions } from '../../database/schema'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const body = await readBodyAs(event, JurisdictionBody)
  await checkZoneMapRef('zoneMapId', body.zoneMapId)
  const db = await useDb()
  if (await db.query.jurisdictions.findFirst({ where: eq(jurisdictions.name, body.name) })) throw conflict(`name: a jurisdiction is already called "${body.name}".`, 'name')
  const [row] = await db.insert(jurisdictions).values({ ...body, contactEmail: body.contactEmail ?? null, zoneMapId: body.zoneMapId ?? null }).returning()
  await runBatch([bumpGeneration(db), audit(db, user, 'jurisdiction.create', 'jurisdiction', row!.id, `Created jurisdiction "${row!.name}"`, null, body)])
  setResponseStatus(event, 201)
  return row
})
