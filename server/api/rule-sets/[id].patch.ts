import { and, eq, ne } from 'drizzle-orm'
import { IdParams, RuleSetBody } from '#shared/schemas/rule-tables'
import { ruleSets } from '../../database/schema'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id } = paramsAs(event, IdParams)
  const body = await readBodyAs(event, RuleSetBody)
  const before = await findRuleSetOr404(id)
  const db = await useDb()
  if (await db.query.ruleSets.findFirst({ where: and(eq(ruleSets.name, body.name), ne(ruleSets.id, id)) })) throw conflict(`name: a rule set is already called "${body.name}".`, 'name')
  await runBatch([
    db.update(ruleSets).set({ ...body, updatedAt: new Date() }).where(eq(ruleSets.id, id)),
    bumpGeneration(db),
    audit(db, user, 'rule-set.update', 'rule-set', id, `Renamed or described rule set "${body.name}"`, { name: before.name, code: before.code, edition: before.edition, description: before.description }, body),
  ])
  return findRuleSetOr404(id)
})
