import { IdParams } from '#shared/schemas/rule-tables'

/** Every row of a zone map (the table pages, sorts and filters them in the browser). */
export default defineEventHandler(async (event) => {
  await requireUser(event)
  const { id } = paramsAs(event, IdParams)
  const map = await findZoneMapOr404(id)
  return { zoneMapId: id, revision: map.revision, rows: await loadZoneRows(id) }
})
