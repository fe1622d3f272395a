/** The model limit tables shipped with Tightwell (rules/), to start a rule set from. */
export default defineEventHandler(async (event) => {
  await requireUser(event)
  return (await loadModelTables()).map(t => ({ file: t.file, name: t.name, code: t.code, edition: t.edition, description: t.description, ruleCount: t.rules.length }))
})
