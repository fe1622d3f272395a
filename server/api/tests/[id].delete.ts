import { eq } from 'drizzle-orm'
import { IdParams } from '#shared/schemas/people'
import { filings, testRecords, uploads } from '../../database/schema'

// A test that was never filed (or only drafted) may be deleted with its files; a filed one stays on the record.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'rater')
  const { id } = paramsAs(event, IdParams)
  const { test } = await findTestFor(user, id)
  const db = await useDb()
  const filing = await db.query.filings.findFirst({ columns: { id: true, status: true, revision: true }, where: eq(filings.testId, test.id) })
  if (filing && (filing.status !== 'draft' || filing.revision > 0)) throw frozenConflict(filing.status, 'test')
  const files = await db.select({ key: uploads.storageKey }).from(uploads).where(eq(uploads.testId, test.id))
  await runBatch([
    ...(filing ? [db.delete(filings).where(eq(filings.id, filing.id))] : []),
    db.delete(testRecords).where(eq(testRecords.id, test.id)),
  ])
  // The rows are gone (cascade); the bytes follow. A failure here leaves an unreachable blob only.
  await Promise.all(files.map(f => uploadsStorage().removeItem(f.key).catch(() => {})))
  setResponseStatus(event, 204)
  return null
})
