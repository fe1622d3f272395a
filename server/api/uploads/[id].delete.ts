import { eq } from 'drizzle-orm'
import { IdParams } from '#shared/schemas/people'
import { uploads } from '../../database/schema'

// The rater removes a file while the test is not frozen by a filing.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'rater')
  const { id } = paramsAs(event, IdParams)
  const { upload, ownerId } = await findUploadFor(user, id)
  if (ownerId !== user.id) throw rowNotFound('file', id)
  if (upload.testId !== null) {
    const frozen = await freezingFiling(upload.testId)
    if (frozen) throw frozenConflict(frozen.status, 'test')
  }
  const db = await useDb()
  await db.delete(uploads).where(eq(uploads.id, upload.id))
  await uploadsStorage().removeItem(upload.storageKey).catch(() => {})
  setResponseStatus(event, 204)
  return null
})
