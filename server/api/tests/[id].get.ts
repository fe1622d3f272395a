import { IdParams } from '#shared/schemas/people'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'rater', 'admin')
  const { id } = paramsAs(event, IdParams)
  return testRecordOf(user, id)
})
