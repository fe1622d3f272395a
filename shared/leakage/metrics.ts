/**
 * Metric names, one `as const` tuple feeding the zod enum, the TS type and any DB enum, and
 * lookup of a metric's value by name (used by rule evaluation and the target solver).
 */
import type { LeakageMetrics } from './types'

/** Every metric a rule may test, in display order. */
export const LEAKAGE_METRICS = [
  'ach50',
  'n50',
  'cfm50',
  'q50',
  'cfm50PerEnclosureArea',
  'cfm50PerFloorArea',
  'airPermeability50',
  'w50',
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
