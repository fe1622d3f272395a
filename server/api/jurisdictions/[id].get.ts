import { IdParams } from '#shared/schemas/rule-tables'

export default defineEventHandler(async (event) => {
  await requireUser(event)
  const { id } = paramsAs(event, IdParams)
  return jurisdictionDetail(id)
})
