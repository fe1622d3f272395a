import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { checkRequestSchema } from '#shared/checks'
import { acceptCheckRequest } from '#shared/checks/accept'

// The fast path must agree with the zod schema, which stays the one statement of a valid check:
// whatever the fast path accepts, zod accepts with the same output; whatever zod accepts, the fast
// path accepts too (so valid checks never pay for zod). Bodies go through JSON as on the wire.

const NOW = Date.UTC(2026, 11, 1, 23, 59, 30) // the schema's "today" in these tests
const schema = checkRequestSchema(() => new Date(NOW))

function agree(body: unknown) {
  const wire = JSON.stringify(body)
  const fast = acceptCheckRequest(wire === undefined ? undefined : JSON.parse(wire), NOW)
  const slow = schema.safeParse(wire === undefined ? undefined : JSON.parse(wire))
  return { fast, slow }
}

// A demo house (SYNTHETIC), valid as written.
const VALID = {
  units: 'ip',
  building: { volume: 18000, floorArea: 2000, enclosureArea: 4340, height: 18 },
  test: {
    direction: 'depressurization',
    baseline: { before: -0.8, after: -0.6 },
    readings: [[10, 302], [20, 470], [30, 605], [40, 730], [50, 840]].map(([p, q]) => ({ pressure: -p!, flow: q! })),
    insideTemperature: 68,
    outsideTemperature: 45,
  },
  address: { line1: '27 Cedar Loop Road', city: 'Port Alder', state: 'WA', postalCode: '98366', countyFips: '53035' },
  permitDate: '2024-05-01',
  buildingType: 'detached',
}

const anything = fc.oneof(
  fc.constant(null), fc.integer(), fc.double(), fc.string({ maxLength: 6 }), fc.boolean(),
  fc.array(fc.integer(), { maxLength: 2 }), fc.object({ maxDepth: 1 }),
)
const padded = (s: fc.Arbitrary<string>) => fc.tuple(fc.constantFrom('', '', '', ' ', '\t '), s, fc.constantFrom('', '', '  ')).map(([a, b, c]) => a + b + c)
const maybe = <T>(a: fc.Arbitrary<T>) => fc.option(a, { nil: undefined })
/** Mostly a valid value, now and then one at or past an edge. */
const mostly = <T, U>(ok: fc.Arbitrary<T>, edge: fc.Arbitrary<U>) => fc.oneof({ weight: 15, arbitrary: ok }, { weight: 1, arbitrary: edge })

const readings = (direction: string) => fc.uniqueArray(mostly(fc.integer({ min: 4, max: 95 }), fc.integer({ min: -1, max: 105 })), { minLength: 1, maxLength: 8 })
  .chain(ps => fc.tuple(...ps.map(p => mostly(fc.double({ min: 1, max: 3000, noNaN: true }), fc.double({ min: -50, max: 0, noNaN: true }))
    .map(flow => ({ pressure: direction === 'pressurization' ? p : -p, flow })))))

const temperature = maybe(mostly(fc.integer({ min: -20, max: 100 }), fc.integer({ min: -70, max: 160 })))
const test = fc.constantFrom('depressurization', 'pressurization').chain(direction => fc.record({
  direction: fc.constant(direction),
  baseline: maybe(fc.record({ before: maybe(fc.double({ min: -3, max: 3, noNaN: true })), after: maybe(fc.double({ min: -3, max: 3, noNaN: true })) }, { requiredKeys: [] })),
  readings: readings(direction),
  insideTemperature: temperature,
  outsideTemperature: temperature,
  assumedExponent: maybe(mostly(fc.double({ min: 0.4, max: 1, noNaN: true }), fc.double({ min: 0.3, max: 1.1, noNaN: true }))),
}, { requiredKeys: ['direction', 'readings'] }))

const area = (max: number) => mostly(fc.double({ min: 0.1, max, noNaN: true }), fc.double({ min: -1, max: 0, noNaN: true }))
const body = fc.record({
  units: fc.constantFrom('ip', 'si'),
  building: fc.record({
    volume: area(1e6),
    floorArea: maybe(area(1e5)),
    enclosureArea: maybe(area(1e5)),
    height: maybe(area(100)),
    elevation: maybe(fc.integer({ min: -500, max: 4000 })),
  }, { requiredKeys: ['volume'] }),
  test,
  reverse: fc.oneof({ weight: 4, arbitrary: fc.constant(undefined) }, { weight: 1, arbitrary: test }),
  address: fc.record({
    line1: padded(mostly(fc.string({ minLength: 1, maxLength: 30 }), fc.constantFrom('', ' ', 'x'.repeat(201)))),
    city: padded(mostly(fc.constantFrom('Port Alder', 'x'.repeat(100)), fc.constantFrom('', 'x'.repeat(101)))),
    state: padded(mostly(fc.constantFrom('WA', 'wa', 'Wa'), fc.constantFrom('ZZ', 'PR', 'CO', ''))),
    postalCode: padded(mostly(fc.constantFrom('98366', '98366-1234'), fc.constantFrom('9836', '98366-12', 'abcde'))),
    countyFips: maybe(padded(mostly(fc.constantFrom('53035'), fc.constantFrom('5303', '08031', '72001')))),
  }, { requiredKeys: ['line1', 'city', 'state', 'postalCode'] }),
  permitDate: mostly(fc.constantFrom('2024-05-01', '2020-02-29', '2028-12-01'), fc.constantFrom('2021-02-29', '2028-12-02', '2024-5-1', '')),
  buildingType: mostly(fc.constantFrom('detached', 'attached'), fc.constantFrom('Detached')),
  jurisdictionId: maybe(mostly(fc.integer({ min: 1, max: 9 }), fc.constantFrom(0, -1, 1.5, 2 ** 53))),
}, { requiredKeys: ['units', 'building', 'test', 'address', 'permitDate', 'buildingType'] })

/** Replaces, deletes or adds one field somewhere in the body. */
const mutated = fc.tuple(body, fc.nat(), fc.constantFrom('replace', 'delete', 'add'), anything).map(([b, pick, how, value]) => {
  const copy = JSON.parse(JSON.stringify(b))
  const objects: Record<string, unknown>[] = []
  const walk = (v: unknown) => {
    if (v && typeof v === 'object') {
      if (!Array.isArray(v)) objects.push(v as Record<string, unknown>)
      Object.values(v).forEach(walk)
    }
  }
  walk(copy)
  const target = objects[pick % objects.length]!
  const keys = Object.keys(target)
  const key = keys[pick % Math.max(1, keys.length)] ?? 'x'
  if (how === 'replace') target[key] = value
  else if (how === 'delete') delete target[key]
  else target.surprise = value
  return copy
})

describe('acceptCheckRequest (fast path) agrees with the CheckRequest schema', () => {
  it('accepts the demo house with the same output as zod', () => {
    const { fast, slow } = agree(VALID)
    expect(slow.success).toBe(true)
    expect(fast).toStrictEqual(slow.data)
  })

  it('applies the same transforms: trimmed text, upper-case state, five-digit postal code', () => {
    const { fast, slow } = agree({ ...VALID, address: { line1: '  27 Cedar Loop Road ', city: ' Port Alder', state: ' wa ', postalCode: ' 98366-4410 ', countyFips: ' 53035' } })
    expect(fast?.address).toStrictEqual({ line1: '27 Cedar Loop Road', city: 'Port Alder', state: 'WA', postalCode: '98366', countyFips: '53035' })
    expect(fast).toStrictEqual(slow.success ? slow.data : 'zod rejected it')
  })

  it('leaves the permit-date horizon where the schema puts it (two years from today)', () => {
    expect(agree({ ...VALID, permitDate: '2028-12-01' }).fast).toBeDefined()
    expect(agree({ ...VALID, permitDate: '2028-12-02' }).fast).toBeUndefined()
    expect(agree({ ...VALID, permitDate: '2028-12-02' }).slow.success).toBe(false)
  })

  it('5,000 generated and mutated bodies: the same answer both ways (fast-check, seeded)', () => {
    let accepted = 0
    fc.assert(fc.property(fc.oneof({ weight: 3, arbitrary: body }, { weight: 2, arbitrary: mutated }, { weight: 1, arbitrary: anything }), (b) => {
      const { fast, slow } = agree(b)
      if (slow.success) {
        accepted++
        expect(fast).toStrictEqual(slow.data)
      }
      else {
        expect(fast).toBeUndefined()
      }
    }), { numRuns: 5000, seed: 20261202 })
    // The generator must reach both sides, or the property proves little.
    console.log(`fast-path property: ${accepted} of 5,000 bodies valid`)
    expect(accepted).toBeGreaterThan(500)
  })
})
