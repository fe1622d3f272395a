/**
 * Metric names, one `as const` tuple feeding the zod enum, the TS type and any DB enum, and
 * lookup of a metric's value by name (used by rule evaluation and the target solver).
 */
import type { LeakageMetrics } from './types'

/**
 * The metrics proportional to CFM50 (each is CFM50 times a constant of the building): the ones a
 * limit is set on, the target solver inverts and the rule tables offer. The one list of them.
 */
export const FLOW_METRICS = [
  'ach50',
  'n50',
  'cfm50',
  'q50',
  'cfm50PerEnclosureArea',
  'cfm50PerFloorArea',
  'airPermeability50',
  'w50',
] as const satisfies readonly (keyof LeakageMetrics)[]

/** Every metric of a result, in display order: the flow metrics, then the leakage areas. */
export const LEAKAGE_METRICS = [
  ...FLOW_METRICS,
  'ela4SqIn',
  'ela4Cm2',
  'eqla10SqIn',
  'eqla10Cm2',
  'sla',
  'nl',
] as const satisfies readonly (keyof LeakageMetrics)[]

export type LeakageMetric = (typeof LEAKAGE_METRICS)[number]

/** Unit of each metric, for labels. */
export const METRIC_UNITS: Record<LeakageMetric, string> = {
  ach50: '1/h',
  n50: '1/h',
  cfm50: 'cfm',
  q50: 'm³/h',
  cfm50PerEnclosureArea: 'cfm/ft²',
  cfm50PerFloorArea: 'cfm/ft²',
  airPermeability50: 'm³/(h·m²)',
  w50: 'm³/(h·m²)',
  ela4SqIn: 'in²',
  ela4Cm2: 'cm²',
  eqla10SqIn: 'in²',
  eqla10Cm2: 'cm²',
  sla: '',
  nl: '',
}

/**
 * Value of a metric by name from a result (or one direction of it); null when the building
 * lacked the dimension the metric needs. Definitions: CHECKS.md §3–§4.
 */
export function metricValue(result: LeakageMetrics, metric: LeakageMetric): number | null {
  return result[metric]
}
