import { describe, expect, it } from 'vitest'
import { M3H_PER_CFM, TARGET_METRICS, analyzeLeakage, metricValue, solveTarget } from '#shared/leakage'

// CHECKS.md §3 house (SYNTHETIC).
const house = { volume: 18000, floorArea: 2000, enclosureArea: 4340, height: 18 }

describe('solveTarget', () => {
  it('3 ACH50 over 18 000 ft³ allows 900 CFM50 (CHECKS.md §7 [COMPUTED])', () => {
    const t = solveTarget(house, 'ip', 'ach50', 3, 901)
    expect(t?.maxCfm50).toBe(900) // CHECKS.md §7: CFM50 900 → ACH50 3.000
    expect(t?.reductionPercent).toBeCloseTo(100 / 901, 12) // (901 − 900)/901
    expect(t?.maxQ50).toBeCloseTo(900 * M3H_PER_CFM, 9) // CHECKS.md §1
  })

  it('0.28 cfm/ft² over 4340 ft² allows 1215.2 CFM50 (CHECKS.md §7 [COMPUTED])', () => {
    expect(solveTarget(house, 'ip', 'cfm50PerEnclosureArea', 0.28)?.maxCfm50).toBeCloseTo(1215.2, 9)
  })

  it('is 0 at the limit and negative (headroom) when already meeting it', () => {
    expect(solveTarget(house, 'ip', 'ach50', 3, 900)?.reductionPercent).toBe(0)
    // Passive-house level n50 ≤ 0.6 h⁻¹ (code-limits.csv, SECONDARY) for a 2,040 ft³ house at 20 CFM50:
    // max 0.6·2040/60 = 20.4 CFM50, so 2 % of headroom (common practice example).
    const ph = solveTarget({ volume: 2040 }, 'ip', 'n50', 0.6, 20)
    expect(ph?.maxCfm50).toBeCloseTo(20.4, 12)
    expect(ph?.reductionPercent).toBeCloseTo(-2, 12)
    expect(solveTarget(house, 'ip', 'ach50', 3)?.reductionPercent).toBeNull()
  })

  it('for a strict "less than 7" limit returns the boundary 2100, which does not itself meet it (CHECKS.md §7)', () => {
    const t = solveTarget(house, 'ip', 'ach50', 7, 2100)
    expect(t?.maxCfm50).toBe(2100)
    expect(t?.reductionPercent).toBe(0)
  })

  it('reaching the returned CFM50 gives exactly the limit, for every metric (CHECKS.md §3 definitions)', () => {
    for (const units of ['ip', 'si'] as const) {
      const building =
        units === 'ip' ? house : { volume: 510, floorArea: 186, enclosureArea: 403, height: 5.5 }
      for (const metric of TARGET_METRICS) {
        const limit = 3.7
        const t = solveTarget(building, units, metric, limit)
        if (t === null) throw new Error(`no target for ${metric}`)
        // A one-reading test at 50 Pa with that flow has CFM50 = maxCfm50.
        const flow = units === 'ip' ? t.maxCfm50 : t.maxQ50
        const r = analyzeLeakage({ units, building, test: { direction: 'pressurization', readings: [{ pressure: 50, flow }] } })
        expect(Math.abs((metricValue(r, metric) as number) - limit) / limit, `${units} ${metric}`).toBeLessThan(1e-12)
      }
    }
  })

  it('needs the area the metric is defined on', () => {
    const bare = { volume: 18000 }
    expect(solveTarget(bare, 'ip', 'cfm50PerEnclosureArea', 0.28)).toBeNull()
    expect(solveTarget(bare, 'ip', 'airPermeability50', 5)).toBeNull()
    expect(solveTarget(bare, 'ip', 'cfm50PerFloorArea', 0.5)).toBeNull()
    expect(solveTarget(bare, 'ip', 'w50', 10)).toBeNull()
    expect(solveTarget(bare, 'ip', 'ach50', 3)).not.toBeNull()
    expect(solveTarget(bare, 'ip', 'cfm50', 1000)?.maxCfm50).toBe(1000)
  })

  it('refuses a limit that is not a positive number', () => {
    expect(solveTarget(house, 'ip', 'ach50', 0)).toBeNull()
    expect(solveTarget(house, 'ip', 'ach50', -1)).toBeNull()
    expect(solveTarget(house, 'ip', 'ach50', Number.NaN)).toBeNull()
    expect(solveTarget(house, 'ip', 'ach50', Number.POSITIVE_INFINITY)).toBeNull()
  })

  it('air permeability 5.874 over 4340 ft² is 1394 CFM50 (CHECKS.md §3 [COMPUTED], inverted)', () => {
    expect(solveTarget(house, 'ip', 'airPermeability50', 5.874)?.maxCfm50).toBeCloseTo(1394, 0)
  })
})
