import type { H3Event } from 'h3'
import { z } from 'zod'
import { CheckRequest } from '#shared/checks'
import { acceptCheckRequest } from '#shared/checks/accept'

const Query = z.object({
  // ?dryRun=1 answers without storing the check (used by the benchmark and for previews).
  dryRun: z.enum(['0', '1', 'true', 'false'], { error: 'must be 1 or 0' }).optional(),
})

/** `?dryRun=…`: the two plain spellings read straight off the path, anything else through the schema. */
function isDryRun(event: H3Event): boolean {
  const at = event.path.indexOf('?')
  if (at < 0) return false
  const search = event.path.slice(at + 1)
  if (search === 'dryRun=1') return true
  if (search === 'dryRun=0') return false
  const { dryRun } = queryAs(event, Query)
  return dryRun === '1' || dryRun === 'true'
}

// Answers CheckResponse (201 when stored), as JSON text serialised once (see runCheck).
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const dryRun = isDryRun(event)
  const request = await readBodyAs(event, CheckRequest, acceptCheckRequest)
  const { json, checkId } = await runCheck(event, user, request, dryRun)
  if (checkId !== null) setResponseStatus(event, 201)
  setResponseHeader(event, 'content-type', 'application/json')
  return json
})
