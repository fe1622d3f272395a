/**
 * The verdict: a leakage result held against the rules in force for a zone and building type.
 * Pure TypeScript (runs on the server for the record and could run in the page for a preview).
 */
import { FLOW_METRICS, TARGET_METRICS, areaToFt2, solveTarget, volumeToFt3, type BuildingInput, type LeakageResult, type TargetMetric, type UnitSystem } from '../leakage'
import { evaluateRule, missingVariables, roundSignificant, ruleTerms, type RuleInputs, type RuleLogic, type RuleTerm, type RuleTerms } from '../rules/logic'
import type { BuildingType, Comparison, RuleKind, RuleVariableName } from '../rules/variables'
import { zoneNumber } from '../rules/zones'

import type { Verdict } from './verdicts'

export { VERDICTS, type Verdict } from './verdicts'

/** Said with every verdict, in the page, the print view and the API. */
export const CAUTION = 'Tightwell informs; it does not decide. The authority having jurisdiction decides which code edition and local amendments apply, who may test, and whether this result complies.'

/** A rule as the checker receives it (a frozen row of a published version). */
export interface JudgedRuleInput {
  key: string
  kind: RuleKind
  logic: RuleLogic
  summary: string
  citation: string
}

export interface RuleOutcome {
  id: string
  summary: string
  citation: string
  kind: RuleKind
  /** The term reported: for alternatives, the one with the best margin; for "all of", the worst. */
  metric: RuleVariableName | null
  comparison: Comparison | null
  limit: number | null
  value: number | null
  passes: boolean
  /** (limit − value)/limit·100 for an upper limit: positive = under the limit by that share. */
  marginPercent: number | null
  /** True when the value meets the rule but the 95 % interval of CFM50 reaches past it. */
  borderline: boolean
  /** Largest CFM50 meeting this rule (its boundary), or null when it cannot be found. */
  maxCfm50: number | null
  /** Inputs the rule reads that this check lacks (e.g. enclosure area). */
  missing: RuleVariableName[]
}

export interface Judgement {
  verdict: Verdict
  /** Limit rules only. */
  rules: RuleOutcome[]
  /** Advisory rules that apply; they never change the verdict. */
  advisories: RuleOutcome[]
  /** The most this house may leak and meet every limit rule (the tightest boundary), cfm. */
  maxCfm50: number | null
  /** Set when the verdict is no-rule because of the rules themselves. */
  noRuleReason: 'no-matching-rule' | 'missing-input' | null
}


/** The values a rule may read, from a result and its building (areas in ft², volume in ft³). */
export function ruleInputsOf(result: LeakageResult, building: BuildingInput, units: UnitSystem, buildingType: BuildingType, zone: string): RuleInputs {
  return {
    ach50: result.ach50,
    n50: result.n50,
    cfm50: result.cfm50,
    q50: result.q50,
    cfm50PerEnclosureArea: result.cfm50PerEnclosureArea,
    cfm50PerFloorArea: result.cfm50PerFloorArea,
    airPermeability50: result.airPermeability50,
    w50: result.w50,
    floorArea: building.floorArea === undefined ? null : areaToFt2(building.floorArea, units),
    enclosureArea: building.enclosureArea === undefined ? null : areaToFt2(building.enclosureArea, units),
    volume: volumeToFt3(building.volume, units),
    buildingType,
    zone,
    zoneNumber: zoneNumber(zone),
  }
}

/** The same inputs for the house leaking `cfm50` instead: every flow metric is proportional to CFM50. */
function scaledInputs(inputs: RuleInputs, cfm50: number): RuleInputs {
  const base = inputs.cfm50
  if (typeof base !== 'number' || base <= 0) return inputs
  const k = cfm50 / base
  const out: RuleInputs = { ...inputs }
  for (const m of FLOW_METRICS) {
    const v = inputs[m]
    if (typeof v === 'number') out[m] = v * k
  }
  return out
}

/** A rule's terms with each limit already rounded for comparison (limits do not change). */
interface ReadTerms extends RuleTerms { roundedLimits: number[] }
const termsCache = new WeakMap<object, ReadTerms>()
/** ruleTerms, read once per (frozen, reused) rule object. */
function termsOf(logic: RuleLogic): ReadTerms {
  let terms = termsCache.get(logic)
  if (!terms) {
    const read = ruleTerms(logic)
    terms = { ...read, roundedLimits: read.terms.map(t => roundSignificant(t.limit)) }
    termsCache.set(logic, terms)
  }
  return terms
}

function compare(a: number, op: Comparison, b: number): boolean {
  switch (op) {
    case '<': return a < b
    case '<=': return a <= b
    case '>': return a > b
    case '>=': return a >= b
    case '==': return a === b
    case '!=': return a !== b
  }
}

/**
 * The rule's answer without the json-logic interpreter, for the shapes nearly every code limit
 * has: one comparison of a metric with a number, or alternatives / all-of such comparisons. Same
 * semantics as evaluateRule (10-significant-figure tolerance; a missing value never meets), which
 * a property test checks; other shapes go to evaluateRule.
 */
export function evaluate(logic: RuleLogic, inputs: RuleInputs): boolean {
  const { combinator, terms, roundedLimits } = termsOf(logic)
  if (combinator === 'complex' || terms.length === 0) return evaluateRule(logic, inputs)
  let any = false
  let all = true
  for (let i = 0; i < terms.length; i++) {
    const t = terms[i]!
    const v = inputs[t.metric]
    // A missing value is NaN, as in evaluateRule: it fails every comparison but "≠".
    const ok = compare(typeof v === 'number' ? roundSignificant(v) : Number.NaN, t.comparison, roundedLimits[i]!)
    any ||= ok
    all &&= ok
  }
  return combinator === 'and' ? all : any
}

function isUpper(c: Comparison) { return c === '<' || c === '<=' }
function isLower(c: Comparison) { return c === '>' || c === '>=' }

function marginOf(term: RuleTerm, value: number): number | null {
  if (term.limit === 0) return null
  if (isUpper(term.comparison)) return ((term.limit - value) / term.limit) * 100
  if (isLower(term.comparison)) return ((value - term.limit) / term.limit) * 100
  return null
}

/** Largest CFM50 meeting one upper-limit term, by the target solver's exact inversion. */
function termMaxCfm50(term: RuleTerm, building: BuildingInput, units: UnitSystem): number | null {
  if (!isUpper(term.comparison) || !(TARGET_METRICS as readonly string[]).includes(term.metric)) return null
  return solveTarget(building, units, term.metric as TargetMetric, term.limit)?.maxCfm50 ?? null
}

/**
 * Largest CFM50 that meets a rule. Exact for one term, or alternatives/all-of upper limits; for
 * other shapes, a bisection on CFM50 (the rule is evaluated for the same house leaking more or
 * less), which assumes more leakage never turns a failing rule into a passing one.
 */
export function maxCfm50For(logic: RuleLogic, inputs: RuleInputs, building: BuildingInput, units: UnitSystem): number | null {
  const { combinator, terms } = termsOf(logic)
  if (combinator !== 'complex' && terms.length > 0) {
    const maxima = terms.map(t => termMaxCfm50(t, building, units))
    if (maxima.every((m): m is number => m !== null)) {
      return combinator === 'and' ? Math.min(...maxima) : Math.max(...maxima)
    }
  }
  const passesAt = (c: number) => evaluate(logic, scaledInputs(inputs, c))
  if (typeof inputs.cfm50 !== 'number' || !passesAt(1e-9)) return null
  let hi = Math.max(inputs.cfm50, 1)
  for (let i = 0; passesAt(hi); i++) {
    if (i > 60) return null // meets at any leakage: no maximum
    hi *= 2
  }
  let lo = 0
  for (let i = 0; i < 80 && hi - lo > hi * 1e-12; i++) {
    const mid = (lo + hi) / 2
    if (passesAt(mid)) lo = mid
    else hi = mid
  }
  return lo
}

function outcomeOf(rule: JudgedRuleInput, inputs: RuleInputs, interval: [number, number] | null, building: BuildingInput, units: UnitSystem): RuleOutcome {
  const passes = evaluate(rule.logic, inputs)
  const { combinator, terms } = termsOf(rule.logic)
  const scored = terms
    .map((term) => {
      const value = inputs[term.metric]
      return typeof value === 'number' ? { term, value, margin: marginOf(term, value) } : null
    })
    .filter((s): s is { term: RuleTerm, value: number, margin: number | null } => s !== null)
  // Alternatives: report the best; all-of: the worst; a single term: itself.
  const pick = scored.length === 0
    ? null
    : scored.reduce((best, s) => {
        const a = s.margin ?? -Infinity
        const b = best.margin ?? -Infinity
        return combinator === 'and' ? (a < b ? s : best) : (a > b ? s : best)
      })
  let borderline = false
  if (passes && interval && rule.kind === 'limit') {
    borderline = !evaluate(rule.logic, scaledInputs(inputs, interval[0])) || !evaluate(rule.logic, scaledInputs(inputs, interval[1]))
  }
  return {
    id: rule.key,
    summary: rule.summary,
    citation: rule.citation,
    kind: rule.kind,
    metric: pick?.term.metric ?? null,
    comparison: pick?.term.comparison ?? null,
    limit: pick?.term.limit ?? null,
    value: pick?.value ?? null,
    passes,
    marginPercent: pick?.margin ?? null,
    borderline,
    maxCfm50: rule.kind === 'limit' ? maxCfm50For(rule.logic, inputs, building, units) : null,
    missing: passes ? [] : missingVariables(rule.logic, inputs),
  }
}

/**
 * Judges a result against the rules that apply (already filtered by zone and building type).
 * - no limit rule → no-rule (never a pass);
 * - a limit rule fails only because an input is missing → no-rule with reason missing-input;
 * - any limit rule fails → does-not-comply;
 * - all meet, but a multi-point test's 95 % interval of CFM50 crosses a limit → borderline;
 * - otherwise complies. Advisories are reported when they apply and never change the verdict.
 */
export function judge(params: {
  result: LeakageResult
  building: BuildingInput
  units: UnitSystem
  buildingType: BuildingType
  zone: string
  rules: readonly JudgedRuleInput[]
}): Judgement {
  const { result, building, units, buildingType, zone } = params
  const inputs = ruleInputsOf(result, building, units, buildingType, zone)
  const interval = result.cfm50Ci95
  const limits = params.rules.filter(r => r.kind === 'limit').map(r => outcomeOf(r, inputs, interval, building, units))
  const advisories = params.rules.filter(r => r.kind === 'advisory').map(r => outcomeOf(r, inputs, null, building, units)).filter(a => a.passes)
  const maxima = limits.map(r => r.maxCfm50).filter((m): m is number => m !== null)
  const maxCfm50 = maxima.length === limits.length && maxima.length > 0 ? Math.min(...maxima) : null

  let verdict: Verdict
  let noRuleReason: Judgement['noRuleReason'] = null
  if (limits.length === 0) {
    verdict = 'no-rule'
    noRuleReason = 'no-matching-rule'
  }
  else if (limits.some(r => !r.passes && r.missing.length > 0)) {
    verdict = 'no-rule'
    noRuleReason = 'missing-input'
  }
  else if (limits.some(r => !r.passes)) verdict = 'does-not-comply'
  else if (limits.some(r => r.borderline)) verdict = 'borderline'
  else verdict = 'complies'
  return { verdict, rules: limits, advisories, maxCfm50, noRuleReason }
}
