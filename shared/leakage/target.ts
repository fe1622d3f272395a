/**
 * Target solver: the largest CFM50 a building may leak to meet a limit on a metric, and the
 * reduction needed from the current result.
 */
import { FLOW_METRICS } from './metrics'
import type { BuildingInput } from './types'
import { M3H_PER_CFM, M3HM2_PER_CFMFT2, areaToFt2, type UnitSystem, volumeToFt3 } from './units'

/** Metrics a limit can be set on (each is CFM50 times a constant of the building). */
export const TARGET_METRICS = FLOW_METRICS

export type TargetMetric = (typeof TARGET_METRICS)[number]

export interface TargetResult {
  metric: TargetMetric
  limit: number
  /** Largest CFM50 that still meets the limit (the boundary value), cfm. */
  maxCfm50: number
  /** The same in m³/h. */
  maxQ50: number
  /** CFM50 of the current result, when given. */
  currentCfm50: number | null
  /**
   * (current − max)/current·100. Positive: the reduction needed. 0: exactly at the limit.
   * Negative: headroom (already meeting). Null without a current result.
   */
  reductionPercent: number | null
}

/**
 * Largest CFM50 meeting `metric ≤ limit` for this building, by inverting the metric
 * definitions of CHECKS.md §3: ACH50 = n50 = CFM50·60/V_ft³; per-area = CFM50/A_ft²;
 * air permeability and w50 = CFM50·18.288/A_ft² (CHECKS.md §1); q50 = CFM50·1.69901….
 *
 * For a strict limit ("less than") the returned value is the boundary itself, which does not
 * meet it; deciding ≤ vs < is the rule evaluator's job. Returns null when the building lacks the
 * area the metric needs, or the limit is not a positive finite number.
 */
export function solveTarget(
  building: BuildingInput,
  units: UnitSystem,
  metric: TargetMetric,
  limit: number,
  currentCfm50: number | null = null,
): TargetResult | null {
  if (!(limit > 0 && Number.isFinite(limit))) return null
  let maxCfm50: number
  switch (metric) {
    case 'ach50':
    case 'n50':
      maxCfm50 = (limit * volumeToFt3(building.volume, units)) / 60
      break
    case 'cfm50':
      maxCfm50 = limit
      break
    case 'q50':
      maxCfm50 = limit / M3H_PER_CFM
      break
    case 'cfm50PerEnclosureArea':
    case 'airPermeability50': {
      if (building.enclosureArea === undefined) return null
      const perFt2 = metric === 'airPermeability50' ? limit / M3HM2_PER_CFMFT2 : limit
      maxCfm50 = perFt2 * areaToFt2(building.enclosureArea, units)
      break
    }
    case 'cfm50PerFloorArea':
    case 'w50': {
      if (building.floorArea === undefined) return null
      const perFt2 = metric === 'w50' ? limit / M3HM2_PER_CFMFT2 : limit
      maxCfm50 = perFt2 * areaToFt2(building.floorArea, units)
      break
    }
  }
  return {
    metric,
    limit,
    maxCfm50,
    maxQ50: maxCfm50 * M3H_PER_CFM,
    currentCfm50,
    reductionPercent: currentCfm50 === null ? null : ((currentCfm50 - maxCfm50) / currentCfm50) * 100,
  }
}
