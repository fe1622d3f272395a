import { mapReadings, readCsvTable, suggestMapping } from '#shared/filings'
import { IdParams } from '#shared/schemas/people'

// Step 1 of a readings import: the CSV is stored with the test (as a readings file) and answered
// as a table with a suggested column mapping; nothing is taken into the test yet.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'rater')
  const { id } = paramsAs(event, IdParams)
  const { test, project } = await findTestFor(user, id)
  const frozen = await freezingFiling(test.id)
  if (frozen) throw frozenConflict(frozen.status, 'test')
  const file = await receiveFile(event, ['csv'])
  const text = new TextDecoder('utf-8').decode(file.bytes)
  const table = readCsvTable(text)
  if (table.rows.length === 0) throw badRequest([{ field: 'file', reason: 'has no rows' }])
  const upload = await storeUpload(user, project.id, test.id, file)
  const mapping = suggestMapping(table)
  const preview = mapReadings(table, mapping, { direction: test.direction, baseline: { before: test.baselineBefore ?? undefined, after: test.baselineAfter ?? undefined } })
  setResponseStatus(event, 201)
  return { upload: uploadInfo(upload), table, mapping, preview }
})
