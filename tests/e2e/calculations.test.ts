import { existsSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { beforeAll, describe, expect, it } from 'vitest'
import { Client, freshAddress } from '../support/http'
import { ROOT } from '../support/server'

const EXAMPLE = join(ROOT, '../shared/reference/example-multipoint-8pt.csv')
const hasExample = existsSync(EXAMPLE)
if (!hasExample) console.warn(`[skip] CHECKS.md §2 through the API: ${EXAMPLE} is absent (../shared not beside this clone)`)

/** Relative closeness to the printed precision of a reference value. */
const near = (actual: number, expected: number, rel = 1e-4) => expect(Math.abs(actual - expected) / Math.abs(expected)).toBeLessThan(rel)

// House of CHECKS.md §3 (SYNTHETIC).
const HOUSE = { volume: 18000, floorArea: 2000, enclosureArea: 4340, height: 18 }

let rater: Client
beforeAll(async () => {
  rater = new Client(undefined, freshAddress())
  await rater.signIn('rater@tightwell.test')
})

describe('POST /api/calculations', () => {
  it('the README example: one point with baseline and temperatures', async () => {
    const res = await rater.post('/api/calculations', {
      units: 'ip',
      building: HOUSE,
      test: { direction: 'depressurization', baseline: { before: -1.8, after: -1.2 }, readings: [{ pressure: -34.0, flow: 4200 }], insideTemperature: 70, outsideTemperature: 32, assumedExponent: 0.65 },
    })
    expect(res.status).toBe(200)
    expect(res.body.method).toBe('single-point')
    expect(res.body.r2).toBeNull()
    expect(res.body.cfm50Ci95).toBeNull()
    // CHECKS.md §5 (5557 cfm) times the §6 depressurization factor T_out/T_in: 32 °F = 273.15 K, 70 °F = 294.261 K.
    near(res.body.cfm50, 4200 * (50 / 32.5) ** 0.65 * (273.15 / (273.15 + (70 - 32) / 1.8)))
    expect(res.body.warnings.map((w: { code: string }) => w.code)).toContain('extrapolated')
    for (const key of ['flowExponent', 'flowCoefficient', 'q50', 'ach50', 'cfm50PerEnclosureArea', 'cfm50PerFloorArea', 'airPermeability50', 'w50', 'ela4SqIn', 'eqla10SqIn']) {
      expect(typeof res.body[key], key).toBe('number')
    }
  })

  it('CHECKS.md §5: one point, baseline −1.8/−1.2 Pa, reading −34.0 Pa, 4200 cfm → 5557 CFM50 [COMPUTED]', async () => {
    const res = await rater.post('/api/calculations', { units: 'ip', building: HOUSE, test: { direction: 'depressurization', baseline: { before: -1.8, after: -1.2 }, readings: [{ pressure: -34.0, flow: 4200 }] } })
    expect(res.status).toBe(200)
    near(res.body.cfm50, 5557, 1e-4)
    expect(res.body.flowExponent).toBe(0.65)
  })

  it.skipIf(!hasExample)('CHECKS.md §2–§4 through the API: the 8-point example on the §3 house [COMPUTED]', async () => {
    const readings = readFileSync(EXAMPLE, 'utf8').trim().split(/\r?\n/).slice(1).map((l) => {
      const [p, q] = l.split(',').map(Number)
      return { pressure: -p!, flow: q! }
    })
    const res = await rater.post('/api/calculations', { units: 'ip', building: HOUSE, test: { direction: 'depressurization', readings } })
    expect(res.status).toBe(200)
    const b = res.body
    expect(b.method).toBe('multi-point')
    near(b.flowExponent, 0.6432, 1e-4) // §2 n
    near(b.flowCoefficient, 112.6, 5e-4) // §2 C (printed to 4 s.f.)
    near(b.r2, 0.9991, 1e-4) // §2 r²
    near(b.cfm50, 1394.0, 1e-4) // §2 CFM50
    near(b.cfm50Ci95[0], 1371.7, 1e-4)
    near(b.cfm50Ci95[1], 1416.7, 1e-4)
    near(b.ach50, 4.647, 1e-4) // §3
    near(b.q50, 2368, 3e-4) // §3
    near(b.airPermeability50, 5.874, 1e-4) // §3
    near(b.w50, 12.75, 4e-4) // §3
    near(b.cfm50PerEnclosureArea, 0.3212, 2e-4) // §3
    near(b.cfm50PerFloorArea, 0.6970, 1e-4) // §3
    near(b.ela4SqIn, 77.93, 1e-4) // §4
    near(b.eqla10SqIn, 145.4, 4e-4) // §4
    expect(b.warnings).toEqual([])
  })

  it('CHECKS.md §6: pressurizing with inside 21 °C, outside 0 °C multiplies fan flow by 1.0769 [PUBLISHED: Roulet eq. 4.5 physics]', async () => {
    const base = { units: 'si', building: { volume: 500 }, test: { direction: 'pressurization', readings: [{ pressure: 50, flow: 1000 }] } }
    const plain = await rater.post('/api/calculations', base)
    const corrected = await rater.post('/api/calculations', { ...base, test: { ...base.test, insideTemperature: 21, outsideTemperature: 0 } })
    near(corrected.body.q50 / plain.body.q50, 294.15 / 273.15, 1e-9)
  })

  it('reports both directions and their average', async () => {
    const res = await rater.post('/api/calculations', {
      units: 'ip',
      building: HOUSE,
      test: { direction: 'depressurization', readings: [{ pressure: -50, flow: 1000 }] },
      reverse: { direction: 'pressurization', readings: [{ pressure: 50, flow: 1200 }] },
    })
    expect(res.status).toBe(200)
    expect(res.body.directions).toHaveLength(2)
    near(res.body.cfm50, 1100, 1e-12)
  })
})

describe('POST /api/calculations rejects bad input with 400 naming the field', () => {
  const good = () => ({ units: 'ip', building: { ...HOUSE }, test: { direction: 'depressurization', readings: [{ pressure: -50, flow: 900 }] } }) as any
  const cases: [string, (b: any) => unknown, string][] = [
    ['a string volume', (b) => { b.building.volume = '18000' }, 'building.volume'],
    ['zero volume', (b) => { b.building.volume = 0 }, 'building.volume'],
    ['negative enclosure area', (b) => { b.building.enclosureArea = -1 }, 'building.enclosureArea'],
    ['a negative flow', (b) => { b.test.readings[0].flow = -900 }, 'test.readings.0.flow'],
    ['a reading whose sign contradicts the direction', (b) => { b.test.readings[0].pressure = 50 }, 'test.readings.0.pressure'],
    ['an adjusted pressure under 1 Pa', (b) => { b.test.readings[0].pressure = -0.5 }, 'test.readings.0.pressure'],
    ['an adjusted pressure over 100 Pa', (b) => { b.test.readings[0].pressure = -120 }, 'test.readings.0.pressure'],
    ['duplicate pressures', (b) => { b.test.readings = [{ pressure: -50, flow: 900 }, { pressure: -50, flow: 910 }] }, 'test.readings.1.pressure'],
    ['more than 50 readings', (b) => { b.test.readings = Array.from({ length: 51 }, (_, i) => ({ pressure: -(10 + i), flow: 300 + i })) }, 'test.readings'],
    ['no readings', (b) => { b.test.readings = [] }, 'test.readings'],
    ['an inside temperature of 200 °F', (b) => { b.test.insideTemperature = 200 }, 'test.insideTemperature'],
    ['an outside temperature of −80 °F', (b) => { b.test.outsideTemperature = -80 }, 'test.outsideTemperature'],
    ['an unknown direction', (b) => { b.test.direction = 'sideways' }, 'test.direction'],
    ['unknown units', (b) => { b.units = 'imperial' }, 'units'],
    ['an unknown top-level field', (b) => { b.cfm50 = 100 }, 'cfm50'],
    ['an unknown building field', (b) => { b.building.colour = 'red' }, 'building.colour'],
    ['a missing building', (b) => { delete b.building }, 'building'],
  ]
  it.each(cases)('%s', async (_label, mutate, field) => {
    const body = good()
    mutate(body)
    const res = await rater.post('/api/calculations', body)
    expect(res.status).toBe(400)
    expect(res.body.data.field).toBe(field)
    expect(res.body.message.startsWith(`${field}:`)).toBe(true)
  })

  it.each([['NaN', '{"units":"ip","building":{"volume":NaN},"test":{"direction":"depressurization","readings":[{"pressure":-50,"flow":900}]}}'], ['Infinity', '{"units":"ip","building":{"volume":1e999},"test":{"direction":"depressurization","readings":[{"pressure":-50,"flow":900}]}}'], ['not JSON', 'volume=18000']])('%s → 400', async (_label, raw) => {
    const res = await rater.post('/api/calculations', raw)
    expect(res.status).toBe(400)
  })

  it('anonymous → 401', async () => {
    expect((await new Client().post('/api/calculations', good())).status).toBe(401)
  })
})
