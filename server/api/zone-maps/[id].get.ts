import { IdParams } from '#shared/schemas/rule-tables'

export default defineEventHandler(async (event) => {
  await requireUser(event)
  const { id } = paramsAs(event, IdParams)
  const map = await findZoneMapOr404(id)
  return { ...map, usedBy: await zoneMapUsers(id) }
})
