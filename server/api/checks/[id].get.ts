import { and, eq } from 'drizzle-orm'
import type { CheckResponse } from '#shared/checks'
import { IdParams } from '#shared/schemas/people'
import { checks } from '../../database/schema'

// A stored check, re-opened as it was decided. Someone else's is a 404 (admins may open any).
export default defineEventHandler(async (event): Promise<CheckResponse> => {
  const user = await requireUser(event)
  const { id } = paramsAs(event, IdParams)
  const db = await useDb()
  const row = await db.query.checks.findFirst({
    where: user.role === 'admin' ? eq(checks.id, id) : and(eq(checks.id, id), eq(checks.userId, user.id)),
  })
  if (!row) throw createError({ statusCode: 404, statusMessage: 'Not Found', message: `No check ${id} of yours.` })
  return { ...(JSON.parse(row.response) as Omit<CheckResponse, 'checkId' | 'request'>), request: JSON.parse(row.request) as CheckResponse['request'], checkId: row.id }
})
