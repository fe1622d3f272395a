import { and, eq, inArray } from 'drizzle-orm'
import { z } from 'zod'
import { IdParams } from '#shared/schemas/people'
import { mailOutbox } from '../../../database/schema'

const Body = z.strictObject({
  // A corrected recipient, e.g. after a jurisdiction's contact address bounced.
  to: z.email('must be an e-mail address').max(254, 'must be at most 254 characters').optional(),
})

// Admins: send a queued or failed notice again now, to its address or a corrected one.
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  const { id } = paramsAs(event, IdParams)
  const { to } = await readBodyAs(event, Body)
  const db = await useDb()
  const result = await db.update(mailOutbox).set({ status: 'queued', nextAttemptAt: new Date(), ...(to ? { toAddress: to } : {}) })
    .where(and(eq(mailOutbox.id, id), inArray(mailOutbox.status, ['queued', 'failed'])))
  if (result.rowsAffected !== 1) throw createError({ statusCode: 404, statusMessage: 'Not Found', message: `No queued or failed mail ${id}.` })
  kickMail()
  return { ok: true }
})
