import { FilingNoteBody } from '#shared/filings'
import { IdParams } from '#shared/schemas/people'

// File (draft → filed) or file again after a return (returned → refiled): a new frozen revision.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'rater')
  const { id } = paramsAs(event, IdParams)
  const { note } = await readBodyAs(event, FilingNoteBody)
  const filing = await findFilingFor(user, id)
  await submitFiling(event, user, filing, note)
  return filingDetail(event, user, await findFilingFor(user, id))
})
