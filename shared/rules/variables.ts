/**
 * The variables a logic rule may read, and the operators it may use. This list is the contract
 * between the rule tables (admins write rules against it) and the checker (which supplies the
 * values). Adding a metric: add it here, supply it in the checker, document it in DEVELOPERS.md.
 */

import { FLOW_METRICS } from '../leakage/metrics'

export const RULE_VARIABLE_NAMES = [
  ...FLOW_METRICS,
  'floorArea',
  'volume',
  'enclosureArea',
  'buildingType',
  'zone',
  'zoneNumber',
] as const
export type RuleVariableName = (typeof RULE_VARIABLE_NAMES)[number]

export interface RuleVariable {
  name: RuleVariableName
  /** Short label used in tables and in rules read as words. */
  label: string
  unit: string
  type: 'number' | 'string'
  /** True for a measured result a limit can be set on (offered by the simple editor). */
  metric: boolean
  description: string
  /** A typical value, used to evaluate every rule before it is saved. */
  sample: number | string
}

/** Definitions follow CHECKS.md §3 (common practice / ISO 9972 terms). */
export const RULE_VARIABLES: readonly RuleVariable[] = [
  { name: 'ach50', label: 'ACH50', unit: '1/h', type: 'number', metric: true, sample: 3.2, description: 'Air changes per hour at 50 Pa: CFM50 × 60 / volume (ft³).' },
  { name: 'n50', label: 'n50', unit: '1/h', type: 'number', metric: true, sample: 3.2, description: 'Air change rate at 50 Pa in SI: q50 / volume (m³); the same number as ACH50.' },
  { name: 'cfm50', label: 'CFM50', unit: 'cfm', type: 'number', metric: true, sample: 960, description: 'Air flow through the envelope at 50 Pa, cubic feet per minute.' },
  { name: 'q50', label: 'q50', unit: 'm³/h', type: 'number', metric: true, sample: 1631, description: 'Air flow through the envelope at 50 Pa, cubic metres per hour.' },
  { name: 'cfm50PerEnclosureArea', label: 'CFM50 per ft² of enclosure', unit: 'cfm/ft²', type: 'number', metric: true, sample: 0.22, description: 'CFM50 divided by the enclosure area (walls + ceiling + floor), ft².' },
  { name: 'cfm50PerFloorArea', label: 'CFM50 per ft² of floor', unit: 'cfm/ft²', type: 'number', metric: true, sample: 0.48, description: 'CFM50 divided by the conditioned floor area, ft².' },
  { name: 'airPermeability50', label: 'air permeability at 50 Pa', unit: 'm³/(h·m²)', type: 'number', metric: true, sample: 4.0, description: 'q50 divided by the enclosure area in m².' },
  { name: 'w50', label: 'w50', unit: 'm³/(h·m²)', type: 'number', metric: true, sample: 8.8, description: 'q50 divided by the floor area in m².' },
  { name: 'floorArea', label: 'floor area', unit: 'ft²', type: 'number', metric: false, sample: 2000, description: 'Conditioned floor area, ft².' },
  { name: 'volume', label: 'volume', unit: 'ft³', type: 'number', metric: false, sample: 18000, description: 'Conditioned volume, ft³.' },
  { name: 'enclosureArea', label: 'enclosure area', unit: 'ft²', type: 'number', metric: false, sample: 4340, description: 'Enclosure area (walls + ceiling + floor), ft².' },
  { name: 'buildingType', label: 'building type', unit: '', type: 'string', metric: false, sample: 'detached', description: '"detached" or "attached" (a dwelling unit sharing walls or floors with another).' },
  { name: 'zone', label: 'climate zone', unit: '', type: 'string', metric: false, sample: '4C', description: 'The climate zone of the county, e.g. "4C", "7".' },
  { name: 'zoneNumber', label: 'climate zone number', unit: '', type: 'number', metric: false, sample: 4, description: 'The number of the climate zone, 0–8, without the moisture letter.' },
]

export const RULE_VARIABLE_BY_NAME: Readonly<Record<RuleVariableName, RuleVariable>> = Object.fromEntries(
  RULE_VARIABLES.map(v => [v.name, v]),
) as Record<RuleVariableName, RuleVariable>

/** Metrics a limit is set on (the simple editor's choices). */
export const RULE_METRICS = RULE_VARIABLES.filter(v => v.metric).map(v => v.name)

export function isRuleVariable(name: unknown): name is RuleVariableName {
  return typeof name === 'string' && Object.hasOwn(RULE_VARIABLE_BY_NAME, name)
}

export const COMPARISONS = ['<', '<=', '>', '>=', '==', '!='] as const
export type Comparison = (typeof COMPARISONS)[number]
export const COMPARISON_SYMBOLS: Record<Comparison, string> = { '<': '<', '<=': '≤', '>': '>', '>=': '≥', '==': '=', '!=': '≠' }
export const COMPARISON_WORDS: Record<Comparison, string> = {
  '<': 'less than',
  '<=': 'not more than',
  '>': 'more than',
  '>=': 'at least',
  '==': 'equal to',
  '!=': 'not equal to',
}

/**
 * The json-logic operators a rule may use; anything else (e.g. `method`, `map`, `log`, `cat`) is
 * refused by the validator and never reaches json-logic-js.
 */
export const RULE_OPERATORS = {
  comparison: ['==', '!=', '===', '!==', '<', '<=', '>', '>='],
  logic: ['and', 'or', '!', '!!', 'if'],
  arithmetic: ['+', '-', '*', '/', 'min', 'max'],
  data: ['var', 'in'],
} as const
export type RuleOperator = (typeof RULE_OPERATORS)[keyof typeof RULE_OPERATORS][number]
export const ALLOWED_OPERATORS: ReadonlySet<string> = new Set(Object.values(RULE_OPERATORS).flat())

export const BUILDING_TYPES = ['detached', 'attached'] as const
export type BuildingType = (typeof BUILDING_TYPES)[number]
/** What a rule applies to: one building type, or any. */
export const RULE_BUILDING_TYPES = ['any', 'detached', 'attached'] as const
export type RuleBuildingType = (typeof RULE_BUILDING_TYPES)[number]

/**
 * `limit`: the rule decides the verdict — it returns true when the result meets the limit.
 * `advisory`: the rule returns true when the notice applies (e.g. mechanical ventilation required).
 */
export const RULE_KINDS = ['limit', 'advisory'] as const
export type RuleKind = (typeof RULE_KINDS)[number]

/** Limits on a rule's shape, checked before json-logic-js sees it. */
export const RULE_LIMITS = {
  /** Nesting depth of operators (a simple rule is 2: a comparison holding a `var`). */
  maxDepth: 12,
  /** Operators, values and list items in one rule. */
  maxNodes: 200,
  /** Characters of the rule as JSON. */
  maxJsonLength: 4000,
  /** Characters in one string constant. */
  maxStringLength: 64,
} as const
