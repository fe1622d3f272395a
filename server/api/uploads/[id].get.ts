import { contentDisposition } from '#shared/filings'
import { IdParams } from '#shared/schemas/people'

// A stored file, only to those who may see its filing, with a content type of our own choosing
// (decided from the bytes at upload) and headers that stop a browser from running anything in it.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = paramsAs(event, IdParams)
  const { upload } = await findUploadFor(user, id)
  const bytes = await readUploadBytes(upload)
  if (!bytes) throw createError({ statusCode: 410, statusMessage: 'Gone', message: `The bytes of file ${id} are missing from storage.` })
  const image = upload.kind === 'photo'
  setResponseHeaders(event, {
    'Content-Type': upload.contentType,
    'Content-Length': String(bytes.byteLength),
    // Photos may show inline; PDFs and CSVs download (a PDF viewer can run scripts).
    'Content-Disposition': contentDisposition(image ? 'inline' : 'attachment', upload.name),
    'X-Content-Type-Options': 'nosniff',
    'Content-Security-Policy': 'default-src \'none\'; img-src \'self\'; style-src \'unsafe-inline\'; sandbox',
    'Cache-Control': 'private, no-store',
  })
  return Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength)
})
