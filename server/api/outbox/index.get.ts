import { desc, inArray } from 'drizzle-orm'
import { z } from 'zod'
import type { OutboxRow } from '#shared/filings'
import { mailCaptures, mailOutbox } from '../../database/schema'

const Query = z.object({ limit: z.coerce.number('must be a number').int().min(1).max(500, 'must be at most 500').default(100) })

// Admins: the notices queued and sent, newest first, each with what the capture server received.
export default defineEventHandler(async (event): Promise<OutboxRow[]> => {
  await requireRole(event, 'admin')
  const { limit } = queryAs(event, Query)
  const db = await useDb()
  const rows = await db.select().from(mailOutbox).orderBy(desc(mailOutbox.id)).limit(limit)
  const ids = rows.map(r => r.messageId).filter((m): m is string => m !== null)
  const captured = ids.length ? await db.select().from(mailCaptures).where(inArray(mailCaptures.messageId, ids)) : []
  const byId = new Map(captured.map(c => [c.messageId, c]))
  return rows.map((r) => {
    const c = r.messageId ? byId.get(r.messageId) : undefined
    return {
      id: r.id,
      kind: r.kind,
      to: r.toAddress,
      subject: r.subject,
      text: r.body,
      status: r.status,
      attempts: r.attempts,
      lastError: r.lastError,
      createdAt: r.createdAt.toISOString(),
      nextAttemptAt: r.nextAttemptAt.toISOString(),
      sentAt: r.sentAt?.toISOString() ?? null,
      filingId: r.filingId,
      captured: c ? { receivedAt: c.receivedAt.toISOString(), envelopeTo: JSON.parse(c.envelopeTo) as string[], raw: c.raw } : null,
    }
  })
})
