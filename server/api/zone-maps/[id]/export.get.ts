import { IdParams } from '#shared/schemas/rule-tables'
import { zoneMapToCsv } from '#shared/rules/csv'

/** The zone map as CSV (county_fips, zone, county_name, state), formula cells neutralised. */
export default defineEventHandler(async (event) => {
  await requireUser(event)
  const { id } = paramsAs(event, IdParams)
  const map = await findZoneMapOr404(id)
  const rows = await loadZoneRows(id)
  return sendCsv(event, `zone-map-${map.name}-r${map.revision}.csv`, zoneMapToCsv(rows))
})
