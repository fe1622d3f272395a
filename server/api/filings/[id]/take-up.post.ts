import { TakeUpBody } from '#shared/filings'
import { IdParams } from '#shared/schemas/people'

// A plan reviewer takes a filed record up for review (filed/refiled → in-review).
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'reviewer')
  const { id } = paramsAs(event, IdParams)
  const { version } = await readBodyAs(event, TakeUpBody)
  const filing = await findFilingFor(user, id)
  await takeUpFiling(user, filing, version)
  return filingDetail(event, user, await findFilingFor(user, id))
})
