import { eq } from 'drizzle-orm'
import { IdParams } from '#shared/schemas/rule-tables'
import { adoptedEditions } from '../../database/schema'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id } = paramsAs(event, IdParams)
  const before = await findEditionOr404(id)
  const db = await useDb()
  await runBatch([
    db.delete(adoptedEditions).where(eq(adoptedEditions.id, id)),
    bumpGeneration(db),
    audit(db, user, 'jurisdiction.edition.delete', 'jurisdiction', before.jurisdictionId, `Removed ${before.name} (${before.effectiveFrom} – ${before.effectiveUntil ?? 'open'})`, before, null),
  ])
  setResponseStatus(event, 204)
  return null
})
