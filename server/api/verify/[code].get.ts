import { eq } from 'drizzle-orm'
import { VERIFY_CODE, normaliseCode, type CertificateData, type VerifyResult } from '#shared/filings'
import { certificates, filings } from '../../database/schema'

// Public: anyone with a certificate's code sees its status, address, result and decision date —
// nothing else (no names, permit, rules or files). Unknown or malformed codes answer 404 alike.
export default defineEventHandler(async (event): Promise<VerifyResult> => {
  const code = normaliseCode(getRouterParam(event, 'code') ?? '')
  const notFound = createError({ statusCode: 404, statusMessage: 'Not Found', message: 'No certificate has this code.' })
  if (!VERIFY_CODE.test(code)) throw notFound
  const db = await useDb()
  const [row] = await db.select({ data: certificates.data, status: filings.status }).from(certificates)
    .innerJoin(filings, eq(filings.id, certificates.filingId)).where(eq(certificates.code, code))
  if (!row || row.status !== 'accepted') throw notFound
  const data = JSON.parse(row.data) as CertificateData
  setResponseHeader(event, 'Cache-Control', 'no-store')
  return { status: 'accepted', address: data.address, result: { cfm50: data.cfm50, ach50: data.ach50 }, decisionDate: data.decidedAt.slice(0, 10) }
})
