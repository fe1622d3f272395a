import { describe, expect, it } from 'vitest'
import {
  CM2_PER_IN2,
  M2_PER_FT2,
  M3H_PER_CFM,
  M3HM2_PER_CFMFT2,
  M3S_PER_CFM,
  M3_PER_FT3,
  M_PER_FT,
  REFERENCE_PRESSURE_PA,
  areaToFt2,
  cfmToFlow,
  flowToCfm,
  fahrenheitToCelsius,
  lengthToM,
  toKelvin,
  volumeToFt3,
} from '#shared/leakage'

function expectRel(actual: number, expected: number, rel: number): void {
  expect(Math.abs(actual - expected) / Math.abs(expected), `${actual} vs ${expected}`).toBeLessThanOrEqual(rel)
}

describe('unit factors', () => {
  it.each([
    // [name, value, expected, relative tolerance, source]
    ['ft → m', M_PER_FT, 0.3048, 0], // CHECKS.md §1, exact (NIST SP 811)
    ['ft² → m²', M2_PER_FT2, 0.09290304, 0], // CHECKS.md §1, exact
    ['ft³ → m³', M3_PER_FT3, 0.028316846592, 0], // CHECKS.md §1, exact
    ['in² → cm²', CM2_PER_IN2, 6.4516, 0], // CHECKS.md §1, exact
    ['cfm → m³/s', M3S_PER_CFM, 4.71947443e-4, 1e-9], // CHECKS.md §1 (9 significant figures)
    ['cfm → m³/h', M3H_PER_CFM, 1.6990108, 1e-8], // CHECKS.md §1 (8 significant figures)
    ['cfm/ft² → m³/(h·m²)', M3HM2_PER_CFMFT2, 18.288, 1e-15], // CHECKS.md §1, exact
  ] as const)('%s', (_name, value, expected, rel) => {
    expectRel(value, expected, rel)
  })

  it('1 cfm is 0.47194745 L/s', () => {
    // CHECKS.md §1 prints 0.47194745; the exact value 0.028316846592/60·1000 = 0.4719474432
    // rounds to 0.47194744, so the printed figure is off by one in its last digit: 1e-7 here.
    expectRel(M3S_PER_CFM * 1000, 0.47194745, 1e-7)
    expect(M3S_PER_CFM * 1000).toBeCloseTo(0.4719474432, 12) // exact from CHECKS.md §1 ft³ factor
  })

  it('0.2 in. w.c. rounds to the 50 Pa test pressure', () => {
    // 1 in. w.c. ≈ 249.09 Pa — CHECKS.md §1 [MEMORY for the exact factor], so "from memory".
    expect(Math.round(0.2 * 249.09)).toBe(REFERENCE_PRESSURE_PA) // common practice: tests are at 50 Pa
    expect(REFERENCE_PRESSURE_PA).toBe(50) // common practice (CHECKS.md §7)
  })
})

describe('conversions by unit system', () => {
  it('converts °F to °C and kelvin', () => {
    expect(fahrenheitToCelsius(32)).toBe(0) // CHECKS.md §1: (°F − 32)/1.8
    expectRel(fahrenheitToCelsius(69.8), 21, 1e-12) // CHECKS.md §1
    expect(toKelvin(0, 'si')).toBe(273.15) // CHECKS.md §1: K = °C + 273.15
    expectRel(toKelvin(-40, 'ip'), 233.15, 1e-12) // −40 °F = −40 °C, CHECKS.md §1 formula
  })

  it('leaves IP values alone and converts SI ones', () => {
    expect(flowToCfm(1000, 'ip')).toBe(1000)
    expectRel(flowToCfm(1.6990108, 'si'), 1, 1e-8) // CHECKS.md §1: 1 cfm = 1.6990108 m³/h
    expectRel(cfmToFlow(flowToCfm(1234.5, 'si'), 'si'), 1234.5, 1e-15)
    expectRel(volumeToFt3(0.028316846592, 'si'), 1, 1e-15) // CHECKS.md §1, exact
    expectRel(areaToFt2(0.09290304, 'si'), 1, 1e-15) // CHECKS.md §1, exact
    expectRel(lengthToM(18, 'ip'), 5.4864, 1e-15) // 18 × 0.3048, CHECKS.md §1
    expect(lengthToM(5, 'si')).toBe(5)
  })
})
