import { asc } from 'drizzle-orm'
import { users } from '../../database/schema'

export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  const db = await useDb()
  const rows = await db.select().from(users).orderBy(asc(users.name))
  return rows.map(publicUser)
})
