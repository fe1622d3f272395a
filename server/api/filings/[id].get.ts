import { IdParams } from '#shared/schemas/people'

// The filing page: the record as filed, Tightwell's recomputation now, revisions, thread, files.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = paramsAs(event, IdParams)
  return filingDetail(event, user, await findFilingFor(user, id))
})
