import { desc, eq, sql } from 'drizzle-orm'
import { IdParams } from '#shared/schemas/rule-tables'
import { rulesEqual } from '#shared/rules/table'
import { ruleSetVersions } from '../../database/schema'

/** A rule set: its draft rules, its versions (newest first) and whether the draft has unpublished changes. */
export default defineEventHandler(async (event) => {
  await requireUser(event)
  const { id } = paramsAs(event, IdParams)
  const set = await findRuleSetOr404(id)
  const db = await useDb()
  const draft = await loadDraft(id)
  const versions = await db.select().from(ruleSetVersions).where(eq(ruleSetVersions.ruleSetId, id)).orderBy(desc(ruleSetVersions.number))
  const latest = versions[0]
  const adoptedBy = await db.all<{ id: number, name: string, jurisdictionId: number, jurisdictionName: string, effectiveFrom: string, effectiveUntil: string | null }>(sql`
    select e.id, e.name, e.jurisdiction_id as jurisdictionId, j.name as jurisdictionName, e.effective_from as effectiveFrom, e.effective_until as effectiveUntil
    from adopted_editions e join jurisdictions j on j.id = e.jurisdiction_id where e.rule_set_id = ${id} order by j.name, e.effective_from`)
  return {
    ...set,
    draft,
    versions: versions.map(publicVersion),
    latestVersion: latest ? latest.number : null,
    unpublishedChanges: latest ? !rulesEqual(rulesOfVersion(latest), draft) : draft.length > 0,
    adoptedBy,
  }
})
