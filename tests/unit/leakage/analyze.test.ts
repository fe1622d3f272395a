import { describe, expect, it } from 'vitest'
import {
  LEAKAGE_METRICS,
  M3H_PER_CFM,
  analyzeLeakage,
  analyzeTest,
  metricValue,
  predictFlow,
  type LeakageInput,
  type Reading,
  type TestInput,
} from '#shared/leakage'

// Synthetic readings on Q = c·ΔPⁿ with optional multiplicative scatter (no reference data).
function powerLaw(pressures: number[], c: number, n: number, sign: -1 | 1, scatter: number[] = []): Reading[] {
  return pressures.map((p, i) => ({ pressure: sign * p, flow: c * p ** n * (scatter[i] ?? 1) }))
}

const house = { volume: 18000, floorArea: 2000, enclosureArea: 4340, height: 18 }
const pressures = [15, 20, 25, 30, 35, 40, 45, 50, 55, 60]
const scatter = [1.01, 0.99, 1.005, 0.995, 1.0, 1.012, 0.988, 1.003, 0.997, 1.0]

function depress(readings: Reading[], extra: Partial<TestInput> = {}): LeakageInput {
  return { units: 'ip', building: house, test: { direction: 'depressurization', readings, ...extra } }
}

describe('warnings', () => {
  it('none for a clean 10-point test', () => {
    expect(analyzeLeakage(depress(powerLaw(pressures, 100, 0.65, -1, scatter))).warnings).toEqual([])
  })

  it('few-points below 5 readings (CHECKS.md §2 validity list, from memory)', () => {
    const r = analyzeLeakage(depress(powerLaw([20, 40, 60], 100, 0.65, -1, [1.01, 0.99, 1])))
    expect(r.warnings.map((w) => w.code)).toEqual(['few-points'])
    expect(r.warnings[0]?.message).toBe('Only 3 readings; a multi-point test normally has at least 5.')
  })

  it.each([
    [0.45, '0.45'],
    [1.1, '1.1'],
  ])('exponent-out-of-range for n = %f (CHECKS.md §2, from memory: 0.5–1.0)', (n, shown) => {
    const r = analyzeLeakage(depress(powerLaw(pressures, 100, n, -1)))
    expect(r.warnings.map((w) => w.code)).toEqual(['exponent-out-of-range'])
    expect(r.warnings[0]?.message).toContain(`fitted flow exponent ${shown} `)
  })

  it('low-r2 below 0.98 (CHECKS.md §2, from memory)', () => {
    const noisy = [1.3, 0.7, 1.25, 0.75, 1.2, 0.8, 1.3, 0.7, 1.2, 0.85]
    const r = analyzeLeakage(depress(powerLaw(pressures, 100, 0.65, -1, noisy)))
    expect(r.r2).toBeLessThan(0.98)
    expect(r.warnings.map((w) => w.code)).toContain('low-r2')
  })

  it('high-baseline when a baseline reading exceeds 5 Pa (CHECKS.md §2, from memory)', () => {
    const r = analyzeLeakage(depress(powerLaw(pressures, 100, 0.65, -1, scatter).map((x) => ({ ...x, pressure: x.pressure - 6 })), { baseline: { before: -6.2 } }))
    expect(r.warnings.map((w) => w.code)).toEqual(['high-baseline'])
    expect(r.warnings[0]?.message).toContain('6.2 Pa exceeds 5 Pa')
  })

  it('high-baseline even when before and after cancel in the mean', () => {
    const r = analyzeLeakage(depress(powerLaw(pressures, 100, 0.65, -1, scatter), { baseline: { before: -6, after: 6 } }))
    expect(r.baselineAverage).toBe(0)
    expect(r.warnings.map((w) => w.code)).toEqual(['high-baseline'])
  })

  it('no-reading-at-50 when every multi-point reading is below 50 Pa (CHECKS.md §2, from memory)', () => {
    const r = analyzeLeakage(depress(powerLaw([10, 15, 20, 25, 30, 35, 45], 100, 0.65, -1, scatter)))
    expect(r.warnings).toEqual([
      {
        code: 'no-reading-at-50',
        message: 'No reading at or above 50 Pa; CFM50 is extrapolated from a highest reading of 45 Pa.',
        direction: 'depressurization',
      },
    ])
  })

  it('extrapolated only for a single reading below 50 Pa', () => {
    expect(analyzeLeakage(depress([{ pressure: -50, flow: 1000 }])).warnings).toEqual([])
    expect(analyzeLeakage(depress([{ pressure: -60, flow: 1000 }])).warnings).toEqual([])
    expect(analyzeLeakage(depress([{ pressure: -25, flow: 1000 }], { assumedExponent: 0.6 })).warnings[0]?.message).toBe(
      'Extrapolated from 25 Pa to 50 Pa with an assumed exponent of 0.6.',
    )
  })
})

describe('multi-point details', () => {
  it('two readings: a fit without intervals', () => {
    const r = analyzeLeakage(depress(powerLaw([25, 50], 100, 0.65, -1)))
    expect(r.method).toBe('multi-point')
    expect(r.flowExponent).toBeCloseTo(0.65, 12)
    expect(r.r2).toBe(1)
    expect(r.tValue).toBeNull()
    expect(r.flowExponentCi95).toBeNull()
    expect(r.cfm50Ci95).toBeNull()
    expect(r.ach50Ci95).toBeNull()
    expect(r.fitLine?.band).toBeNull()
    expect(r.warnings.map((w) => w.code)).toEqual(['few-points'])
  })

  it('ignores the assumed exponent when it has two or more readings', () => {
    const readings = powerLaw(pressures, 100, 0.65, -1, scatter)
    expect(analyzeLeakage(depress(readings, { assumedExponent: 0.9 })).cfm50).toBe(analyzeLeakage(depress(readings)).cfm50)
  })

  it('intervals contain their estimate, and the band is narrowest near the mean pressure', () => {
    const r = analyzeLeakage(depress(powerLaw(pressures, 100, 0.65, -1, scatter)))
    const [lo, hi] = r.cfm50Ci95 ?? [NaN, NaN]
    expect(lo).toBeLessThan(r.cfm50)
    expect(hi).toBeGreaterThan(r.cfm50)
    const fit = r.fitLine
    if (fit === null || fit.band === null) throw new Error('expected a fit line with a band')
    const width = (p: number) => {
      const { flow, low, high } = predictFlow(fit, p)
      return Math.log((high as number) / flow) - Math.log(flow / (low as number))
    }
    const relWidth = (p: number) => {
      const { flow, high } = predictFlow(fit, p)
      return Math.log((high as number) / flow)
    }
    expect(Math.abs(width(30))).toBeLessThan(1e-12) // symmetric on the log scale
    const mean = Math.exp(fit.band.meanLnPressure)
    expect(relWidth(mean)).toBeLessThan(relWidth(10))
    expect(relWidth(mean)).toBeLessThan(relWidth(100))
    expect(fit.pressureRange).toEqual([15, 60])
  })

  it('a single-reading fit line has no band', () => {
    const r = analyzeLeakage(depress([{ pressure: -50, flow: 1000 }]))
    const p = predictFlow(r.fitLine as NonNullable<typeof r.fitLine>, 50)
    expect(p.flow).toBeCloseTo(1000, 9)
    expect(p.low).toBeNull()
    expect(p.high).toBeNull()
  })

  it('per-reading monotonicity does NOT hold: more flow at the lowest pressure can lower CFM50', () => {
    // Least squares gives the lowest reading a negative weight in the prediction at 50 Pa when 50 Pa
    // lies above the mean log pressure (textbook OLS leverage) — why the property test scales all flows.
    const readings = powerLaw([10, 15, 20, 25, 30, 40, 50, 60], 100, 0.65, -1)
    const raised = readings.map((x, i) => (i === 0 ? { ...x, flow: x.flow * 1.1 } : x))
    expect(analyzeLeakage(depress(raised)).cfm50).toBeLessThan(analyzeLeakage(depress(readings)).cfm50)
  })
})

describe('units and outputs', () => {
  it('keeps flowCoefficient in cfm/Paⁿ and flowCoefficientSi in m³/(h·Paⁿ) for SI input', () => {
    const si = analyzeLeakage({
      units: 'si',
      building: { volume: 500, floorArea: 200, enclosureArea: 450, height: 6 },
      test: { direction: 'pressurization', readings: powerLaw(pressures, 150, 0.62, 1, scatter) },
    })
    expect(si.flowCoefficientSi).toBeCloseTo(150, -1) // the data were made in m³/h
    expect((si.flowCoefficientSi as number) / (si.flowCoefficient as number)).toBeCloseTo(M3H_PER_CFM, 12) // CHECKS.md §1
    expect(si.fitLine?.flowUnit).toBe('m3/h')
    // The fit line predicts in the input unit: at 50 Pa it gives q50.
    expect(predictFlow(si.fitLine as NonNullable<typeof si.fitLine>, 50).flow).toBeCloseTo(si.q50, 9)
    expect(si.points[0]?.fanFlow).toBe(si.directions[0]?.points[0]?.fanFlow)
    // n50 = q50/V (CHECKS.md §3)
    expect(si.n50).toBeCloseTo(si.q50 / 500, 12)
    expect(si.airPermeability50).toBeCloseTo(si.q50 / 450, 12) // CHECKS.md §3
    expect(si.w50).toBeCloseTo(si.q50 / 200, 12) // CHECKS.md §3
  })

  it('nulls the metrics whose dimension is missing, and echoes elevation', () => {
    const r = analyzeLeakage({
      units: 'ip',
      building: { volume: 18000, elevation: 5280 },
      test: { direction: 'depressurization', readings: [{ pressure: -50, flow: 1500 }] },
    })
    expect(r.cfm50PerEnclosureArea).toBeNull()
    expect(r.airPermeability50).toBeNull()
    expect(r.cfm50PerFloorArea).toBeNull()
    expect(r.w50).toBeNull()
    expect(r.sla).toBeNull()
    expect(r.nl).toBeNull()
    expect(r.elevation).toBe(5280)
    expect(r.ach50).toBe(5) // 1500·60/18000, CHECKS.md §3 definition
  })

  it('SLA without height gives no NL', () => {
    const r = analyzeLeakage({
      units: 'ip',
      building: { volume: 18000, floorArea: 2000 },
      test: { direction: 'depressurization', readings: [{ pressure: -50, flow: 1500 }] },
    })
    expect(r.sla).not.toBeNull()
    expect(r.nl).toBeNull()
  })

  it('metricValue reads every metric by name', () => {
    const r = analyzeLeakage(depress(powerLaw(pressures, 100, 0.65, -1, scatter)))
    for (const metric of LEAKAGE_METRICS) expect(metricValue(r, metric)).toBe(r[metric])
    expect(metricValue(r, 'n50')).toBe(metricValue(r, 'ach50')) // CHECKS.md §3: same number
    const bare = analyzeLeakage({ units: 'ip', building: { volume: 9000 }, test: depress([{ pressure: -50, flow: 600 }]).test })
    expect(metricValue(bare, 'airPermeability50')).toBeNull()
    expect(metricValue(bare, 'ach50')).toBe(4) // 600·60/9000
  })
})

describe('both directions', () => {
  const input: LeakageInput = {
    units: 'ip',
    building: house,
    test: {
      direction: 'depressurization',
      readings: powerLaw(pressures, 100, 0.65, -1, scatter),
      insideTemperature: 70,
      outsideTemperature: 32,
    },
    reverse: { direction: 'pressurization', readings: powerLaw(pressures, 110, 0.63, 1, scatter), baseline: { before: 0.5 } },
  }

  it('reports each direction and their average (ASTM E779 / ISO 9972 practice, from memory)', () => {
    const r = analyzeLeakage(input)
    const [d, p] = r.directions
    if (d === undefined || p === undefined) throw new Error('expected two directions')
    expect(r.basis).toBe('average')
    expect(d.direction).toBe('depressurization')
    expect(p.direction).toBe('pressurization')
    expect(r.cfm50).toBeCloseTo((d.cfm50 + p.cfm50) / 2, 9)
    expect(r.ach50).toBeCloseTo((d.ach50 + p.ach50) / 2, 12)
    expect(r.ach50).toBeCloseTo((r.cfm50 * 60) / 18000, 12) // averaging metrics = metrics of the mean
    expect(r.ela4SqIn).toBeCloseTo((d.ela4SqIn + p.ela4SqIn) / 2, 9)
    expect(r.nl).toBeCloseTo(((d.nl as number) + (p.nl as number)) / 2, 12)
    expect(r.flowExponent).toBeNull()
    expect(r.cfm50Ci95).toBeNull()
    expect(r.fitLine).toBeNull()
    expect(r.points).toEqual([])
    expect(p.baselineAverage).toBe(0.5)
    expect(d.baselineAverage).toBeNull()
  })

  it('the reverse test inherits the temperatures, inverting the factor (CHECKS.md §6)', () => {
    const [d, p] = analyzeLeakage(input).directions
    expect((d?.temperatureFactor as number) * (p?.temperatureFactor as number)).toBeCloseTo(1, 14)
    expect(p?.temperatureFactor).toBeGreaterThan(1) // pressurizing in winter: T_in/T_out > 1
  })

  it('each direction equals analysing it alone', () => {
    const r = analyzeLeakage(input)
    expect(r.directions[0]).toEqual(analyzeTest(input.test, house, 'ip'))
    expect(analyzeLeakage({ units: 'ip', building: house, test: input.test }).directions[0]).toEqual(r.directions[0])
  })

  it('collects warnings from both, naming the direction', () => {
    const r = analyzeLeakage({ ...input, reverse: { direction: 'pressurization', readings: [{ pressure: 30, flow: 2000 }] } })
    expect(r.method).toBe('single-point')
    expect(r.warnings).toEqual([expect.objectContaining({ code: 'extrapolated', direction: 'pressurization' })])
  })
})

describe('facts of the trade', () => {
  const small = (cfm50: number) =>
    analyzeLeakage({ units: 'ip', building: { volume: 2040 }, test: { direction: 'depressurization', readings: [{ pressure: -50, flow: cfm50 }] } })

  it('a ~2,040 ft³ house at ~160 CFM50 is ~4.7 ACH50, under a 5 ACH50 limit (common practice, no source)', () => {
    const r = small(160)
    expect(r.ach50).toBeCloseTo(4.7, 1) // common practice, no source
    expect(r.ach50).toBeLessThan(5) // IECC 2012–2021 zones 1–2 limit (code-limits.csv, SECONDARY/MEMORY)
  })

  it('the same house at ~20 CFM50 is ~0.59 ACH50, within n50 ≤ 0.6 h⁻¹ (code-limits.csv "Passive House Institute", SECONDARY)', () => {
    const r = small(20)
    expect(r.n50).toBeCloseTo(0.59, 2) // common practice, no source
    expect(r.n50).toBeLessThanOrEqual(0.6)
  })

  it('a reading at the 50 Pa test pressure is used as is (common practice: tests are at 50 Pa)', () => {
    expect(small(160).cfm50).toBe(160)
    expect(small(160).warnings).toEqual([])
  })
})
