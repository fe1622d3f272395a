import { EditionBody, IdParams } from '#shared/schemas/rule-tables'
import { adoptedEditions } from '../../../database/schema'

/** Adopts a code edition for a period; periods of one jurisdiction may not overlap. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id } = paramsAs(event, IdParams)
  const body = await readBodyAs(event, EditionBody)
  await findJurisdictionOr404(id)
  await checkEdition(id, body, undefined)
  const db = await useDb()
  const [row] = await db.insert(adoptedEditions).values({ ...body, jurisdictionId: id, zoneMapId: body.zoneMapId ?? null, effectiveUntil: body.effectiveUntil ?? null }).returning()
  await runBatch([
    bumpGeneration(db),
    audit(db, user, 'jurisdiction.edition.add', 'jurisdiction', id, `Adopted ${body.name} from ${body.effectiveFrom}${body.effectiveUntil ? ` until ${body.effectiveUntil}` : ''}`, null, row),
  ])
  setResponseStatus(event, 201)
  return row
})
