import { IdParams } from '#shared/schemas/people'

// A photo (JPEG, PNG) or a PDF for the test, typed by its content; 413 over the size limit.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'rater')
  const { id } = paramsAs(event, IdParams)
  const { test, project } = await findTestFor(user, id)
  const frozen = await freezingFiling(test.id)
  if (frozen) throw frozenConflict(frozen.status, 'test')
  const file = await receiveFile(event, ['jpeg', 'png', 'pdf'])
  const row = await storeUpload(user, project.id, test.id, file)
  setResponseStatus(event, 201)
  return uploadInfo(row)
})
