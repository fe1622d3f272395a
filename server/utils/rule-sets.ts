import type { User } from '#auth-utils'
import { eq, sql } from 'drizzle-orm'
import { diffRules, ruleRowProblems, rulesEqual, type RuleRow } from '../../shared/rules/table'
import { draftRules, ruleSets, ruleSetVersions } from '../database/schema'

/** Replaces the draft with `rules` in one transaction, audited with the rules before and after. */
export async function saveDraft(user: User, ruleSetId: number, rules: RuleRow[], baseRevision: number | undefined, action: string) {
  const set = await findRuleSetOr404(ruleSetId)
  if (baseRevision !== undefined && baseRevision !== set.draftRevision) {
    throw conflict(`The draft was saved by someone else since you opened it (revision ${set.draftRevision}, yours ${baseRevision}). Reload to see it, then make your change again.`, 'baseRevision')
  }
  const before = await loadDraft(ruleSetId)
  const diff = diffRules(before, rules)
  const db = await useDb()
  const statements: Statement[] = [db.delete(draftRules).where(eq(draftRules.ruleSetId, ruleSetId))]
  for (const part of chunks(draftValues(ruleSetId, rules), 200)) statements.push(db.insert(draftRules).values(part))
  statements.push(db.update(ruleSets).set({ draftRevision: sql`${ruleSets.draftRevision} + 1`, updatedAt: new Date() }).where(eq(ruleSets.id, ruleSetId)))
  statements.push(audit(db, user, action, 'rule-set', ruleSetId,
    `Draft saved: ${diff.added.length} added, ${diff.changed.length} changed, ${diff.removed.length} removed`, before, rules))
  await runBatch(statements)
  return { draftRevision: set.draftRevision + 1, rules, added: diff.added.length, changed: diff.changed.length, removed: diff.removed.length }
}

/** Freezes the draft as the next version. Refuses an empty draft or one equal to the latest version. */
export async function publishDraft(user: User, ruleSetId: number, note: string) {
  const set = await findRuleSetOr404(ruleSetId)
  const draft = await loadDraft(ruleSetId)
  if (draft.length === 0) throw badRequest([{ field: 'rules', reason: 'the draft has no rules; add at least one before publishing' }])
  const problems = draft.flatMap((r, i) => ruleRowProblems(r).map(p => ({ field: `rules.${i}.${p.field}`, reason: p.reason })))
  if (problems.length) throw badRequest(problems)
  const latest = await latestVersion(ruleSetId)
  if (latest && rulesEqual(rulesOfVersion(latest), draft)) throw conflict(`Nothing to publish: the draft is the same as version ${latest.number}.`)
  const number = (latest?.number ?? 0) + 1
  const db = await useDb()
  try {
    await runBatch([
      db.insert(ruleSetVersions).values({ ruleSetId, number, note, rules: JSON.stringify(draft), publishedById: user.id, publishedByName: user.name }),
      bumpGeneration(db),
      audit(db, user, 'rule-set.publish', 'rule-set', ruleSetId, `Published "${set.name}" version ${number}: ${note}`,
        latest ? { version: latest.number, rules: rulesOfVersion(latest) } : null, { version: number, note, rules: draft }),
    ])
  }
  catch (error) {
    // Two admins publishing at once: the unique (rule set, number) index lets one win.
    if (isUniqueViolation(error)) throw conflict(`Version ${number} was just published by someone else. Reload and try again.`)
    throw error
  }
  const row = await versionOr404(ruleSetId, number)
  return { ...publicVersion(row), rules: draft }
}
