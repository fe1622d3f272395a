/**
 * Input and result types of the leakage engine. Plain interfaces (no zod) so the engine stays
 * importable anywhere; `schema.ts` checks at compile time that its parsed output fits `LeakageInput`.
 */
import type { UnitSystem } from './units'

export type { UnitSystem }

/** One `as const` tuple feeds the zod enum and the TS type. */
export const TEST_DIRECTIONS = ['depressurization', 'pressurization'] as const
/** Depressurization: house below outdoor pressure (readings negative); pressurization: above. */
export type TestDirection = (typeof TEST_DIRECTIONS)[number]

/** One induced-pressure reading: pressure in Pa as read (signed, house relative to outdoors), fan flow in cfm (`ip`) or m³/h (`si`). */
export interface Reading {
  pressure: number
  flow: number
}

/** Zero-flow (baseline) pressure before and after the test, signed Pa; either may be missing. */
export interface Baseline {
  before?: number | undefined
  after?: number | undefined
}

/** Building dimensions in the request's units (ft/ft²/ft³ or m/m²/m³). */
export interface BuildingInput {
  /** Conditioned volume (required). */
  volume: number
  /** Conditioned floor area. */
  floorArea?: number | undefined
  /** Enclosure (envelope) area: walls + ceiling + floor. */
  enclosureArea?: number | undefined
  /** Building height above grade, for the normalized leakage NL. */
  height?: number | undefined
  /** Site elevation (ft or m): echoed only; no correction is applied (none sourced). */
  elevation?: number | undefined
}

/** One direction of a fan-pressurization test. */
export interface TestInput {
  direction: TestDirection
  baseline?: Baseline | undefined
  readings: readonly Reading[]
  /** Indoor temperature, °F (`ip`) or °C (`si`). */
  insideTemperature?: number | undefined
  /** Outdoor temperature, °F (`ip`) or °C (`si`). */
  outsideTemperature?: number | undefined
  /** Flow exponent assumed for a one-reading test; default 0.65. Ignored with 2+ readings. */
  assumedExponent?: number | undefined
}

/** A whole calculation request (already validated by `CalculationRequest` in schema.ts). */
export interface LeakageInput {
  units: UnitSystem
  building: BuildingInput
  test: TestInput
  /**
   * Optional test in the opposite direction. Its temperatures and assumed exponent default to
   * those of `test` (same session); its baseline does not (each test measures its own).
   */
  reverse?: TestInput | undefined
}

/** A closed interval [low, high]. */
export type Interval = [number, number]

/** A warning about test quality, in plain words. */
export interface LeakageWarning {
  code:
    | 'few-points'
    | 'exponent-out-of-range'
    | 'low-r2'
    | 'high-baseline'
    | 'extrapolated'
    | 'no-reading-at-50'
  message: string
  /** The test direction the warning belongs to. */
  direction: TestDirection
}

/** A point used in the analysis, for plotting. Flows in the request's unit (cfm or m³/h). */
export interface FlowPoint {
  /** Baseline-adjusted pressure magnitude, Pa. */
  pressure: number
  /** Fan flow as entered. */
  fanFlow: number
  /** Envelope flow: fan flow times the temperature factor. */
  envelopeFlow: number
}

/**
 * Serializable description of the fitted line Q = C·ΔPⁿ in the request's flow unit, with what
 * {@link predictFlow} needs for the 95 % confidence band of the line (CHECKS.md §2).
 */
export interface FitLine {
  flowUnit: 'cfm' | 'm3/h'
  /** ln C, C in flowUnit/Paⁿ. */
  lnCoefficient: number
  exponent: number
  /** Smallest and largest adjusted pressure used, Pa. */
  pressureRange: Interval
  /** Null for a one-reading test (assumed exponent) or a two-reading test (no degree of freedom). */
  band: FitBand | null
}

/** Terms of S_y(x) = S_n·√(((N−1)/N)·S_x² + (ln P − x̄)²) (CHECKS.md §2). */
export interface FitBand {
  /** Student t(0.975, N−2). */
  t: number
  /** x̄ = mean ln ΔP. */
  meanLnPressure: number
  /** S_n, standard error of the exponent. */
  exponentStdError: number
  /** ((N−1)/N)·S_x² = Σ(x − x̄)²/N. */
  spread: number
}

/** Metrics that depend only on CFM50 (and the leakage areas) plus the building. Null when the needed dimension is missing. */
export interface LeakageMetrics {
  /** Envelope flow at 50 Pa, cfm. */
  cfm50: number
  /** Envelope flow at 50 Pa, m³/h. */
  q50: number
  /** Air changes per hour at 50 Pa, h⁻¹. */
  ach50: number
  /** n50 = q50/V, h⁻¹ — the same number as ACH50. */
  n50: number
  /** CFM50 per ft² of enclosure area. */
  cfm50PerEnclosureArea: number | null
  /** CFM50 per ft² of floor area. */
  cfm50PerFloorArea: number | null
  /** Air permeability q50/enclosure area, m³/(h·m²). */
  airPermeability50: number | null
  /** w50 = q50/floor area, m³/(h·m²). */
  w50: number | null
  /** Effective leakage area at 4 Pa, C_D = 1, in². */
  ela4SqIn: number
  /** Same, cm². */
  ela4Cm2: number
  /** Equivalent leakage area at 10 Pa, C_D = 0.611, in². */
  eqla10SqIn: number
  /** Same, cm². */
  eqla10Cm2: number
  /** Specific leakage area ELA/floor area (dimensionless). */
  sla: number | null
  /** Normalized leakage NL = 1000·SLA·(H/2.5 m)^0.3. */
  nl: number | null
}

export type TestMethod = 'single-point' | 'multi-point'

/** Everything computed for one test direction. */
export interface DirectionResult extends LeakageMetrics {
  direction: TestDirection
  method: TestMethod
  /** Fitted n, or the assumed exponent for a one-reading test. */
  flowExponent: number
  flowExponentCi95: Interval | null
  /** C in cfm/Paⁿ (whatever the unit system). */
  flowCoefficient: number
  /** C in m³/(h·Paⁿ). */
  flowCoefficientSi: number
  /** Interval of C in cfm/Paⁿ. */
  flowCoefficientCi95: Interval | null
  /** r² of the log-log fit; null for one reading. */
  r2: number | null
  /** t(0.975, N−2) used for the intervals; null without intervals. */
  tValue: number | null
  cfm50Ci95: Interval | null
  ach50Ci95: Interval | null
  points: FlowPoint[]
  fitLine: FitLine
  /** Q_env/Q_fan; null unless both temperatures are given. */
  temperatureFactor: number | null
  /** Mean of the given baseline pressures (signed Pa); null when none given. */
  baselineAverage: number | null
  warnings: LeakageWarning[]
}

/**
 * The reported result: for one direction, that direction's values; for two, the average of the
 * two directions' metrics (ISO 9972 / ASTM E779 practice of reporting both and their mean —
 * from memory). Fields that do not average meaningfully are null for the average (see analyze.ts).
 */
export interface LeakageResult extends LeakageMetrics {
  units: UnitSystem
  /** What the top-level numbers describe. */
  basis: TestDirection | 'average'
  method: TestMethod
  flowExponent: number | null
  flowExponentCi95: Interval | null
  flowCoefficient: number | null
  flowCoefficientSi: number | null
  flowCoefficientCi95: Interval | null
  r2: number | null
  tValue: number | null
  cfm50Ci95: Interval | null
  ach50Ci95: Interval | null
  points: FlowPoint[]
  fitLine: FitLine | null
  temperatureFactor: number | null
  baselineAverage: number | null
  /** All warnings of every direction. */
  warnings: LeakageWarning[]
  /** Each direction analysed: `test` first, then `reverse` when given. */
  directions: DirectionResult[]
  /** Site elevation echoed from the request (ft or m), or null. */
  elevation: number | null
}

/** A result's figures without its plot data and per-direction detail (what a check reports at its top level). */
export type LeakageFigures = Omit<LeakageResult, 'points' | 'fitLine' | 'directions'>
