import type { H3Event } from 'h3'
import type { User } from '#auth-utils'
import { CAUTION, judge, type CheckMetrics, type JudgedRuleInput, type CheckNoRuleReason, type CheckRequest, type CheckResponse } from '../../shared/checks'
import { analyzeLeakage, type DirectionResult, type LeakageResult } from '../../shared/leakage'
import { ruleInWords } from '../../shared/rules/logic'
import type { ResolvedRules, ResolveResult } from './rulebook'

/** 422: the address needs a choice the user must make (which county, which jurisdiction). */
export function needsChoice(field: string, message: string, candidates: unknown[]) {
  return createError({ statusCode: 422, statusMessage: 'Unprocessable Entity', message: `${field}: ${message}`, data: { field, reason: message, candidates } })
}

export interface County { fips: string, name: string | null }

/** The county of the address: as given, or from the postal code (422 when it spans several). */
export async function countyOf(request: Pick<CheckRequest, 'address'>): Promise<County> {
  const { address } = request
  const place = await postalPlace(address.postalCode)
  if (address.countyFips) {
    const named = place?.counties.find(c => c.fips === address.countyFips)
    return { fips: address.countyFips, name: named?.name ?? null }
  }
  if (!place) throw badRequest([{ field: 'address.postalCode', reason: `no county is known for postal code ${address.postalCode}; give address.countyFips` }])
  if (place.state !== address.state) throw badRequest([{ field: 'address.postalCode', reason: `postal code ${address.postalCode} is in ${place.state}, not ${address.state}` }])
  if (place.counties.length > 1) {
    throw needsChoice('address.countyFips', `postal code ${address.postalCode} spans ${place.counties.length} counties (${place.counties.map(c => `${c.name} ${c.fips}`).join(', ')}); choose one`, place.counties)
  }
  return { fips: place.counties[0]!.fips, name: place.counties[0]!.name }
}

/** The rulebook generation requireUser read with the user row, when there is one. */
export function knownRulebookGeneration(event: H3Event): number | undefined {
  return typeof event.context.rulebookGeneration === 'number' ? event.context.rulebookGeneration : undefined
}

/**
 * Where and which rules: the county of the address and the rules in force (from the cached
 * rulebook). Input the user must fix is a 400, a choice the user must make a 422.
 */
async function whereAndRules(request: CheckRequest, generation?: number): Promise<{ county: County, resolved: ResolveResult }> {
  const county = await countyOf(request)
  const resolved = await resolveRules({
    jurisdictionId: request.jurisdictionId,
    countyFips: county.fips,
    stateCode: request.address.state,
    postalCode: request.address.postalCode,
    permitDate: request.permitDate,
    buildingType: request.buildingType,
  }, generation)
  if (!resolved.ok) {
    // A jurisdiction named by the user that does not exist or does not cover the address is bad input, not "no rule".
    if (request.jurisdictionId !== undefined && resolved.reason === 'no-jurisdiction') throw badRequest([{ field: 'jurisdictionId', reason: resolved.message }])
    if (request.jurisdictionId !== undefined && resolved.reason === 'county-not-covered') throw badRequest([{ field: 'address.countyFips', reason: resolved.message }])
    if (resolved.reason === 'ambiguous-jurisdiction') throw needsChoice('jurisdictionId', resolved.message, resolved.candidates ?? [])
  }
  return { county, resolved }
}

/**
 * The check without storing it: the county of the address, the rules in force, the result
 * recomputed from the readings — never the client's arithmetic — and the verdict. Used by
 * POST /api/checks, by test records and by the filing recomputation.
 */
export async function checkFor(user: Pick<User, 'id' | 'name'> | null, request: CheckRequest, generation?: number): Promise<CheckResponse> {
  const { county, resolved } = await whereAndRules(request, generation)
  return buildCheckResponse(user, request, county, resolved)
}

/** The answer of a check without its id and request (what runCheck stores as `response`). */
export type CheckOutput = Omit<CheckResponse, 'checkId' | 'request'>

/**
 * The answer for rules already resolved (pure: no database). The demo seed calls it with rules it
 * resolved itself, because the rulebook cannot be read while the database is still opening.
 */
export function buildCheckResponse(user: Pick<User, 'id' | 'name'> | null, request: CheckRequest, county: County, resolved: ResolveResult, checkedAt = new Date()): CheckResponse {
  const o = buildCheckOutput(user, request, county, resolved, checkedAt)
  // Written out rather than spread: see checkMetricsOf.
  return {
    checkId: null,
    verdict: o.verdict,
    noRule: o.noRule,
    jurisdiction: o.jurisdiction,
    county: o.county,
    zone: o.zone,
    zoneMap: o.zoneMap,
    edition: o.edition,
    ruleSetVersion: o.ruleSetVersion,
    rules: o.rules,
    advisories: o.advisories,
    maxCfm50: o.maxCfm50,
    metrics: o.metrics,
    caution: o.caution,
    checkedAt: o.checkedAt,
    checkedBy: o.checkedBy,
    request,
  }
}

/** buildCheckResponse without the id and request. */
export function buildCheckOutput(user: Pick<User, 'id' | 'name'> | null, request: CheckRequest, county: County, resolved: ResolveResult, checkedAt = new Date()): CheckOutput {
  const analysis = analyzeLeakage(request)
  const metrics = checkMetricsOf(analysis)
  const checkedBy = user ? { id: user.id, name: user.name } : null
  if (resolved.ok) {
    const judgement = judge({
      result: analysis,
      building: request.building,
      units: request.units,
      buildingType: request.buildingType,
      zone: resolved.zone,
      rules: resolved.rules.map(judgedRuleOf),
    })
    const noRule = judgement.noRuleReason ? { reason: judgement.noRuleReason as CheckNoRuleReason, message: noRuleMessage(judgement.noRuleReason, judgement.rules) } : null
    return {
      verdict: judgement.verdict,
      noRule,
      jurisdiction: { id: resolved.jurisdiction.id, name: resolved.jurisdiction.name },
      county,
      zone: resolved.zone,
      zoneMap: { id: resolved.zoneMap.id, name: resolved.zoneMap.name },
      edition: resolved.edition,
      ruleSetVersion: resolved.ruleSetVersion,
      rules: judgement.rules,
      advisories: judgement.advisories,
      maxCfm50: judgement.maxCfm50,
      metrics,
      caution: CAUTION,
      checkedAt: checkedAt.toISOString(),
      checkedBy,
    }
  }
  return {
    verdict: 'no-rule',
    noRule: { reason: resolved.reason, message: `${resolved.message} Tightwell cannot check this result; this is not a pass.` },
    jurisdiction: null,
    county,
    zone: null,
    zoneMap: null,
    edition: null,
    ruleSetVersion: null,
    rules: [],
    advisories: [],
    maxCfm50: null,
    metrics,
    caution: CAUTION,
    checkedAt: checkedAt.toISOString(),
    checkedBy,
  }
}

/**
 * POST /api/checks: the check, stored with its inputs, outputs and rule version unless `dryRun`,
 * answered as JSON text. Each part is serialised once: the stored `request` and `response`
 * columns are the very strings the answer is assembled from (a check's answer is several KB, and
 * serialising it twice was a measurable part of the route's cost).
 */
export async function runCheck(event: H3Event, user: User, request: CheckRequest, dryRun: boolean): Promise<{ json: string, checkId: number | null }> {
  const { county, resolved } = await whereAndRules(request, knownRulebookGeneration(event))
  const output = buildCheckOutput(user, request, county, resolved)
  const requestJson = JSON.stringify(request)
  const outputJson = JSON.stringify(output)
  let checkId: number | null = null
  if (!dryRun) {
    const { metrics } = output
    checkId = await recordCheck({
      userId: user.id,
      createdAt: Date.parse(output.checkedAt),
      verdict: output.verdict,
      jurisdictionId: output.jurisdiction?.id ?? null,
      ruleSetVersionId: output.ruleSetVersion?.id ?? null,
      zone: output.zone,
      countyFips: output.county?.fips ?? null,
      addressLine: request.address.line1,
      city: request.address.city,
      stateCode: request.address.state,
      postalCode: request.address.postalCode,
      permitDate: request.permitDate,
      buildingType: request.buildingType,
      cfm50: metrics.cfm50,
      ach50: metrics.ach50,
      // The request has its own column; GET /api/checks/:id puts it and the id back.
      request: requestJson,
      response: outputJson,
    })
  }
  // The same object as CheckResponse, its first two keys written here.
  return { json: `{"checkId":${checkId},"request":${requestJson},${outputJson.slice(1)}`, checkId }
}

/**
 * The figures of the calculation for a check's answer (see CheckMetrics): no plot data, no
 * repeated direction. Written out as one literal, field by field: the types catch a figure added
 * to the engine but not here, and V8 gives a literal a fixed shape — a spread-then-add copy made a
 * slow object that also made JSON.stringify several times slower (measured: 22 µs vs 0.1 µs).
 */
export function checkMetricsOf(a: LeakageResult): CheckMetrics {
  return {
    units: a.units,
    basis: a.basis,
    method: a.method,
    flowExponent: a.flowExponent,
    flowExponentCi95: a.flowExponentCi95,
    flowCoefficient: a.flowCoefficient,
    flowCoefficientSi: a.flowCoefficientSi,
    flowCoefficientCi95: a.flowCoefficientCi95,
    r2: a.r2,
    tValue: a.tValue,
    cfm50Ci95: a.cfm50Ci95,
    ach50Ci95: a.ach50Ci95,
    temperatureFactor: a.temperatureFactor,
    baselineAverage: a.baselineAverage,
    warnings: a.warnings,
    cfm50: a.cfm50,
    q50: a.q50,
    ach50: a.ach50,
    n50: a.n50,
    cfm50PerEnclosureArea: a.cfm50PerEnclosureArea,
    cfm50PerFloorArea: a.cfm50PerFloorArea,
    airPermeability50: a.airPermeability50,
    w50: a.w50,
    ela4SqIn: a.ela4SqIn,
    ela4Cm2: a.ela4Cm2,
    eqla10SqIn: a.eqla10SqIn,
    eqla10Cm2: a.eqla10Cm2,
    sla: a.sla,
    nl: a.nl,
    directions: a.directions.length > 1 ? a.directions.map(directionFiguresOf) : [],
    elevation: a.elevation,
  }
}

/** A direction without its plot data (two-direction tests only, so a plain copy does). */
function directionFiguresOf({ points: _points, fitLine: _fitLine, ...figures }: DirectionResult): CheckMetrics['directions'][number] {
  return figures
}

/** A published rule as the judge takes it; rules are frozen and reused, so each is mapped once. */
const judged = new WeakMap<object, JudgedRuleInput>()
function judgedRuleOf(rule: ResolvedRules['rules'][number]): JudgedRuleInput {
  let j = judged.get(rule)
  if (!j) {
    j = { key: rule.key, kind: rule.kind, logic: rule.logic, summary: rule.summary || ruleInWords(rule.logic), citation: citationOf(rule) }
    judged.set(rule, j)
  }
  return j
}

function citationOf(rule: { citationCode: string, citationEdition: string, citationSection: string }): string {
  return [rule.citationCode, rule.citationEdition, rule.citationSection].filter(Boolean).join(' ')
}

function noRuleMessage(reason: 'no-matching-rule' | 'missing-input', rules: { missing: string[], summary: string }[]): string {
  if (reason === 'missing-input') {
    const missing = [...new Set(rules.flatMap(r => r.missing))]
    return `The rule in force needs ${missing.join(', ')}, which this check lacks (add the building's areas). Tightwell cannot decide; this is not a pass.`
  }
  return 'No limit rule applies to this zone and building type. Tightwell cannot decide; this is not a pass.'
}
