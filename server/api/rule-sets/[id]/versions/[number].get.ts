import { VersionParams } from '#shared/schemas/rule-tables'

/** A published version, read-only forever. */
export default defineEventHandler(async (event) => {
  await requireUser(event)
  const { id, number } = paramsAs(event, VersionParams)
  await findRuleSetOr404(id)
  const row = await versionOr404(id, number)
  return { ...publicVersion(row), rules: rulesOfVersion(row) }
})
