import { and, desc, eq, type SQL } from 'drizzle-orm'
import { AuditQuery } from '#shared/schemas/rule-tables'
import { auditLog } from '../database/schema'

/** The audit log of the rule tables, newest first; before/after as JSON. Admins only. */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  const query = queryAs(event, AuditQuery)
  const where: SQL[] = []
  if (query.entityType) where.push(eq(auditLog.entityType, query.entityType))
  if (query.entityId) where.push(eq(auditLog.entityId, query.entityId))
  const db = await useDb()
  const rows = await db.select().from(auditLog).where(where.length ? and(...where) : undefined).orderBy(desc(auditLog.id)).limit(query.limit)
  return rows.map(r => ({
    ...r,
    at: r.at.toISOString(),
    before: r.before === null ? null : JSON.parse(r.before) as unknown,
    after: r.after === null ? null : JSON.parse(r.after) as unknown,
  }))
})
