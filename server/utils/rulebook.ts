/**
 * The rulebook: what the checker asks "which rules apply here?". Built in memory from the rule
 * tables and reused across checks, so a check costs one tiny query (the generation row), not a
 * walk over the rule tables.
 *
 * Cache correctness with several server processes on one database: every change that can alter
 * an answer (jurisdictions, coverage, editions, zone maps, published versions) bumps
 * `rulebook_state.generation` in the same transaction. Each call reads that one row; when it
 * differs from the generation the cache was built from, the cache is rebuilt (once, shared by
 * concurrent callers). A publish in process A is therefore seen by process B on its next check.
 */
import { desc, sql } from 'drizzle-orm'
import { applicableRules, editionInForce, type NoRuleReason } from '../../shared/rules/resolve'
import { ruleTerms, type RuleTerms } from '../../shared/rules/logic'
import type { RuleRow } from '../../shared/rules/table'
import type { BuildingType } from '../../shared/rules/variables'
import { stateForFips } from '../../shared/rules/fips'
import type { JurisdictionKind } from '../../shared/types/roles'
import {
  adoptedEditions, jurisdictionCounties, jurisdictionPostalCodes, jurisdictions, rulebookState, ruleSets,
  ruleSetVersions, zoneMapCounties, zoneMaps,
} from '../database/schema'

/** A published rule as the checker gets it: frozen, with its terms read once. */
export interface PublishedRule extends RuleRow {
  terms: RuleTerms
}

export interface ResolveInput {
  /** The jurisdiction, when the filing names it. */
  jurisdictionId?: number
  /** The county (5-digit FIPS); with a state code when the caller has one (checked against the FIPS). */
  countyFips?: string
  stateCode?: string
  /** A postal code, used to choose between jurisdictions that share a county (e.g. a city inside a county). */
  postalCode?: string
  /** The permit date, YYYY-MM-DD: picks the edition in force. */
  permitDate: string
  buildingType: BuildingType
}

export interface ResolvedRules {
  ok: true
  generation: number
  jurisdiction: { id: number, name: string, kind: JurisdictionKind, stateCode: string, contactEmail: string | null }
  edition: { id: number, name: string, effectiveFrom: string, effectiveUntil: string | null }
  zoneMap: { id: number, name: string, edition: string, revision: number }
  countyFips: string
  zone: string
  ruleSet: { id: number, name: string, code: string, edition: string }
  ruleSetVersion: { id: number, number: number, publishedAt: string }
  /** Every rule of the version that applies to the zone and building type, in table order. */
  rules: readonly PublishedRule[]
  limits: readonly PublishedRule[]
  advisories: readonly PublishedRule[]
}

export interface NoRule {
  ok: false
  reason: NoRuleReason
  message: string
  /** For ambiguous-jurisdiction: the candidates to choose from. */
  candidates?: { id: number, name: string }[]
}

export type ResolveResult = ResolvedRules | NoRule

interface CachedJurisdiction {
  id: number
  name: string
  kind: JurisdictionKind
  stateCode: string
  contactEmail: string | null
  zoneMapId: number | null
  counties: Set<string>
  postalCodes: Set<string>
  editions: { id: number, name: string, effectiveFrom: string, effectiveUntil: string | null, ruleSetId: number, zoneMapId: number | null }[]
}

interface CachedVersion {
  id: number
  number: number
  publishedAt: string
  ruleSet: { id: number, name: string, code: string, edition: string }
  rules: readonly PublishedRule[]
}

interface Rulebook {
  generation: number
  jurisdictions: Map<number, CachedJurisdiction>
  byCounty: Map<string, number[]>
  byPostalCode: Map<string, number[]>
  zoneMaps: Map<number, { id: number, name: string, edition: string, revision: number, zones: Map<string, string> }>
  latest: Map<number, CachedVersion>
}

let cached: Rulebook | undefined
let building: Promise<Rulebook> | undefined

/** The current generation (0 before the first change). One primary-key read. */
export async function currentGeneration(): Promise<number> {
  const db = await useDb()
  const [row] = await db.select({ generation: rulebookState.generation }).from(rulebookState).where(sql`${rulebookState.id} = 1`)
  return row?.generation ?? 0
}

function deepFreeze<T>(value: T): T {
  if (value && typeof value === 'object') {
    for (const v of Object.values(value)) deepFreeze(v)
    Object.freeze(value)
  }
  return value
}

async function build(generation: number): Promise<Rulebook> {
  const db = await useDb()
  const [js, counties, postal, editions, maps, zoneRows, sets, versions] = await db.batch([
    db.select().from(jurisdictions),
    db.select().from(jurisdictionCounties),
    db.select().from(jurisdictionPostalCodes),
    db.select().from(adoptedEditions),
    db.select().from(zoneMaps),
    // Only maps someone uses: by default or by an edition.
    db.select({ zoneMapId: zoneMapCounties.zoneMapId, countyFips: zoneMapCounties.countyFips, zone: zoneMapCounties.zone }).from(zoneMapCounties)
      .where(sql`${zoneMapCounties.zoneMapId} in (select zone_map_id from jurisdictions where zone_map_id is not null union select zone_map_id from adopted_editions where zone_map_id is not null)`),
    db.select().from(ruleSets),
    // The latest version of each rule set. The outer table is named literally: drizzle renders a
    // column of a one-table query unqualified, which the correlated subquery would bind to itself.
    db.select().from(ruleSetVersions)
      .where(sql`rule_set_versions.number = (select max(v.number) from rule_set_versions v where v.rule_set_id = rule_set_versions.rule_set_id)`)
      .orderBy(desc(ruleSetVersions.id)),
  ])
  const book: Rulebook = { generation, jurisdictions: new Map(), byCounty: new Map(), byPostalCode: new Map(), zoneMaps: new Map(), latest: new Map() }
  for (const j of js) {
    book.jurisdictions.set(j.id, { id: j.id, name: j.name, kind: j.kind, stateCode: j.stateCode, contactEmail: j.contactEmail, zoneMapId: j.zoneMapId, counties: new Set(), postalCodes: new Set(), editions: [] })
  }
  for (const c of counties) {
    book.jurisdictions.get(c.jurisdictionId)?.counties.add(c.countyFips)
    book.byCounty.set(c.countyFips, [...(book.byCounty.get(c.countyFips) ?? []), c.jurisdictionId])
  }
  for (const p of postal) {
    book.jurisdictions.get(p.jurisdictionId)?.postalCodes.add(p.postalCode)
    book.byPostalCode.set(p.postalCode, [...(book.byPostalCode.get(p.postalCode) ?? []), p.jurisdictionId])
  }
  for (const e of editions) {
    book.jurisdictions.get(e.jurisdictionId)?.editions.push({ id: e.id, name: e.name, effectiveFrom: e.effectiveFrom, effectiveUntil: e.effectiveUntil, ruleSetId: e.ruleSetId, zoneMapId: e.zoneMapId })
  }
  for (const m of maps) book.zoneMaps.set(m.id, { id: m.id, name: m.name, edition: m.edition, revision: m.revision, zones: new Map() })
  for (const z of zoneRows) book.zoneMaps.get(z.zoneMapId)?.zones.set(z.countyFips, z.zone)
  const setById = new Map(sets.map(s => [s.id, s]))
  for (const v of versions) {
    const set = setById.get(v.ruleSetId)
    if (!set || book.latest.has(v.ruleSetId)) continue
    const rules = (JSON.parse(v.rules) as RuleRow[]).map(r => ({ ...r, terms: ruleTerms(r.logic) }))
    book.latest.set(v.ruleSetId, {
      id: v.id,
      number: v.number,
      publishedAt: v.publishedAt.toISOString(),
      ruleSet: { id: set.id, name: set.name, code: set.code, edition: set.edition },
      rules: deepFreeze(rules),
    })
  }
  return book
}

/** The rulebook for the current generation, rebuilt when another process (or this one) changed the tables. */
export async function rulebook(known?: number): Promise<Rulebook> {
  // A caller that already read the generation (requireUser does, in the same query) passes it in.
  const generation = known ?? await currentGeneration()
  if (cached && cached.generation === generation) return cached
  if (!building) {
    building = build(generation).then((book) => {
      cached = book
      return book
    }).finally(() => { building = undefined })
  }
  const book = await building
  // A change landed while building: build again for the newer generation.
  return book.generation >= generation ? book : rulebook()
}

/** The jurisdictions that cover a county (by FIPS), by name: more than one means the user must choose. */
export async function jurisdictionsCovering(countyFips: string): Promise<{ id: number, name: string }[]> {
  const book = await rulebook()
  return (book.byCounty.get(countyFips) ?? [])
    .map(id => book.jurisdictions.get(id)!)
    .map(j => ({ id: j.id, name: j.name }))
    .sort((a, b) => a.name.localeCompare(b.name))
}

/** Drops the cache (tests; the generation check makes this unnecessary in normal operation). */
export function forgetRulebook(): void {
  cached = undefined
}

function no(reason: NoRuleReason, message: string, candidates?: { id: number, name: string }[]): NoRule {
  return candidates ? { ok: false, reason, message, candidates } : { ok: false, reason, message }
}

function pickJurisdiction(book: Rulebook, input: ResolveInput): CachedJurisdiction | NoRule {
  if (input.jurisdictionId !== undefined) {
    const j = book.jurisdictions.get(input.jurisdictionId)
    return j ?? no('no-jurisdiction', `No jurisdiction has id ${input.jurisdictionId}.`)
  }
  let ids = input.countyFips ? book.byCounty.get(input.countyFips) ?? [] : []
  if (input.postalCode) {
    const byPostal = book.byPostalCode.get(input.postalCode) ?? []
    const narrowed = ids.length ? ids.filter(id => byPostal.includes(id)) : byPostal
    if (narrowed.length) ids = narrowed
  }
  if (ids.length === 0) {
    return no('no-jurisdiction', input.countyFips ? `No jurisdiction covers county ${input.countyFips}${input.postalCode ? ` or postal code ${input.postalCode}` : ''}.` : `No jurisdiction covers postal code ${input.postalCode}.`)
  }
  if (ids.length > 1) {
    const candidates = ids.map(id => book.jurisdictions.get(id)!).map(j => ({ id: j.id, name: j.name }))
    return no('ambiguous-jurisdiction', `County ${input.countyFips} is covered by ${candidates.map(c => c.name).join(' and ')}; name the jurisdiction (or give a postal code one of them lists).`, candidates)
  }
  return book.jurisdictions.get(ids[0]!)!
}

/**
 * Which published rules apply: the jurisdiction (by id, or by the county/postal code it covers),
 * the edition in force on the permit date, the zone of the county on that edition's zone map (or
 * the jurisdiction's), and the rules of the rule set's latest published version for that zone
 * and building type. Or a typed reason why not.
 */
export async function resolveRules(input: ResolveInput, generation?: number): Promise<ResolveResult> {
  const book = await rulebook(generation)
  const picked = pickJurisdiction(book, input)
  if ('ok' in picked) return picked
  const j = picked
  if (input.stateCode && input.stateCode !== j.stateCode && j.kind !== 'program') {
    return no('county-not-covered', `${j.name} is in ${j.stateCode}, not ${input.stateCode}.`)
  }
  let countyFips = input.countyFips
  if (!countyFips && j.counties.size === 1) countyFips = [...j.counties][0]
  if (!countyFips) return no('no-zone', `${j.name} covers ${j.counties.size} counties; give the county (FIPS) to find the climate zone.`)
  if (input.stateCode && stateForFips(countyFips) && stateForFips(countyFips) !== input.stateCode) {
    return no('county-not-covered', `County ${countyFips} is in ${stateForFips(countyFips)}, not ${input.stateCode}.`)
  }
  if (j.counties.size > 0 && !j.counties.has(countyFips)) return no('county-not-covered', `${j.name} does not cover county ${countyFips}.`)
  const edition = editionInForce(j.editions, input.permitDate)
  if (!edition) return no('no-edition', `${j.name} has no code edition in force on ${input.permitDate}.`)
  const zoneMapId = edition.zoneMapId ?? j.zoneMapId
  const map = zoneMapId === null ? undefined : book.zoneMaps.get(zoneMapId)
  if (!map) return no('no-zone-map', `Neither ${edition.name} nor ${j.name} names a zone map.`)
  const zone = map.zones.get(countyFips)
  if (!zone) return no('no-zone', `County ${countyFips} is not on the zone map "${map.name}".`)
  const version = book.latest.get(edition.ruleSetId)
  if (!version) return no('no-published-version', `The limits table of ${edition.name} has no published version yet.`)
  const rules = applicableRules(version.rules, zone, input.buildingType)
  const limits = rules.filter(r => r.kind === 'limit')
  if (limits.length === 0) return no('no-matching-rule', `${version.ruleSet.name} version ${version.number} has no limit for zone ${zone} and ${input.buildingType} buildings.`)
  return {
    ok: true,
    generation: book.generation,
    jurisdiction: { id: j.id, name: j.name, kind: j.kind, stateCode: j.stateCode, contactEmail: j.contactEmail },
    edition: { id: edition.id, name: edition.name, effectiveFrom: edition.effectiveFrom, effectiveUntil: edition.effectiveUntil },
    zoneMap: { id: map.id, name: map.name, edition: map.edition, revision: map.revision },
    countyFips,
    zone,
    ruleSet: version.ruleSet,
    ruleSetVersion: { id: version.id, number: version.number, publishedAt: version.publishedAt },
    rules,
    limits,
    advisories: rules.filter(r => r.kind === 'advisory'),
  }
}
