import type { DirectionResult, LeakageFigures } from '../leakage'
import type { NoRuleReason } from '../rules/resolve'
import type { CheckRequest } from './schema'
import type { RuleOutcome, Verdict } from './judge'

/** Why a check found no rule: the rule-table reasons plus the checker's own. */
export type CheckNoRuleReason = NoRuleReason | 'missing-input'

/**
 * The calculation as a check reports it: every figure of POST /api/calculations, without the plot
 * data (`points`, `fitLine`) — a pure function of the request, which the calculation route gives
 * for the same readings. A one-direction test's `directions` is empty (it would repeat the
 * top-level figures); a two-direction test lists both, also without plot data.
 */
export type CheckMetrics = LeakageFigures & {
  directions: Omit<DirectionResult, 'points' | 'fitLine'>[]
}

/** The answer of POST /api/checks and GET /api/checks/:id. */
export interface CheckResponse {
  /** Null for a dry run (nothing stored). */
  checkId: number | null
  verdict: Verdict
  /** Set when the verdict is no-rule: which step found nothing, in words. */
  noRule: { reason: CheckNoRuleReason, message: string } | null
  jurisdiction: { id: number, name: string } | null
  county: { fips: string, name: string | null } | null
  zone: string | null
  zoneMap: { id: number, name: string } | null
  edition: { id: number, name: string, effectiveFrom: string, effectiveUntil: string | null } | null
  /** The published rule-set version that decided, recorded with the check. */
  ruleSetVersion: { id: number, number: number, publishedAt: string } | null
  rules: RuleOutcome[]
  advisories: RuleOutcome[]
  maxCfm50: number | null
  metrics: CheckMetrics
  caution: string
  checkedAt: string
  checkedBy: { id: number, name: string } | null
  request: CheckRequest
}

/** A row of "My checks". */
export interface CheckSummary {
  id: number
  checkedAt: string
  addressLine: string
  city: string
  state: string
  permitDate: string
  buildingType: string
  verdict: Verdict
  zone: string | null
  jurisdictionName: string | null
  cfm50: number
  ach50: number
}

export const VERDICT_WORDS: Record<Verdict, { title: string, symbol: string, detail: string }> = {
  'complies': { title: 'Meets the limit', symbol: '✓', detail: 'The recomputed result meets every limit rule in force.' },
  'does-not-comply': { title: 'Does not meet the limit', symbol: '✕', detail: 'At least one limit rule in force is not met.' },
  'borderline': { title: 'Meets, but only just', symbol: '≈', detail: 'The result meets the limit, but the 95 % interval of the multi-point test reaches past it. A retest or more readings would settle it.' },
  'no-rule': { title: 'No rule to check against', symbol: '?', detail: 'Tightwell could not find a rule in force for this address and date. This is not a pass.' },
}
