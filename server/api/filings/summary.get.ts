import { sql } from 'drizzle-orm'
import { WAITING_STATES, type FilingState, type FilingSummaryCounts } from '#shared/filings'
import { filings } from '../../database/schema'

// Counts by state and the latest five, for the dashboards.
export default defineEventHandler(async (event): Promise<FilingSummaryCounts> => {
  const user = await requireUser(event)
  const db = await useDb()
  const scope = filingScope(user)
  const counts = await db.select({ status: filings.status, n: sql<number>`count(*)` }).from(filings).where(scope).groupBy(filings.status)
  const byStatus: Partial<Record<FilingState, number>> = {}
  for (const c of counts) byStatus[c.status] = Number(c.n)
  const waiting = WAITING_STATES.reduce((sum, s) => sum + (byStatus[s] ?? 0), 0)
  const latest = await queuePage(user, { sort: 'submittedAt', dir: 'desc', page: 1, pageSize: 5 }, false)
  return { byStatus, waiting, latest: latest.rows }
})
