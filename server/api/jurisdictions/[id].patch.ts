import { and, eq, ne } from 'drizzle-orm'
import { IdParams, JurisdictionBody } from '#shared/schemas/rule-tables'
import { jurisdictions } from '../../database/schema'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id } = paramsAs(event, IdParams)
  const body = await readBodyAs(event, JurisdictionBody)
  const before = await findJurisdictionOr404(id)
  await checkZoneMapRef('zoneMapId', body.zoneMapId)
  const db = await useDb()
  if (await db.query.jurisdictions.findFirst({ where: and(eq(jurisdictions.name, body.name), ne(jurisdictions.id, id)) })) throw conflict(`name: a jurisdiction is already called "${body.name}".`, 'name')
  const values = { ...body, contactEmail: body.contactEmail === undefined ? before.contactEmail : body.contactEmail, zoneMapId: body.zoneMapId === undefined ? before.zoneMapId : body.zoneMapId }
  await runBatch([
    db.update(jurisdictions).set({ ...values, updatedAt: new Date() }).where(eq(jurisdictions.id, id)),
    bumpGeneration(db),
    audit(db, user, 'jurisdiction.update', 'jurisdiction', id, `Updated jurisdiction "${values.name}"`,
      { name: before.name, kind: before.kind, stateCode: before.stateCode, contactEmail: before.contactEmail, zoneMapId: before.zoneMapId, notes: before.notes }, values),
  ])
  return jurisdictionDetail(id)
})
