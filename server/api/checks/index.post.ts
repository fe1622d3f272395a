import { z } from 'zod'
import { CheckRequest } from '#shared/checks'

const Query = z.object({
  // ?dryRun=1 answers without storing the check (used by the benchmark and for previews).
  dryRun: z.enum(['0', '1', 'true', 'false'], { error: 'must be 1 or 0' }).optional(),
})

export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { dryRun } = queryAs(event, Query)
  const request = await readBodyAs(event, CheckRequest)
  const response = await runCheck(event, user, request, dryRun === '1' || dryRun === 'true')
  if (response.checkId !== null) setResponseStatus(event, 201)
  return response
})
