import { QueueQuery } from '#shared/filings'
import { z } from 'zod'

const Query = QueueQuery.extend({ facets: z.enum(['0', '1'], { error: 'must be 1 or 0' }).optional() })

// The review queue (reviewers: their jurisdiction's filings), a rater's filings, or all (admins):
// sorted, filtered and paged in SQL. Server-Timing reports the time spent in the route.
export default defineEventHandler(async (event) => {
  const started = performance.now()
  const user = await requireUser(event)
  const { facets, ...query } = queryAs(event, Query)
  const page = await queuePage(user, query, facets === '1')
  setResponseHeader(event, 'Server-Timing', `queue;dur=${(performance.now() - started).toFixed(2)}`)
  return page
})
