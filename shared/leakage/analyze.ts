/**
 * Main entry of the leakage engine: one or two fan-pressurization tests → CFM50, ACH50/n50,
 * per-area metrics, leakage areas, intervals and warnings.
 *
 * Input is assumed validated (see `CalculationRequest` in schema.ts); this hot path allocates
 * only the result, its points and its warnings.
 */
import { fitLogLog, studentT975 } from './regression'
import type {
  BuildingInput,
  DirectionResult,
  FitLine,
  FlowPoint,
  Interval,
  LeakageInput,
  LeakageResult,
  LeakageWarning,
  TestInput,
} from './types'
import {
  AIR_DENSITY_KG_M3,
  CM2_PER_IN2,
  M2_PER_FT2,
  M2_PER_IN2,
  M3H_PER_CFM,
  M3HM2_PER_CFMFT2,
  M3_PER_FT3,
  M3S_PER_CFM,
  M_PER_FT,
  REFERENCE_PRESSURE_PA,
  type UnitSystem,
  toKelvin,
} from './units'

/** Default flow exponent of a one-reading test (RESNET/ICC 380 one-point method — from memory; CHECKS.md §5). */
export const DEFAULT_ASSUMED_EXPONENT = 0.65

/** Test-quality thresholds (CHECKS.md §2, "often applied" — from memory; warnings, not errors). */
export const QUALITY_LIMITS = {
  minMultiPoints: 5,
  minExponent: 0.5,
  maxExponent: 1.0,
  minR2: 0.98,
  maxBaselinePa: 5,
} as const

const LN_REF = Math.log(REFERENCE_PRESSURE_PA)
const LN_M3H_PER_CFM = Math.log(M3H_PER_CFM)
// L = Q_r·√(ρ/(2·ΔP_r))/C_D (ASHRAE Handbook—Fundamentals, LBL model; CHECKS.md §4):
// ELA at 4 Pa with C_D = 1; EqLA at 10 Pa with C_D = 0.611 (CGSB 149.10 — from memory).
const ELA_FACTOR = M3S_PER_CFM * Math.sqrt(AIR_DENSITY_KG_M3 / (2 * 4)) / 1
const EQLA_FACTOR = (M3S_PER_CFM * Math.sqrt(AIR_DENSITY_KG_M3 / (2 * 10))) / 0.611
const LN_4 = Math.log(4)
const LN_10 = Math.log(10)
// NL = 1000·SLA·(H/2.5 m)^0.3 (ASHRAE Std 119 — from memory; CHECKS.md §4).
const NL_REFERENCE_HEIGHT_M = 2.5

/** Building dimensions converted once per analysis. */
interface Dimensions {
  volumeFt3: number
  floorAreaFt2: number | null
  enclosureAreaFt2: number | null
  heightM: number | null
}

function dimensionsOf(building: BuildingInput, units: UnitSystem): Dimensions {
  const ip = units === 'ip'
  const { volume, floorArea, enclosureArea, height } = building
  return {
    volumeFt3: ip ? volume : volume / M3_PER_FT3,
    floorAreaFt2: floorArea === undefined ? null : ip ? floorArea : floorArea / M2_PER_FT2,
    enclosureAreaFt2: enclosureArea === undefined ? null : ip ? enclosureArea : enclosureArea / M2_PER_FT2,
    heightM: height === undefined ? null : ip ? height * M_PER_FT : height,
  }
}

// Scratch buffers for ln ΔP and ln Q: reused across calls (synchronous, never shared between
// requests mid-call) so the hot path does not allocate them. They grow if ever needed.
let scratchX = new Float64Array(64)
let scratchY = new Float64Array(64)

/**
 * Temperature correction of fan flow to envelope flow, Q_env/Q_fan (CHECKS.md §6; conservation
 * of mass, Roulet 2008 eq. 4.5): depressurizing T_out/T_in, pressurizing T_in/T_out, in kelvin.
 * Null unless both temperatures are given.
 */
export function temperatureFactor(test: TestInput, units: UnitSystem): number | null {
  const { insideTemperature, outsideTemperature } = test
  if (insideTemperature === undefined || outsideTemperature === undefined) return null
  const tIn = toKelvin(insideTemperature, units)
  const tOut = toKelvin(outsideTemperature, units)
  return test.direction === 'depressurization' ? tOut / tIn : tIn / tOut
}

/** Mean of the given baseline pressures (signed Pa), or null when none is given (ASTM E779 practice of averaging before/after — from memory). */
export function baselineAverage(test: TestInput): number | null {
  const before = test.baseline?.before
  const after = test.baseline?.after
  if (before === undefined) return after === undefined ? null : after
  return after === undefined ? before : (before + after) / 2
}

// Up to 1 decimal (pressures) or 2 decimals (exponents), without trailing zeros.
function fmt(value: number, decimals: number): string {
  return String(Number(value.toFixed(decimals)))
}

function interval(center: number, halfWidthLn: number): Interval {
  return [center * Math.exp(-halfWidthLn), center * Math.exp(halfWidthLn)]
}

/**
 * Analyses one test direction. `test` must be validated (readings signed by direction, adjusted
 * magnitudes ≥ 1 Pa, distinct pressures).
 *
 * Steps: subtract the mean baseline, take magnitudes; correct fan flow to envelope flow
 * (CHECKS.md §6); one reading → CFM50 = Q·(50/ΔP)ⁿ with the assumed n (CHECKS.md §5); two or
 * more → OLS on logarithms with 95 % intervals (Roulet 2008 eqs. 7.13–7.16; CHECKS.md §2).
 */
export function analyzeTest(test: TestInput, building: BuildingInput, units: UnitSystem): DirectionResult {
  return analyzeDirection(test, dimensionsOf(building, units), units)
}

function analyzeDirection(test: TestInput, dims: Dimensions, units: UnitSystem): DirectionResult {
  const readings = test.readings
  const count = readings.length
  const direction = test.direction
  const baseAvg = baselineAverage(test)
  const base = baseAvg ?? 0
  const tempFactor = temperatureFactor(test, units)
  const flowScale = tempFactor ?? 1
  // Fit in cfm whatever the input unit: ln Q_cfm = ln Q_input − ln(m³/h per cfm) in SI.
  const lnToCfm = units === 'ip' ? 0 : -LN_M3H_PER_CFM

  if (scratchX.length < count) {
    scratchX = new Float64Array(count)
    scratchY = new Float64Array(count)
  }
  const xs = scratchX
  const ys = scratchY
  // Filled by push so V8 keeps a packed array (a pre-sized `new Array(n)` starts out holey).
  const points: FlowPoint[] = []
  let pMin = Infinity
  let pMax = -Infinity
  for (let i = 0; i < count; i++) {
    const r = readings[i] as TestInput['readings'][number]
    const dp = Math.abs(r.pressure - base)
    const envelope = r.flow * flowScale
    points.push({ pressure: dp, fanFlow: r.flow, envelopeFlow: envelope })
    xs[i] = Math.log(dp)
    ys[i] = Math.log(envelope) + lnToCfm
    if (dp < pMin) pMin = dp
    if (dp > pMax) pMax = dp
  }

  const warnings: LeakageWarning[] = []
  let method: DirectionResult['method']
  let n: number
  let lnC: number
  let cfm50: number
  let r2: number | null = null
  let tValue: number | null = null
  let nCi: Interval | null = null
  let cCi: Interval | null = null
  let cfm50Ci: Interval | null = null
  let band: FitLine['band'] = null

  if (count === 1) {
    method = 'single-point'
    n = test.assumedExponent ?? DEFAULT_ASSUMED_EXPONENT
    // CFM50 = Q·(50/ΔP)ⁿ (CHECKS.md §5); C = Q/ΔPⁿ. Computed with pow rather than exp/log so a
    // reading taken at exactly 50 Pa gives CFM50 equal to the flow, bit for bit.
    const only = points[0] as FlowPoint
    const qCfm = units === 'ip' ? only.envelopeFlow : only.envelopeFlow / M3H_PER_CFM
    cfm50 = qCfm * Math.pow(REFERENCE_PRESSURE_PA / only.pressure, n)
    lnC = Math.log(qCfm) - n * (xs[0] as number)
    if (pMax < REFERENCE_PRESSURE_PA) {
      warnings.push({
        code: 'extrapolated',
        message: `Extrapolated from ${fmt(pMax, 1)} Pa to ${REFERENCE_PRESSURE_PA} Pa with an assumed exponent of ${fmt(n, 2)}.`,
        direction,
      })
    }
  } else {
    method = 'multi-point'
    const fit = fitLogLog(xs, ys, count)
    n = fit.slope
    lnC = fit.intercept
    r2 = fit.r2
    cfm50 = Math.exp(lnC + n * LN_REF)
    const sn = fit.slopeStdError
    const slnC = fit.interceptStdError
    if (sn !== null && slnC !== null) {
      const t = studentT975(count - 2)
      tValue = t
      // n ± t·S_n; C·exp(±t·S_lnC); Q̂(50)·exp(±t·S_y(ln 50)) — CHECKS.md §2.
      nCi = [n - t * sn, n + t * sn]
      cCi = interval(Math.exp(lnC), t * slnC)
      const spread = fit.sxx / count
      const d50 = LN_REF - fit.meanX
      cfm50Ci = interval(cfm50, t * sn * Math.sqrt(spread + d50 * d50))
      band = { t, meanLnPressure: fit.meanX, exponentStdError: sn, spread }
    }
    if (count < QUALITY_LIMITS.minMultiPoints) {
      warnings.push({
        code: 'few-points',
        message: `Only ${count} readings; a multi-point test normally has at least ${QUALITY_LIMITS.minMultiPoints}.`,
        direction,
      })
    }
    if (n < QUALITY_LIMITS.minExponent || n > QUALITY_LIMITS.maxExponent) {
      warnings.push({
        code: 'exponent-out-of-range',
        message: `The fitted flow exponent ${fmt(n, 3)} is outside the usual range of 0.5 to 1.0; check the readings.`,
        direction,
      })
    }
    if (fit.r2 < QUALITY_LIMITS.minR2) {
      warnings.push({
        code: 'low-r2',
        message: `The readings fit the line poorly (r² = ${fmt(fit.r2, 4)}, below ${QUALITY_LIMITS.minR2}).`,
        direction,
      })
    }
    if (pMax < REFERENCE_PRESSURE_PA) {
      warnings.push({
        code: 'no-reading-at-50',
        message: `No reading at or above ${REFERENCE_PRESSURE_PA} Pa; CFM50 is extrapolated from a highest reading of ${fmt(pMax, 1)} Pa.`,
        direction,
      })
    }
  }

  // Each recorded baseline is checked, not only the mean: +6 then −6 Pa averages to 0 but
  // still signals wind or stack effect.
  const before = test.baseline?.before
  const after = test.baseline?.after
  const worstBaseline = Math.max(before === undefined ? 0 : Math.abs(before), after === undefined ? 0 : Math.abs(after))
  if (worstBaseline > QUALITY_LIMITS.maxBaselinePa) {
    warnings.push({
      code: 'high-baseline',
      message: `A baseline pressure of ${fmt(worstBaseline, 1)} Pa exceeds ${QUALITY_LIMITS.maxBaselinePa} Pa; wind or stack effect may bias the result.`,
      direction,
    })
  }

  const C = Math.exp(lnC)
  const ela = ELA_FACTOR * Math.exp(lnC + n * LN_4)
  const eqla = EQLA_FACTOR * Math.exp(lnC + n * LN_10)
  const volumeFt3 = dims.volumeFt3
  const q50 = cfm50 * M3H_PER_CFM
  // ACH50 = CFM50·60/V_ft³ (CHECKS.md §3), multiplied before dividing so round inputs at a code
  // limit stay exact (900·60/18000 = 3, not 3.0000000000000004).
  const ach50 = (cfm50 * 60) / volumeFt3
  const encl = dims.enclosureAreaFt2
  const floor = dims.floorAreaFt2
  const sla = floor === null ? null : ela / (floor * M2_PER_FT2)
  const heightM = dims.heightM

  return {
    direction,
    method,
    flowExponent: n,
    flowExponentCi95: nCi,
    flowCoefficient: C,
    flowCoefficientSi: C * M3H_PER_CFM,
    flowCoefficientCi95: cCi,
    r2,
    tValue,
    cfm50,
    cfm50Ci95: cfm50Ci,
    q50,
    // ACH50 = CFM50·60/V_ft³ (CHECKS.md §3); n50 = q50/V_m³ is algebraically the same number.
    ach50,
    n50: ach50,
    ach50Ci95: cfm50Ci === null ? null : [(cfm50Ci[0] * 60) / volumeFt3, (cfm50Ci[1] * 60) / volumeFt3],
    // Per-area metrics: CHECKS.md §3 (1 cfm/ft² = 18.288 m³/(h·m²), CHECKS.md §1).
    cfm50PerEnclosureArea: encl === null ? null : cfm50 / encl,
    cfm50PerFloorArea: floor === null ? null : cfm50 / floor,
    airPermeability50: encl === null ? null : (cfm50 / encl) * M3HM2_PER_CFMFT2,
    w50: floor === null ? null : (cfm50 / floor) * M3HM2_PER_CFMFT2,
    ela4SqIn: ela / M2_PER_IN2,
    ela4Cm2: (ela / M2_PER_IN2) * CM2_PER_IN2,
    eqla10SqIn: eqla / M2_PER_IN2,
    eqla10Cm2: (eqla / M2_PER_IN2) * CM2_PER_IN2,
    sla,
    nl: sla === null || heightM === null ? null : 1000 * sla * Math.pow(heightM / NL_REFERENCE_HEIGHT_M, 0.3),
    points,
    fitLine: {
      flowUnit: units === 'ip' ? 'cfm' : 'm3/h',
      lnCoefficient: lnC - lnToCfm,
      exponent: n,
      pressureRange: [pMin, pMax],
      band,
    },
    temperatureFactor: tempFactor,
    baselineAverage: baseAvg,
    warnings,
  }
}

/**
 * Predicted envelope flow at a pressure from a fit line, with the 95 % confidence band of the
 * fitted line: Q̂ = C·Pⁿ, Q̂·exp(±t·S_y(x)), S_y(x) = S_n·√(((N−1)/N)·S_x² + (ln P − x̄)²)
 * (CHECKS.md §2; ASTM E779 form from memory). Flows in the fit line's unit; low/high are null
 * when the line has no band (one or two readings).
 */
export function predictFlow(fit: FitLine, pressure: number): { flow: number; low: number | null; high: number | null } {
  const x = Math.log(pressure)
  const flow = Math.exp(fit.lnCoefficient + fit.exponent * x)
  const band = fit.band
  if (band === null) return { flow, low: null, high: null }
  const d = x - band.meanLnPressure
  const half = band.t * band.exponentStdError * Math.sqrt(band.spread + d * d)
  return { flow, low: flow * Math.exp(-half), high: flow * Math.exp(half) }
}

function withDefaultsFrom(reverse: TestInput, main: TestInput): TestInput {
  return {
    ...reverse,
    insideTemperature: reverse.insideTemperature ?? main.insideTemperature,
    outsideTemperature: reverse.outsideTemperature ?? main.outsideTemperature,
    assumedExponent: reverse.assumedExponent ?? main.assumedExponent,
  }
}

function mean(a: number, b: number): number {
  return (a + b) / 2
}

function meanOrNull(a: number | null, b: number | null): number | null {
  return a === null || b === null ? null : (a + b) / 2
}

// Explicit literal (not a spread) keeps one object shape for every result and leaves out
// `direction`, which the top level names `basis`.
function reportOne(d: DirectionResult, units: UnitSystem, elevation: number | null): LeakageResult {
  return {
    units,
    basis: d.direction,
    method: d.method,
    flowExponent: d.flowExponent,
    flowExponentCi95: d.flowExponentCi95,
    flowCoefficient: d.flowCoefficient,
    flowCoefficientSi: d.flowCoefficientSi,
    flowCoefficientCi95: d.flowCoefficientCi95,
    r2: d.r2,
    tValue: d.tValue,
    cfm50: d.cfm50,
    cfm50Ci95: d.cfm50Ci95,
    q50: d.q50,
    ach50: d.ach50,
    n50: d.n50,
    ach50Ci95: d.ach50Ci95,
    cfm50PerEnclosureArea: d.cfm50PerEnclosureArea,
    cfm50PerFloorArea: d.cfm50PerFloorArea,
    airPermeability50: d.airPermeability50,
    w50: d.w50,
    ela4SqIn: d.ela4SqIn,
    ela4Cm2: d.ela4Cm2,
    eqla10SqIn: d.eqla10SqIn,
    eqla10Cm2: d.eqla10Cm2,
    sla: d.sla,
    nl: d.nl,
    points: d.points,
    fitLine: d.fitLine,
    temperatureFactor: d.temperatureFactor,
    baselineAverage: d.baselineAverage,
    warnings: d.warnings,
    directions: [d],
    elevation,
  }
}

/**
 * Analyses a validated calculation request.
 *
 * One direction: the top-level fields are that direction's. Two directions (`reverse` given):
 * each direction is analysed on its own and the top-level metrics are their arithmetic mean —
 * both directions and their average are reported, as ASTM E779 and ISO 9972 do (from memory).
 * Every metric here is linear in CFM50 or in a leakage area, so averaging the metrics equals
 * computing them from the mean CFM50 and mean areas. For the average, C, n, r², intervals,
 * points, fit line, temperature factor and baseline are null/empty: the mean of two power laws
 * is not a power law, and no sourced rule combines the two intervals — see `directions`.
 */
export function analyzeLeakage(input: LeakageInput): LeakageResult {
  const units = input.units
  const dims = dimensionsOf(input.building, units)
  const first = analyzeDirection(input.test, dims, units)
  const elevation = input.building.elevation ?? null
  if (input.reverse === undefined) {
    return reportOne(first, units, elevation)
  }
  const second = analyzeDirection(withDefaultsFrom(input.reverse, input.test), dims, units)
  const cfm50 = mean(first.cfm50, second.cfm50)
  const ach50 = mean(first.ach50, second.ach50)
  return {
    units,
    basis: 'average',
    method: first.method === 'multi-point' && second.method === 'multi-point' ? 'multi-point' : 'single-point',
    flowExponent: null,
    flowExponentCi95: null,
    flowCoefficient: null,
    flowCoefficientSi: null,
    flowCoefficientCi95: null,
    r2: null,
    tValue: null,
    cfm50,
    cfm50Ci95: null,
    q50: mean(first.q50, second.q50),
    ach50,
    n50: ach50,
    ach50Ci95: null,
    cfm50PerEnclosureArea: meanOrNull(first.cfm50PerEnclosureArea, second.cfm50PerEnclosureArea),
    cfm50PerFloorArea: meanOrNull(first.cfm50PerFloorArea, second.cfm50PerFloorArea),
    airPermeability50: meanOrNull(first.airPermeability50, second.airPermeability50),
    w50: meanOrNull(first.w50, second.w50),
    ela4SqIn: mean(first.ela4SqIn, second.ela4SqIn),
    ela4Cm2: mean(first.ela4Cm2, second.ela4Cm2),
    eqla10SqIn: mean(first.eqla10SqIn, second.eqla10SqIn),
    eqla10Cm2: mean(first.eqla10Cm2, second.eqla10Cm2),
    sla: meanOrNull(first.sla, second.sla),
    nl: meanOrNull(first.nl, second.nl),
    points: [],
    fitLine: null,
    temperatureFactor: null,
    baselineAverage: null,
    warnings: [...first.warnings, ...second.warnings],
    directions: [first, second],
    elevation,
  }
}
