import { createRequire } from 'node:module'
import fc from 'fast-check'
import { linearRegression, linearRegressionLine, rSquared } from 'simple-statistics'
import { describe, expect, it } from 'vitest'
import {
  analyzeLeakage,
  fitLogLog,
  fitPowerLaw,
  lnGamma,
  regularizedIncompleteBeta,
  studentT975,
  studentTCdf,
  studentTQuantile,
} from '#shared/leakage'

// jstat ships no type declarations; only the two functions used here are described.
interface JStatStudentT {
  inv(p: number, df: number): number
  cdf(t: number, df: number): number
}
const require = createRequire(import.meta.url)
const { jStat } = require('jstat') as { jStat: { studentt: JStatStudentT } }

const SEED = 20261201

function expectRel(actual: number | null | undefined, expected: number, rel: number): void {
  expect(actual, 'value is missing').not.toBeNull()
  expect(actual, 'value is missing').not.toBeUndefined()
  const a = actual as number
  expect(Math.abs(a - expected) / Math.abs(expected), `${a} vs ${expected}`).toBeLessThanOrEqual(rel)
}

describe('Student t quantile', () => {
  const dfs = Array.from({ length: 60 }, (_, i) => i + 1)

  it.each(dfs)('t(0.975, %i) agrees with jstat studentt.inv', (df) => {
    // jstat 1.9.6 (general-purpose statistics package): its ibetainv stops at ~1e-8 relative,
    // so the comparison allows 1e-7; the exact round trip through our CDF is tighter below.
    expectRel(studentTQuantile(0.975, df), jStat.studentt.inv(0.975, df), 1e-7)
    // jstat's own CDF at our quantile gives back 0.975 (jstat precision ~1e-9).
    expect(Math.abs(jStat.studentt.cdf(studentTQuantile(0.975, df), df) - 0.975)).toBeLessThan(1e-8)
  })

  it.each([0.6, 0.9, 0.95, 0.995, 0.9995])('other probabilities (p = %f) agree with jstat for df 1..60', (p) => {
    for (const df of dfs) {
      expectRel(studentTQuantile(p, df), jStat.studentt.inv(p, df), 1e-7) // jstat studentt.inv
      expectRel(studentTQuantile(1 - p, df), jStat.studentt.inv(1 - p, df), 1e-7) // lower tail, jstat
    }
  })

  it('inverts its own CDF to ~1e-12', () => {
    for (const df of [1, 2, 3, 4.5, 6, 10, 30, 48, 200]) {
      for (const p of [0.001, 0.025, 0.3, 0.7, 0.975, 0.999]) {
        const t = studentTQuantile(p, df)
        expect(Math.abs(studentTCdf(t, df) - p) / Math.min(p, 1 - p)).toBeLessThan(1e-11)
      }
    }
  })

  it.each([
    [6, 2.4469], // CHECKS.md §2: t(0.975, 6) = 2.4469 [COMPUTED]
    [1, 12.7062], // from memory (printed t tables)
    [2, 4.3027], // from memory (printed t tables)
    [30, 2.0423], // from memory (printed t tables)
  ])('t(0.975, %i) ≈ %f', (df, expected) => {
    expect(Math.abs(studentT975(df) - expected)).toBeLessThanOrEqual(0.00005)
  })

  it('memoizes by degrees of freedom and returns the same value', () => {
    expect(studentT975(6)).toBe(studentT975(6))
    expect(studentT975(6)).toBe(studentTQuantile(0.975, 6))
  })

  it('is symmetric and zero at the median', () => {
    expect(studentTQuantile(0.5, 7)).toBe(0)
    expect(studentTQuantile(0.025, 7)).toBeCloseTo(-studentTQuantile(0.975, 7), 12)
  })

  it('rejects impossible arguments', () => {
    expect(() => studentTQuantile(0, 5)).toThrow(RangeError)
    expect(() => studentTQuantile(1, 5)).toThrow(RangeError)
    expect(() => studentTQuantile(0.9, 0)).toThrow(RangeError)
  })

  it('has a correct ln Γ and incomplete beta underneath', () => {
    expect(lnGamma(5)).toBeCloseTo(Math.log(24), 13) // Γ(5) = 4! (definition)
    expect(lnGamma(0.5)).toBeCloseTo(0.5 * Math.log(Math.PI), 13) // Γ(½) = √π (textbook)
    expect(regularizedIncompleteBeta(0.3, 1, 1)).toBeCloseTo(0.3, 14) // I_x(1,1) = x (textbook)
    expect(regularizedIncompleteBeta(0.3, 2, 1)).toBeCloseTo(0.09, 14) // I_x(a,1) = xᵃ (textbook)
  })
})

// Seeded random log-log datasets: N pressures in 1–100 Pa, a power law with multiplicative scatter.
const datasetArb = fc
  .record({
    pressures: fc.uniqueArray(fc.double({ min: 1, max: 100, noNaN: true }), {
      minLength: 3,
      maxLength: 50,
      comparator: (a, b) => Math.abs(a - b) < 1e-3,
    }),
    c: fc.double({ min: 5, max: 5000, noNaN: true }),
    n: fc.double({ min: 0.4, max: 1.1, noNaN: true }),
    scatter: fc.array(fc.double({ min: -0.08, max: 0.08, noNaN: true }), { minLength: 50, maxLength: 50 }),
  })
  .map(({ pressures, c, n, scatter }) => ({
    pressures,
    flows: pressures.map((p, i) => c * Math.pow(p, n) * Math.exp(scatter[i] ?? 0)),
  }))

describe('least-squares fit against general-purpose statistics packages', () => {
  it('slope, intercept and r² match simple-statistics on 300 seeded datasets', () => {
    fc.assert(
      fc.property(datasetArb, ({ pressures, flows }) => {
        const fit = fitPowerLaw(pressures, flows)
        const data = pressures.map((p, i) => [Math.log(p), Math.log(flows[i] as number)])
        const reference = linearRegression(data) // simple-statistics 7.12.1
        expect(Math.abs(fit.slope - reference.m)).toBeLessThan(1e-9)
        expect(Math.abs(fit.intercept - reference.b)).toBeLessThan(1e-8)
        // simple-statistics rSquared(data, line)
        expect(Math.abs(fit.r2 - rSquared(data, linearRegressionLine(reference)))).toBeLessThan(1e-9)
      }),
      { seed: SEED, numRuns: 300 },
    )
  })

  it('standard errors equal the textbook OLS formulas on 300 seeded datasets', () => {
    fc.assert(
      fc.property(datasetArb, ({ pressures, flows }) => {
        const fit = fitPowerLaw(pressures, flows)
        // Textbook OLS (e.g. any regression text): s² = SSE/(N−2), SE(b) = s/√Sxx,
        // SE(a) = s·√(1/N + x̄²/Sxx); residuals from simple-statistics' line.
        const x = pressures.map(Math.log)
        const y = flows.map(Math.log)
        const N = x.length
        const line = linearRegressionLine(linearRegression(x.map((xi, i) => [xi, y[i] as number])))
        const xBar = x.reduce((a, b) => a + b, 0) / N
        const sxx = x.reduce((a, xi) => a + (xi - xBar) ** 2, 0)
        const sse = x.reduce((a, xi, i) => a + ((y[i] as number) - line(xi)) ** 2, 0)
        const s2 = sse / (N - 2)
        // Relative 1e-7, with an absolute floor of 1e-10 for scatter-free data, where both
        // standard errors are round-off (~1e-13) rather than statistics.
        const seSlope = Math.sqrt(s2 / sxx)
        const seIntercept = Math.sqrt(s2 * (1 / N + (xBar * xBar) / sxx))
        expect(Math.abs((fit.slopeStdError as number) - seSlope)).toBeLessThanOrEqual(1e-7 * seSlope + 1e-10)
        expect(Math.abs((fit.interceptStdError as number) - seIntercept)).toBeLessThanOrEqual(1e-7 * seIntercept + 1e-10)
      }),
      { seed: SEED + 1, numRuns: 300 },
    )
  })

  it('analysis intervals are n ± t·S_n with jstat t, on 100 seeded datasets', () => {
    fc.assert(
      fc.property(datasetArb, ({ pressures, flows }) => {
        const result = analyzeLeakage({
          units: 'ip',
          building: { volume: 20000 },
          test: { direction: 'pressurization', readings: pressures.map((p, i) => ({ pressure: p, flow: flows[i] as number })) },
        })
        const fit = fitPowerLaw(pressures, flows)
        const t = jStat.studentt.inv(0.975, pressures.length - 2) // jstat
        const se = fit.slopeStdError as number
        const ci = result.flowExponentCi95
        expect(ci).not.toBeNull()
        // CHECKS.md §2: n ± t·S_n (absolute tolerance: jstat t carries ~1e-8 relative error)
        expect(Math.abs((ci as [number, number])[0] - (fit.slope - t * se))).toBeLessThan(1e-8)
        expect(Math.abs((ci as [number, number])[1] - (fit.slope + t * se))).toBeLessThan(1e-8)
      }),
      { seed: SEED + 2, numRuns: 100 },
    )
  })

  it('gives no standard errors for two points and refuses a single pressure', () => {
    const two = fitPowerLaw([10, 50], [500, 1400])
    expect(two.slopeStdError).toBeNull()
    expect(two.interceptStdError).toBeNull()
    expect(two.r2).toBe(1) // two points always lie on their line
    expect(() => fitLogLog([1], [1], 1)).toThrow(RangeError)
    expect(() => fitPowerLaw([20, 20], [500, 510])).toThrow(RangeError)
  })
})
