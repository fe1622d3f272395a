import { and, eq, inArray } from 'drizzle-orm'
import { IdParams } from '#shared/schemas/people'
import { mailOutbox } from '../../../database/schema'

// Admins: send a queued or failed notice again now.
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  const { id } = paramsAs(event, IdParams)
  const db = await useDb()
  const result = await db.update(mailOutbox).set({ status: 'queued', nextAttemptAt: new Date() })
    .where(and(eq(mailOutbox.id, id), inArray(mailOutbox.status, ['queued', 'failed'])))
  if (result.rowsAffected !== 1) throw createError({ statusCode: 404, statusMessage: 'Not Found', message: `No queued or failed mail ${id}.` })
  kickMail()
  return { ok: true }
})
