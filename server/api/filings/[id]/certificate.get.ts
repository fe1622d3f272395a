import { eq } from 'drizzle-orm'
import type { CertificateData } from '#shared/filings'
import { IdParams } from '#shared/schemas/people'
import { certificates } from '../../../database/schema'

// The certificate's printed content (the printable page), to those who may see the filing.
export default defineEventHandler(async (event): Promise<CertificateData> => {
  const user = await requireUser(event)
  const { id } = paramsAs(event, IdParams)
  const filing = await findFilingFor(user, id)
  const db = await useDb()
  const row = await db.query.certificates.findFirst({ where: eq(certificates.filingId, filing.id) })
  if (!row) throw createError({ statusCode: 404, statusMessage: 'Not Found', message: `Filing ${id} has no certificate: it is not accepted.` })
  return JSON.parse(row.data) as CertificateData
})
