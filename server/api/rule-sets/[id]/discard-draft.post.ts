import { IdParams } from '#shared/schemas/rule-tables'

/** Throws the draft's unpublished changes away: the draft becomes the latest version again. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id } = paramsAs(event, IdParams)
  await findRuleSetOr404(id)
  const latest = await latestVersion(id)
  if (!latest) throw conflict('There is no published version to go back to.')
  return saveDraft(user, id, rulesOfVersion(latest), undefined, 'rule-set.draft.discard')
})
