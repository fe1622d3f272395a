/**
 * Properties of the engine checked on seeded random inputs (fast-check).
 */
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import {
  M2_PER_FT2,
  M3H_PER_CFM,
  M3_PER_FT3,
  M_PER_FT,
  analyzeLeakage,
  fahrenheitToCelsius,
  type LeakageInput,
  type LeakageResult,
} from '#shared/leakage'

const SEED = 4242
const RUNS = { seed: SEED, numRuns: 300 }

function rel(a: number, b: number): number {
  return Math.abs(a - b) / Math.max(Math.abs(b), 1e-300)
}

// Distinct pressure magnitudes between 2 and 100 Pa (0.5 Pa apart at least).
const pressuresArb = fc.uniqueArray(fc.integer({ min: 4, max: 200 }).map((h) => h / 2), { minLength: 1, maxLength: 20 })

const houseArb = fc.record({
  volume: fc.double({ min: 2000, max: 200000, noNaN: true }),
  floorArea: fc.double({ min: 300, max: 20000, noNaN: true }),
  enclosureArea: fc.double({ min: 800, max: 40000, noNaN: true }),
  height: fc.double({ min: 8, max: 60, noNaN: true }),
})

const caseArb = fc.record({
  house: houseArb,
  pressures: pressuresArb,
  c: fc.double({ min: 10, max: 3000, noNaN: true }),
  n: fc.double({ min: 0.5, max: 1.0, noNaN: true }),
  scatter: fc.array(fc.double({ min: 0.9, max: 1.1, noNaN: true }), { minLength: 20, maxLength: 20 }),
  direction: fc.constantFrom('depressurization' as const, 'pressurization' as const),
  temps: fc.option(fc.tuple(fc.double({ min: 50, max: 85, noNaN: true }), fc.double({ min: -20, max: 100, noNaN: true })), { nil: undefined }),
  baseline: fc.option(fc.double({ min: -0.9, max: 0.9, noNaN: true }), { nil: undefined }),
})

type Case = typeof caseArb extends fc.Arbitrary<infer T> ? T : never

function ipInput(k: Case, flowScale = 1): LeakageInput {
  const sign = k.direction === 'depressurization' ? -1 : 1
  const base = k.baseline ?? 0
  return {
    units: 'ip',
    building: k.house,
    test: {
      direction: k.direction,
      ...(k.baseline === undefined ? {} : { baseline: { before: k.baseline, after: k.baseline } }),
      readings: k.pressures.map((p, i) => ({ pressure: sign * p + base, flow: flowScale * k.c * p ** k.n * (k.scatter[i] ?? 1) })),
      ...(k.temps === undefined ? {} : { insideTemperature: k.temps[0], outsideTemperature: k.temps[1] }),
    },
  }
}

// The same test written in SI with the exact factors of CHECKS.md §1.
function toSi(input: LeakageInput): LeakageInput {
  const b = input.building
  const t = input.test
  return {
    units: 'si',
    building: {
      volume: b.volume * M3_PER_FT3,
      floorArea: (b.floorArea as number) * M2_PER_FT2,
      enclosureArea: (b.enclosureArea as number) * M2_PER_FT2,
      height: (b.height as number) * M_PER_FT,
    },
    test: {
      ...t,
      readings: t.readings.map((r) => ({ pressure: r.pressure, flow: r.flow * M3H_PER_CFM })),
      insideTemperature: t.insideTemperature === undefined ? undefined : fahrenheitToCelsius(t.insideTemperature),
      outsideTemperature: t.outsideTemperature === undefined ? undefined : fahrenheitToCelsius(t.outsideTemperature),
    },
  }
}

const SAME_IN_BOTH = ['cfm50', 'q50', 'ach50', 'n50', 'cfm50PerEnclosureArea', 'airPermeability50', 'w50', 'ela4SqIn', 'eqla10Cm2', 'sla', 'nl', 'flowExponent', 'flowCoefficient'] as const

describe('engine properties (fast-check, seeded)', () => {
  it('exact power-law data recovers C and n', () => {
    fc.assert(
      fc.property(caseArb, (k) => {
        fc.pre(k.pressures.length >= 2)
        const exact: Case = { ...k, scatter: [], temps: undefined, baseline: undefined }
        const r = analyzeLeakage(ipInput(exact))
        expect(rel(r.flowExponent as number, k.n)).toBeLessThan(1e-9)
        expect(rel(r.flowCoefficient as number, k.c)).toBeLessThan(1e-9)
        expect(rel(r.cfm50, k.c * 50 ** k.n)).toBeLessThan(1e-9) // Q = C·ΔPⁿ at 50 Pa
        expect(r.r2 as number).toBeGreaterThan(1 - 1e-12)
      }),
      RUNS,
    )
  })

  it('the same house in SI gives the same ACH50/n50, q50 and every other metric', () => {
    fc.assert(
      fc.property(caseArb, (k) => {
        const ip = analyzeLeakage(ipInput(k))
        const si = analyzeLeakage(toSi(ipInput(k)))
        for (const field of SAME_IN_BOTH) expect(rel(si[field] as number, ip[field] as number), field).toBeLessThan(1e-9)
        expect(rel(si.points[0]?.envelopeFlow as number, (ip.points[0]?.envelopeFlow as number) * M3H_PER_CFM)).toBeLessThan(1e-12)
      }),
      RUNS,
    )
  })

  it('SI → IP → SI round trip of the inputs is the identity on ACH50', () => {
    fc.assert(
      fc.property(caseArb, (k) => {
        const si = toSi(ipInput(k))
        const back = analyzeLeakage({
          ...si,
          units: 'ip',
          building: { volume: si.building.volume / M3_PER_FT3, floorArea: (si.building.floorArea as number) / M2_PER_FT2 },
          test: { ...si.test, readings: si.test.readings.map((r) => ({ ...r, flow: r.flow / M3H_PER_CFM })), insideTemperature: undefined, outsideTemperature: undefined },
        })
        const siResult = analyzeLeakage({ ...si, test: { ...si.test, insideTemperature: undefined, outsideTemperature: undefined } })
        expect(rel(back.ach50, siResult.n50)).toBeLessThan(1e-9)
      }),
      RUNS,
    )
  })

  it('more flow never lowers ACH50 (all readings scaled by k ≥ 1)', () => {
    fc.assert(
      fc.property(caseArb, fc.double({ min: 1, max: 5, noNaN: true }), (k, scale) => {
        const before = analyzeLeakage(ipInput(k))
        const after = analyzeLeakage(ipInput(k, scale))
        expect(after.ach50).toBeGreaterThanOrEqual(before.ach50 * (1 - 1e-12))
        // Scaling flows scales C and every flow metric by exactly k; n is unchanged.
        expect(rel(after.ach50, before.ach50 * scale)).toBeLessThan(1e-9)
        expect(Math.abs((after.flowExponent as number) - (before.flowExponent as number))).toBeLessThan(1e-9)
      }),
      RUNS,
    )
  })

  it('a larger volume never raises ACH50', () => {
    fc.assert(
      fc.property(caseArb, fc.double({ min: 1, max: 10, noNaN: true }), (k, grow) => {
        const small = analyzeLeakage(ipInput(k))
        const big = analyzeLeakage(ipInput({ ...k, house: { ...k.house, volume: k.house.volume * grow } }))
        expect(big.ach50).toBeLessThanOrEqual(small.ach50 * (1 + 1e-12))
      }),
      RUNS,
    )
  })

  it('a baseline of 0 changes nothing compared with no baseline', () => {
    fc.assert(
      fc.property(caseArb, fc.constantFrom('both', 'before', 'after'), (k, which) => {
        const plain = ipInput({ ...k, baseline: undefined })
        const zero = { before: 0, after: 0 }
        const baseline = which === 'both' ? zero : which === 'before' ? { before: 0 } : { after: 0 }
        const withZero = analyzeLeakage({ ...plain, test: { ...plain.test, baseline } })
        const without = analyzeLeakage(plain)
        expect(withZero.baselineAverage).toBe(0)
        expect(without.baselineAverage).toBeNull()
        const strip = (r: LeakageResult) => ({ ...r, baselineAverage: null, directions: r.directions.map((d) => ({ ...d, baselineAverage: null })) })
        expect(strip(withZero)).toEqual(strip(without))
      }),
      RUNS,
    )
  })
})
