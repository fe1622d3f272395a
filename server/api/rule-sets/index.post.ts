import { eq } from 'drizzle-orm'
import { RuleSetBody } from '#shared/schemas/rule-tables'
import { ruleSets } from '../../database/schema'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const body = await readBodyAs(event, RuleSetBody)
  const db = await useDb()
  if (await db.query.ruleSets.findFirst({ where: eq(ruleSets.name, body.name) })) throw conflict(`name: a rule set is already called "${body.name}".`, 'name')
  const [row] = await db.insert(ruleSets).values(body).returning()
  await runBatch([audit(db, user, 'rule-set.create', 'rule-set', row!.id, `Created rule set "${row!.name}"`, null, body)])
  setResponseStatus(event, 201)
  return row
})
