import { IdParams, DraftBody } from '#shared/schemas/rule-tables'

/** Saves the whole draft (all rules, in order), all or nothing; 409 when someone saved in between. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id } = paramsAs(event, IdParams)
  const body = await readBodyAs(event, DraftBody)
  return saveDraft(user, id, body.rules, body.baseRevision, 'rule-set.draft.save')
})
