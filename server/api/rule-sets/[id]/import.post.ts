import { IdParams, ImportQuery, LimitsImportBody } from '#shared/schemas/rule-tables'
import { mapLimitRecords, readCsv } from '#shared/rules/csv'

/**
 * Imports a limits CSV into the draft, all or nothing: `replace` makes the draft exactly the
 * file; `merge` updates rules with the same key and appends new ones.
 */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id } = paramsAs(event, IdParams)
  const started = performance.now()
  const raw = await readImportBody(event)
  let input: { mode: 'replace' | 'merge', csv: string }
  if ('csv' in raw) input = { mode: queryAs(event, ImportQuery).mode, csv: raw.csv }
  else {
    const parsed = LimitsImportBody.safeParse(raw.json)
    if (!parsed.success) throw badRequest(problemsOf(parsed.error))
    input = parsed.data
  }
  await findRuleSetOr404(id)
  const mapped = mapLimitRecords(readCsv(input.csv))
  if (mapped.problems.length) throw importRejected(mapped.problems)
  const incoming = mapped.rows.map(r => r.rule)
  let rules = incoming
  if (input.mode === 'merge') {
    const current = await loadDraft(id)
    const byKey = new Map(incoming.map(r => [r.key, r]))
    rules = [...current.map(r => byKey.get(r.key) ?? r), ...incoming.filter(r => !current.some(c => c.key === r.key))]
  }
  if (rules.length > 500) throw importRejected([{ line: 1, column: '(file)', reason: `the rule set would hold ${rules.length} rules; at most 500` }])
  const saved = await saveDraft(user, id, rules, undefined, `rule-set.import.${input.mode}`)
  return { ...saved, mode: input.mode, rowsInFile: incoming.length, warnings: mapped.warnings, timingMs: timing(event, 'import', started) }
})
