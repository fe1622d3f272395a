import { eq } from 'drizzle-orm'
import { CoverageBody, IdParams } from '#shared/schemas/rule-tables'
import { stateForFips } from '#shared/rules/fips'
import { jurisdictionCounties, jurisdictionPostalCodes } from '../../../database/schema'

/** Sets what a jurisdiction covers: its counties (FIPS) and, optionally, postal codes. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id } = paramsAs(event, IdParams)
  const body = await readBodyAs(event, CoverageBody)
  const j = await findJurisdictionOr404(id)
  if (j.kind !== 'program') {
    const problems = body.counties.flatMap((fips, i) => {
      const state = stateForFips(fips)
      return state && state !== j.stateCode ? [{ field: `counties.${i}`, reason: `${fips} is in ${state}; ${j.name} is in ${j.stateCode}` }] : []
    })
    if (problems.length) throw badRequest(problems)
  }
  const counties = [...new Set(body.counties)].sort()
  const postalCodes = [...new Set(body.postalCodes)].sort()
  const before = await jurisdictionDetail(id)
  const db = await useDb()
  const statements: Statement[] = [
    db.delete(jurisdictionCounties).where(eq(jurisdictionCounties.jurisdictionId, id)),
    db.delete(jurisdictionPostalCodes).where(eq(jurisdictionPostalCodes.jurisdictionId, id)),
  ]
  for (const part of chunks(counties)) statements.push(db.insert(jurisdictionCounties).values(part.map(countyFips => ({ jurisdictionId: id, countyFips }))))
  for (const part of chunks(postalCodes)) statements.push(db.insert(jurisdictionPostalCodes).values(part.map(postalCode => ({ jurisdictionId: id, postalCode }))))
  statements.push(bumpGeneration(db))
  statements.push(audit(db, user, 'jurisdiction.coverage', 'jurisdiction', id, `Coverage: ${counties.length} counties, ${postalCodes.length} postal codes`,
    { counties: before.counties.map(c => c.countyFips), postalCodes: before.postalCodes }, { counties, postalCodes }))
  await runBatch(statements)
  return jurisdictionDetail(id)
})
