import { describe, expect, it } from 'vitest'
import { z } from 'zod'
import { CalculationRequest, analyzeLeakage, calculationShape, withCalculationChecks } from '#shared/leakage'

// The request body of the spec (issue 3), valid as written.
function validBody() {
  return {
    units: 'ip',
    building: { volume: 18000, floorArea: 2000, enclosureArea: 4340, height: 18 },
    test: {
      direction: 'depressurization',
      baseline: { before: -1.8, after: -1.2 },
      readings: [{ pressure: -34.0, flow: 4200 }],
      insideTemperature: 70,
      outsideTemperature: 32,
      assumedExponent: 0.65,
    },
  } as Record<string, unknown> & {
    units: unknown
    building: Record<string, unknown>
    test: Record<string, unknown> & { readings: Record<string, unknown>[]; baseline: Record<string, unknown> }
  }
}

type Body = ReturnType<typeof validBody>

function issuesOf(body: unknown) {
  const result = CalculationRequest.safeParse(body)
  expect(result.success, 'expected the body to be rejected').toBe(false)
  return result.error?.issues ?? []
}

describe('CalculationRequest accepts', () => {
  it('the spec body unchanged (no defaults added)', () => {
    const body = validBody()
    const parsed = CalculationRequest.parse(body)
    expect(parsed).toEqual(body)
    expect(analyzeLeakage(parsed).cfm50).toBeGreaterThan(0)
  })

  it('a minimal body, SI units, and a reverse test in the other direction', () => {
    const parsed = CalculationRequest.parse({
      units: 'si',
      building: { volume: 510, elevation: -20 },
      test: { direction: 'pressurization', readings: [{ pressure: 50, flow: 3000 }] },
      reverse: { direction: 'depressurization', readings: [{ pressure: -50, flow: 3100 }], insideTemperature: 60, outsideTemperature: -50 },
    })
    expect(parsed.reverse?.direction).toBe('depressurization')
  })

  it.each([
    ['ip', -58],
    ['ip', 140],
    ['si', -50],
    ['si', 60],
  ])('%s temperature at the bound %f', (units, temperature) => {
    const body: Body = { ...validBody(), units }
    body.test.insideTemperature = units === 'si' ? 21 : 70
    body.test.outsideTemperature = temperature
    expect(CalculationRequest.safeParse(body).success).toBe(true)
  })

  it('a raw reading over 100 Pa whose adjusted value is within 100 Pa', () => {
    const body = validBody()
    body.test.readings = [{ pressure: -100.5, flow: 5000 }] // −100.5 − (−1.5) = −99 Pa
    expect(CalculationRequest.safeParse(body).success).toBe(true)
  })
})

// [case, mutate the valid body, expected path, message fragment]
const badCases: [string, (b: Body) => void, (string | number)[], string | RegExp][] = [
  ['volume as a string', (b) => (b.building.volume = '18000'), ['building', 'volume'], 'Volume must be a finite number.'],
  ['volume NaN', (b) => (b.building.volume = Number.NaN), ['building', 'volume'], 'Volume must be a finite number.'],
  ['volume Infinity', (b) => (b.building.volume = Number.POSITIVE_INFINITY), ['building', 'volume'], 'Volume must be a finite number.'],
  ['volume missing', (b) => delete b.building.volume, ['building', 'volume'], 'Volume is required.'],
  ['volume null', (b) => (b.building.volume = null), ['building', 'volume'], 'Volume must be a finite number.'],
  ['volume zero', (b) => (b.building.volume = 0), ['building', 'volume'], 'Volume must be greater than zero.'],
  ['volume negative', (b) => (b.building.volume = -5), ['building', 'volume'], 'Volume must be greater than zero.'],
  ['floor area zero', (b) => (b.building.floorArea = 0), ['building', 'floorArea'], 'Floor area must be greater than zero.'],
  ['enclosure area negative', (b) => (b.building.enclosureArea = -1), ['building', 'enclosureArea'], 'Enclosure area must be greater than zero.'],
  ['height zero', (b) => (b.building.height = 0), ['building', 'height'], 'Height must be greater than zero.'],
  ['elevation -Infinity', (b) => (b.building.elevation = Number.NEGATIVE_INFINITY), ['building', 'elevation'], 'Elevation must be a finite number.'],
  ['flow zero', (b) => (b.test.readings[0] = { pressure: -34, flow: 0 }), ['test', 'readings', 0, 'flow'], 'Flow must be greater than zero.'],
  ['flow negative', (b) => (b.test.readings[0] = { pressure: -34, flow: -4200 }), ['test', 'readings', 0, 'flow'], 'Flow must be greater than zero.'],
  ['pressure NaN', (b) => (b.test.readings[0] = { pressure: Number.NaN, flow: 4200 }), ['test', 'readings', 0, 'pressure'], 'Pressure must be a finite number.'],
  ['positive reading while depressurizing', (b) => (b.test.readings[0] = { pressure: 34, flow: 4200 }), ['test', 'readings', 0, 'pressure'], 'readings must be negative (got 34 Pa)'],
  ['zero reading while depressurizing', (b) => (b.test.readings[0] = { pressure: 0, flow: 4200 }), ['test', 'readings', 0, 'pressure'], 'readings must be negative'],
  [
    'negative reading while pressurizing',
    (b) => {
      b.test.direction = 'pressurization'
      b.test.baseline = { before: 1, after: 1 }
    },
    ['test', 'readings', 0, 'pressure'],
    'readings must be positive (got -34 Pa)',
  ],
  [
    'adjusted pressure under 1 Pa',
    (b) => (b.test.readings[0] = { pressure: -2, flow: 4200 }), // −2 − (−1.5) = −0.5 Pa
    ['test', 'readings', 0, 'pressure'],
    'After subtracting the baseline of -1.5 Pa, this reading induces 0.5 Pa; at least 1 Pa is needed.',
  ],
  [
    'adjusted pressure on the wrong side of the baseline',
    (b) => (b.test.readings[0] = { pressure: -1, flow: 4200 }), // −1 − (−1.5) = +0.5 Pa
    ['test', 'readings', 0, 'pressure'],
    'this reading induces -0.5 Pa; at least 1 Pa is needed.',
  ],
  [
    'adjusted pressure over 100 Pa',
    (b) => {
      b.test.baseline = { before: 1, after: 1 }
      b.test.readings[0] = { pressure: -100, flow: 4200 } // −100 − 1 = −101 Pa
    },
    ['test', 'readings', 0, 'pressure'],
    'this reading induces 101 Pa; at most 100 Pa is accepted.',
  ],
  [
    'duplicate pressures',
    (b) => (b.test.readings = [{ pressure: -34, flow: 4200 }, { pressure: -50, flow: 5000 }, { pressure: -34, flow: 4300 }]),
    ['test', 'readings', 2, 'pressure'],
    'Pressure -34 Pa is already used by reading 1; each reading needs a different pressure.',
  ],
  [
    'more than 50 readings',
    (b) => (b.test.readings = Array.from({ length: 51 }, (_, i) => ({ pressure: -(10 + i), flow: 1000 + i }))),
    ['test', 'readings'],
    'At most 50 readings are accepted.',
  ],
  ['no readings', (b) => (b.test.readings = []), ['test', 'readings'], 'At least one reading is needed.'],
  ['readings not a list', (b) => (b.test.readings = { pressure: -34, flow: 4200 } as unknown as Record<string, unknown>[]), ['test', 'readings'], 'Readings must be a list.'],
  ['inside temperature over 140 °F', (b) => (b.test.insideTemperature = 141), ['test', 'insideTemperature'], 'Inside temperature 141 °F is outside the plausible range -58 to 140 °F.'],
  ['outside temperature under −58 °F', (b) => (b.test.outsideTemperature = -59), ['test', 'outsideTemperature'], 'outside the plausible range -58 to 140 °F'],
  [
    '100 is a fine °F but not a fine °C',
    (b) => {
      b.units = 'si'
      b.test.insideTemperature = 100
    },
    ['test', 'insideTemperature'],
    'Inside temperature 100 °C is outside the plausible range -50 to 60 °C.',
  ],
  ['temperature as a string', (b) => (b.test.insideTemperature = '70'), ['test', 'insideTemperature'], 'Inside temperature must be a finite number.'],
  ['assumed exponent 0.3', (b) => (b.test.assumedExponent = 0.3), ['test', 'assumedExponent'], 'The assumed flow exponent must be between 0.4 and 1 (0.65 is usual).'],
  ['assumed exponent 1.1', (b) => (b.test.assumedExponent = 1.1), ['test', 'assumedExponent'], 'between 0.4 and 1'],
  ['unknown top-level field', (b) => (b.address = 'Main St'), [], 'Unknown field: address.'],
  ['unknown building field', (b) => (b.building.stories = 2), ['building'], 'Unknown field: stories.'],
  ['unknown test fields', (b) => Object.assign(b.test, { wind: 3, gauge: 'x' }), ['test'], 'Unknown fields: wind, gauge.'],
  ['unknown reading field', (b) => (b.test.readings[0] = { pressure: -34, flow: 4200, ring: 'A' }), ['test', 'readings', 0], 'Unknown field: ring.'],
  ['unknown baseline field', (b) => (b.test.baseline.during = -1), ['test', 'baseline'], 'Unknown field: during.'],
  ['unknown unit system', (b) => (b.units = 'metric'), ['units'], 'Units must be "ip" or "si".'],
  ['unknown direction', (b) => (b.test.direction = 'sideways'), ['test', 'direction'], 'Direction must be "depressurization" or "pressurization".'],
  [
    'reverse test in the same direction',
    (b) => (b.reverse = { direction: 'depressurization', readings: [{ pressure: -50, flow: 5000 }] }),
    ['reverse', 'direction'],
    'The reverse test must run in the other direction than the main test (both are depressurization).',
  ],
  [
    'reverse test with a bad reading',
    (b) => (b.reverse = { direction: 'pressurization', readings: [{ pressure: -50, flow: 5000 }] }),
    ['reverse', 'readings', 0, 'pressure'],
    'readings must be positive',
  ],
]

describe('CalculationRequest rejects, naming the field', () => {
  it.each(badCases)('%s', (_name, mutate, path, message) => {
    const body = validBody()
    mutate(body)
    const issues = issuesOf(body)
    const match = issues.find((issue) => JSON.stringify(issue.path) === JSON.stringify(path))
    expect(match, `no issue at ${JSON.stringify(path)}: ${JSON.stringify(issues)}`).toBeDefined()
    if (typeof message === 'string') expect(match?.message).toContain(message)
    else expect(match?.message).toMatch(message)
  })
})

describe('composability', () => {
  const CheckRequest = withCalculationChecks(
    calculationShape.extend({ address: z.string().min(1), permitDate: z.iso.date(), buildingType: z.enum(['single-family', 'multifamily']) }),
  )
  const extra = { address: '1 Main St', permitDate: '2026-03-01', buildingType: 'single-family' }

  it('the base object can be extended and keeps the cross-field checks', () => {
    expect(CheckRequest.safeParse({ ...validBody(), ...extra }).success).toBe(true)
    const hot = validBody()
    hot.test.insideTemperature = 150
    const issues = CheckRequest.safeParse({ ...hot, ...extra }).error?.issues ?? []
    expect(issues.map((i) => i.path)).toEqual([['test', 'insideTemperature']])
  })

  it('the extension is still strict and checks its own fields', () => {
    const issues = CheckRequest.safeParse({ ...validBody(), ...extra, permitDate: 'soon', note: 'x' }).error?.issues ?? []
    expect(issues.map((i) => i.path)).toEqual(expect.arrayContaining([['permitDate'], []]))
  })
})
