import { eq } from 'drizzle-orm'
import { z } from 'zod'
import { ruleSets } from '../../database/schema'

const Body = z.strictObject({ file: z.string('must be a model table file name').min(1, 'is required'), name: z.string().trim().min(1).max(120).optional() })

/** Creates a rule set whose draft is a shipped model table; the admin reviews it, then publishes. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const body = await readBodyAs(event, Body)
  const model = (await loadModelTables()).find(t => t.file === body.file)
  if (!model) throw badRequest([{ field: 'file', reason: `no model table is called "${body.file}"` }])
  const name = body.name ?? model.name
  const db = await useDb()
  if (await db.query.ruleSets.findFirst({ where: eq(ruleSets.name, name) })) throw conflict(`name: a rule set is already called "${name}".`, 'name')
  const [row] = await db.insert(ruleSets).values({ name, code: model.code, edition: model.edition, description: model.description }).returning()
  await saveDraft(user, row!.id, model.rules, undefined, 'rule-set.create-from-model')
  setResponseStatus(event, 201)
  return findRuleSetOr404(row!.id)
})
