import { ResolveQuery } from '#shared/schemas/rule-tables'

/**
 * Which published rules apply to a place, permit date and building type — the same answer the
 * checker gets from resolveRules(). 200 with ok: false and a reason when none do.
 */
export default defineEventHandler(async (event) => {
  await requireUser(event)
  const query = queryAs(event, ResolveQuery)
  return resolveRules(query)
})
