import { DiffQuery, IdParams } from '#shared/schemas/rule-tables'
import { diffRules } from '#shared/rules/table'

/** The difference between two versions (or a version and the draft): added, removed, changed rules. */
export default defineEventHandler(async (event) => {
  await requireUser(event)
  const { id } = paramsAs(event, IdParams)
  const { from, to } = queryAs(event, DiffQuery)
  await findRuleSetOr404(id)
  const rulesAt = async (ref: number | 'draft') => (ref === 'draft' ? loadDraft(id) : rulesOfVersion(await versionOr404(id, ref)))
  return { from, to, ...diffRules(await rulesAt(from), await rulesAt(to)) }
})
