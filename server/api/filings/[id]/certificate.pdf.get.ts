import { eq } from 'drizzle-orm'
import { contentDisposition, type CertificateData } from '#shared/filings'
import { IdParams } from '#shared/schemas/people'
import { certificates } from '../../../database/schema'

// The certificate of an accepted filing as a PDF (pdf-lib), to those who may see the filing.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = paramsAs(event, IdParams)
  const filing = await findFilingFor(user, id)
  const db = await useDb()
  const row = await db.query.certificates.findFirst({ where: eq(certificates.filingId, filing.id) })
  if (!row) throw createError({ statusCode: 404, statusMessage: 'Not Found', message: `Filing ${id} has no certificate: it is not accepted.` })
  const pdf = await certificatePdf(JSON.parse(row.data) as CertificateData)
  setResponseHeaders(event, {
    'Content-Type': 'application/pdf',
    'Content-Disposition': contentDisposition('attachment', `tightwell-certificate-${row.code}.pdf`),
    'X-Content-Type-Options': 'nosniff',
    'Cache-Control': 'private, no-store',
  })
  return Buffer.from(pdf)
})
