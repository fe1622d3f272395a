import { asc, sql } from 'drizzle-orm'
import { ruleSets } from '../../database/schema'

export default defineEventHandler(async (event) => {
  await requireUser(event)
  const db = await useDb()
  // Correlated subqueries name the outer table literally (drizzle leaves a one-table column unqualified).
  return db.select({
    id: ruleSets.id,
    name: ruleSets.name,
    code: ruleSets.code,
    edition: ruleSets.edition,
    description: ruleSets.description,
    draftRevision: ruleSets.draftRevision,
    ruleCount: sql<number>`(select count(*) from draft_rules r where r.rule_set_id = rule_sets.id)`,
    latestVersion: sql<number | null>`(select max(v.number) from rule_set_versions v where v.rule_set_id = rule_sets.id)`,
    adoptedBy: sql<number>`(select count(*) from adopted_editions e where e.rule_set_id = rule_sets.id)`,
    updatedAt: ruleSets.updatedAt,
  }).from(ruleSets).orderBy(asc(ruleSets.name))
})
