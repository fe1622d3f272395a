import { describe, expect, it } from 'vitest'
import { analyzeLeakage, type BuildingInput, type LeakageResult } from '#shared/leakage'
import { CAUTION, checkRequestSchema, judge, maxCfm50For, ruleInputsOf, type JudgedRuleInput } from '#shared/checks'
import { simpleRule } from '#shared/rules/logic'

// House of CHECKS.md §3/§7 (SYNTHETIC): volume 18 000 ft³, enclosure 4340 ft², floor 2000 ft².
const HOUSE: BuildingInput = { volume: 18000, floorArea: 2000, enclosureArea: 4340 }

/** One reading at exactly 50 Pa: CFM50 equals the flow (CHECKS.md §5 formula with ΔP = 50). */
function atCfm50(cfm50: number, building: BuildingInput = HOUSE): LeakageResult {
  return analyzeLeakage({ units: 'ip', building, test: { direction: 'depressurization', readings: [{ pressure: -50, flow: cfm50 }] } })
}

const rule = (key: string, logic: JudgedRuleInput['logic'], kind: JudgedRuleInput['kind'] = 'limit'): JudgedRuleInput => ({ key, kind, logic, summary: key, citation: 'test' })

// IECC 2012/2015 R402.4.1.2, zones 3–8: ≤ 3 ACH50 [code-limits.csv, READ (secondary)].
const ACH3 = rule('ach3', simpleRule('ach50', '<=', 3))
// IECC 2009 402.4.2.1: "less than seven air changes per hour" [code-limits.csv, READ (secondary transcriptions)].
const ACH7_STRICT = rule('ach7', simpleRule('ach50', '<', 7))
// IRC 2012/2015 R303.4: whole-house mechanical ventilation required below 5 ACH50 [code-limits.csv, READ (secondary)].
const VENT = rule('vent', simpleRule('ach50', '<', 5), 'advisory')
// Alternative metrics, as in "3.0 ACH50 or 0.28 cfm50/ft²" (code-limits.csv IECC 2021 row, MEMORY + SECONDARY — used here only as a rule shape).
const ALT = rule('alt', { or: [simpleRule('ach50', '<=', 3), simpleRule('cfm50PerEnclosureArea', '<=', 0.28)] })

const run = (result: LeakageResult, rules: JudgedRuleInput[], building = HOUSE) =>
  judge({ result, building, units: 'ip', buildingType: 'detached', zone: '4C', rules })

describe('verdict boundaries (CHECKS.md §7 [COMPUTED])', () => {
  it('CFM50 900 → ACH50 3.000 meets "not exceeding 3.0"', () => {
    const j = run(atCfm50(900), [ACH3])
    expect(j.verdict).toBe('complies')
    expect(j.rules[0]!.value).toBe(3)
    expect(j.rules[0]!.marginPercent).toBe(0)
  })

  it('CFM50 901 → ACH50 3.003 does not', () => {
    const j = run(atCfm50(901), [ACH3])
    expect(j.verdict).toBe('does-not-comply')
    expect(j.rules[0]!.value).toBeCloseTo(3.00333, 5)
    expect(j.rules[0]!.marginPercent).toBeCloseTo(-0.1111, 3)
  })

  it('CFM50 2100 → ACH50 7.000 does NOT meet "less than 7" (2009-edition wording [SECONDARY])', () => {
    expect(run(atCfm50(2100), [ACH7_STRICT]).verdict).toBe('does-not-comply')
    expect(run(atCfm50(2099), [ACH7_STRICT]).verdict).toBe('complies')
  })

  it('enclosure 4340 ft², CFM50 1215.2 → 0.2800 cfm/ft² meets "≤ 0.28"', () => {
    const j = run(atCfm50(1215.2), [rule('per-area', simpleRule('cfm50PerEnclosureArea', '<=', 0.28))])
    expect(j.verdict).toBe('complies')
    expect(run(atCfm50(1216), [rule('per-area', simpleRule('cfm50PerEnclosureArea', '<=', 0.28))]).verdict).toBe('does-not-comply')
  })
})

describe('alternatives, advisories and the largest compliant CFM50', () => {
  it('either alternative is enough; the best margin is reported', () => {
    // ACH50 = 1100·60/18000 = 3.667 fails; 1100/4340 = 0.2535 meets 0.28.
    const j = run(atCfm50(1100), [ALT])
    expect(j.verdict).toBe('complies')
    expect(j.rules[0]!.metric).toBe('cfm50PerEnclosureArea')
    expect(j.rules[0]!.maxCfm50).toBeCloseTo(0.28 * 4340, 9) // max of 900 and 1215.2
    expect(j.maxCfm50).toBeCloseTo(1215.2, 9)
  })

  it('without the enclosure area an alternative cannot be decided: no-rule, missing input named', () => {
    const j = run(atCfm50(1100, { volume: 18000 }), [ALT], { volume: 18000 })
    expect(j.verdict).toBe('no-rule')
    expect(j.noRuleReason).toBe('missing-input')
    expect(j.rules[0]!.missing).toEqual(['cfm50PerEnclosureArea'])
  })

  it('the ventilation advisory applies below 5 ACH50 and never changes the verdict (IRC R303.4 [SECONDARY])', () => {
    const tight = run(atCfm50(900), [ACH3, VENT])
    expect(tight.verdict).toBe('complies')
    expect(tight.advisories.map(a => a.id)).toEqual(['vent'])
    const leaky = run(atCfm50(1500), [ACH3, VENT]) // 5.0 ACH50: not below 5
    expect(leaky.advisories).toEqual([])
    expect(leaky.verdict).toBe('does-not-comply')
  })

  it('no limit rule → no-rule, never a pass', () => {
    const j = run(atCfm50(100), [VENT])
    expect(j.verdict).toBe('no-rule')
    expect(j.noRuleReason).toBe('no-matching-rule')
  })

  it('the tightest limit rule sets the overall maximum: 3 ACH50 on 18 000 ft³ → 900 CFM50 (CHECKS.md §7)', () => {
    expect(run(atCfm50(500), [ACH3, ACH7_STRICT]).maxCfm50).toBe(900)
  })

  it('bisection finds the boundary of a rule the exact solver cannot read', () => {
    // "(ACH50 × 2) ≤ 6" is 3 ACH50 in disguise.
    const logic = { '<=': [{ '*': [{ var: 'ach50' }, 2] }, 6] }
    const result = atCfm50(700)
    const max = maxCfm50For(logic, ruleInputsOf(result, HOUSE, 'ip', 'detached', '4C'), HOUSE, 'ip')
    expect(max).toBeCloseTo(900, 5)
  })
})

describe('borderline', () => {
  it('meets at the fitted value while the 95 % interval of CFM50 crosses the limit', () => {
    // A noisy 6-point test (SYNTHETIC): ±6 % scatter around Q = 68·ΔP^0.65 (CFM50 ≈ 867).
    const pressures = [15, 22, 30, 38, 46, 55]
    const noise = [1.06, 0.94, 1.06, 0.94, 1.06, 0.94]
    const readings = pressures.map((p, i) => ({ pressure: -p, flow: 68 * p ** 0.65 * noise[i]! }))
    const result = analyzeLeakage({ units: 'ip', building: HOUSE, test: { direction: 'depressurization', readings } })
    expect(result.cfm50).toBeLessThan(900)
    expect(result.cfm50Ci95![1]).toBeGreaterThan(900)
    const j = run(result, [ACH3])
    expect(j.rules[0]!.passes).toBe(true)
    expect(j.rules[0]!.borderline).toBe(true)
    expect(j.verdict).toBe('borderline')
  })

  it('a one-point test has no interval, so it is never borderline', () => {
    expect(run(atCfm50(899), [ACH3]).verdict).toBe('complies')
  })
})

describe('check request schema', () => {
  const body = {
    units: 'ip',
    building: { volume: 18000 },
    test: { direction: 'depressurization', readings: [{ pressure: -50, flow: 900 }] },
    address: { line1: '14 Wrenfield Lane', city: 'Alder Valley', state: 'wa', postalCode: '98110-1234' },
    permitDate: '2024-05-01',
    buildingType: 'detached',
  }
  const schema = checkRequestSchema(() => new Date('2026-12-01T00:00:00Z'))
  const issue = (patch: object) => {
    const r = schema.safeParse({ ...body, ...patch })
    return r.success ? null : { path: r.error.issues[0]!.path.join('.'), message: r.error.issues[0]!.message }
  }

  it('accepts a good body, upper-cases the state and cuts ZIP+4', () => {
    const r = schema.parse(body)
    expect(r.address.state).toBe('WA')
    expect(r.address.postalCode).toBe('98110')
  })

  it.each([
    [{ permitDate: '2024-02-30' }, 'permitDate', /real date/],
    [{ permitDate: '05/01/2024' }, 'permitDate', /YYYY-MM-DD/],
    [{ permitDate: '2029-01-01' }, 'permitDate', /future/],
    [{ buildingType: 'mansion' }, 'buildingType', /detached/],
    [{ address: { ...body.address, state: 'ZZ' } }, 'address.state', /state/],
    [{ address: { ...body.address, postalCode: '981' } }, 'address.postalCode', /5 digits/],
    [{ address: { ...body.address, countyFips: '8031' } }, 'address.countyFips', /5 digits/],
    [{ address: { ...body.address, countyFips: '08031' } }, 'address.countyFips', /not in WA/],
    [{ jurisdictionId: 'one' }, 'jurisdictionId', /number/],
  ])('%o → %s', (patch, path, message) => {
    const got = issue(patch)
    expect(got?.path).toBe(path)
    expect(got?.message).toMatch(message)
  })

  it('keeps every calculation check (a reading with the wrong sign)', () => {
    expect(issue({ test: { direction: 'depressurization', readings: [{ pressure: 50, flow: 900 }] } })?.path).toBe('test.readings.0.pressure')
  })

  it('the caution says the authority having jurisdiction decides', () => {
    expect(CAUTION).toMatch(/authority having jurisdiction decides/)
  })
})

describe('the interpreter-free evaluation agrees with json-logic (fast-check, seeded)', () => {
  it('for single comparisons and alternatives / all-of, in either operand order, with missing values', async () => {
    const fc = (await import('fast-check')).default
    const { evaluate } = await import('#shared/checks')
    const { evaluateRule } = await import('#shared/rules/logic')
    const metric = fc.constantFrom('ach50', 'cfm50', 'cfm50PerEnclosureArea', 'airPermeability50', 'n50')
    const op = fc.constantFrom('<', '<=', '>', '>=', '==', '!=')
    const limit = fc.oneof(fc.double({ min: 0.01, max: 5000, noNaN: true }), fc.constantFrom(3, 0.28, 5, 7))
    const term = fc.tuple(metric, op, limit, fc.boolean()).map(([m, o, l, flipped]) => ({ [o]: flipped ? [l, { var: m }] : [{ var: m }, l] }))
    const logic = fc.oneof(term, fc.array(term, { minLength: 1, maxLength: 3 }).map(ts => ({ or: ts })), fc.array(term, { minLength: 1, maxLength: 3 }).map(ts => ({ and: ts })))
    const value = fc.oneof(fc.double({ min: 0, max: 6000, noNaN: true }), fc.constant(null), fc.constantFrom(3, 0.28, 900 * 60 / 18000, 1215.2 / 4340))
    const inputs = fc.record({ ach50: value, cfm50: value, cfm50PerEnclosureArea: value, airPermeability50: value, n50: value })
    fc.assert(fc.property(logic, inputs, (l, i) => evaluate(l as never, i) === evaluateRule(l as never, i)), { seed: 4242, numRuns: 3000 })
  })
})
