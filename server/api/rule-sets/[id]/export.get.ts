import { ExportQuery, IdParams } from '#shared/schemas/rule-tables'
import { limitsToCsv } from '#shared/rules/csv'

/** The draft (default) or a version as a limits CSV; formula cells neutralised. */
export default defineEventHandler(async (event) => {
  await requireUser(event)
  const { id } = paramsAs(event, IdParams)
  const { version } = queryAs(event, ExportQuery)
  const set = await findRuleSetOr404(id)
  const rules = version === 'draft' ? await loadDraft(id) : rulesOfVersion(await versionOr404(id, version))
  return sendCsv(event, `limits-${set.name}-${version === 'draft' ? 'draft' : `v${version}`}.csv`, limitsToCsv(rules))
})
