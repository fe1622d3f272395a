import { asc } from 'drizzle-orm'
import { jurisdictions } from '../../database/schema'

export default defineEventHandler(async (event) => {
  await requireUser(event)
  const db = await useDb()
  const rows = await db.select({
    id: jurisdictions.id,
    name: jurisdictions.name,
    kind: jurisdictions.kind,
    stateCode: jurisdictions.stateCode,
  }).from(jurisdictions).orderBy(asc(jurisdictions.name))
  return rows
})
