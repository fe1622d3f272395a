import { DecisionBody } from '#shared/filings'
import { IdParams } from '#shared/schemas/people'

// Accept (certificate issued) or return with a reason. The version the reviewer saw must still be
// current: the second of two simultaneous decisions gets 409 and changes nothing.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'reviewer')
  const { id } = paramsAs(event, IdParams)
  const body = await readBodyAs(event, DecisionBody)
  const filing = await findFilingFor(user, id)
  await decideFiling(event, user, filing, body.decision, body.reason, body.version)
  return filingDetail(event, user, await findFilingFor(user, id))
})
