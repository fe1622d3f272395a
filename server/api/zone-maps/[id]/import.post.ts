import { IdParams, ImportQuery, ZoneImportBody } from '#shared/schemas/rule-tables'

/**
 * Imports a zone-map CSV, all or nothing. Body: JSON { mode, csv, columns? } or raw text/csv with
 * ?mode=replace|merge. 400 lists every bad row (line, column, reason); 413 over the size limit.
 */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id } = paramsAs(event, IdParams)
  const started = performance.now()
  const raw = await readImportBody(event)
  let input: { mode: 'replace' | 'merge', csv: string, columns?: Record<string, string | undefined> }
  if ('csv' in raw) {
    const { mode } = queryAs(event, ImportQuery)
    input = { mode, csv: raw.csv }
  }
  else {
    const parsed = ZoneImportBody.safeParse(raw.json)
    if (!parsed.success) throw badRequest(problemsOf(parsed.error))
    input = parsed.data
  }
  const result = await importZoneMap(user, id, input.mode, input.csv, input.columns)
  return { ...result, timingMs: timing(event, 'import', started) }
})
