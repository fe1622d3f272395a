import { IdParams, PublishBody } from '#shared/schemas/rule-tables'

/** Freezes the draft as the next version, with a note. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id } = paramsAs(event, IdParams)
  const body = await readBodyAs(event, PublishBody)
  const version = await publishDraft(user, id, body.note)
  setResponseStatus(event, 201)
  return version
})
