import { asc, eq, sql } from 'drizzle-orm'
import { spansOverlap } from '../../shared/rules/resolve'
import { adoptedEditions, jurisdictionPostalCodes, ruleSets, zoneMaps } from '../database/schema'

/** A jurisdiction with its coverage, its editions (with rule set, version and zone map) and its default map. */
export async function jurisdictionDetail(id: number) {
  const j = await findJurisdictionOr404(id)
  const db = await useDb()
  const counties = await db.all<{ countyFips: string, countyName: string | null, zone: string | null }>(sql`
    select c.county_fips as countyFips, z.county_name as countyName, z.zone as zone
    from jurisdiction_counties c
    left join zone_map_counties z on z.county_fips = c.county_fips and z.zone_map_id = ${j.zoneMapId ?? -1}
    where c.jurisdiction_id = ${id} order by c.county_fips`)
  const postal = await db.select({ postalCode: jurisdictionPostalCodes.postalCode }).from(jurisdictionPostalCodes).where(eq(jurisdictionPostalCodes.jurisdictionId, id)).orderBy(asc(jurisdictionPostalCodes.postalCode))
  const editions = await db.select({
    id: adoptedEditions.id,
    name: adoptedEditions.name,
    effectiveFrom: adoptedEditions.effectiveFrom,
    effectiveUntil: adoptedEditions.effectiveUntil,
    notes: adoptedEditions.notes,
    ruleSetId: adoptedEditions.ruleSetId,
    ruleSetName: ruleSets.name,
    latestVersion: sql<number | null>`(select max(v.number) from rule_set_versions v where v.rule_set_id = adopted_editions.rule_set_id)`,
    ownZoneMapId: adoptedEditions.zoneMapId,
  }).from(adoptedEditions).innerJoin(ruleSets, eq(ruleSets.id, adoptedEditions.ruleSetId))
    .where(eq(adoptedEditions.jurisdictionId, id)).orderBy(asc(adoptedEditions.effectiveFrom))
  const maps = new Map((await db.select({ id: zoneMaps.id, name: zoneMaps.name, edition: zoneMaps.edition }).from(zoneMaps)).map(m => [m.id, m]))
  return {
    ...j,
    createdAt: j.createdAt.toISOString(),
    updatedAt: j.updatedAt.toISOString(),
    zoneMap: j.zoneMapId ? maps.get(j.zoneMapId) ?? null : null,
    counties,
    postalCodes: postal.map(p => p.postalCode),
    editions: editions.map((e) => {
      const mapId = e.ownZoneMapId ?? j.zoneMapId
      return { ...e, zoneMap: mapId ? maps.get(mapId) ?? null : null, zoneMapIsOwn: e.ownZoneMapId !== null }
    }),
  }
}

export async function findEditionOr404(id: number) {
  const db = await useDb()
  const row = await db.query.adoptedEditions.findFirst({ where: eq(adoptedEditions.id, id) })
  if (!row) throw notFound('adopted edition', id)
  return row
}

/** The rule set and zone map must exist, and the period must not overlap another edition's. */
export async function checkEdition(jurisdictionId: number, body: { ruleSetId: number, zoneMapId?: number | null, effectiveFrom: string, effectiveUntil?: string | null }, editingId: number | undefined) {
  const db = await useDb()
  if (!await db.query.ruleSets.findFirst({ where: eq(ruleSets.id, body.ruleSetId) })) throw badRequest([{ field: 'ruleSetId', reason: `no rule set has id ${body.ruleSetId}` }])
  await checkZoneMapRef('zoneMapId', body.zoneMapId)
  const others = await db.select().from(adoptedEditions).where(eq(adoptedEditions.jurisdictionId, jurisdictionId))
  const span = { effectiveFrom: body.effectiveFrom, effectiveUntil: body.effectiveUntil ?? null }
  const clash = others.find(o => o.id !== editingId && spansOverlap(o, span))
  if (clash) {
    throw badRequest([{ field: 'effectiveFrom', reason: `overlaps ${clash.name} (${clash.effectiveFrom} – ${clash.effectiveUntil ?? 'open'}); end that edition the day before, or change the dates` }])
  }
}

