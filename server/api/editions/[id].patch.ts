import { eq } from 'drizzle-orm'
import { EditionBody, IdParams } from '#shared/schemas/rule-tables'
import { adoptedEditions } from '../../database/schema'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id } = paramsAs(event, IdParams)
  const body = await readBodyAs(event, EditionBody)
  const before = await findEditionOr404(id)
  await checkEdition(before.jurisdictionId, body, id)
  const db = await useDb()
  const values = { ...body, zoneMapId: body.zoneMapId ?? null, effectiveUntil: body.effectiveUntil ?? null }
  await runBatch([
    db.update(adoptedEditions).set({ ...values, updatedAt: new Date() }).where(eq(adoptedEditions.id, id)),
    bumpGeneration(db),
    audit(db, user, 'jurisdiction.edition.update', 'jurisdiction', before.jurisdictionId, `Changed ${values.name} (${values.effectiveFrom} – ${values.effectiveUntil ?? 'open'})`, before, values),
  ])
  return findEditionOr404(id)
})
