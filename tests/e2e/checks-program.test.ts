import { beforeAll, describe, expect, it } from 'vitest'
import { Client, freshAddress } from '../support/http'

// A program jurisdiction set up through the admin API for these tests only (invented name), over
// counties no demo jurisdiction covers: Arapahoe CO 08005 (zone 5B on the 2021 map
// [from memory; county-zones-iecc2021.csv agrees]) and Jefferson CO 08059, left off the map.
// It adopts the DOE Zero Energy Ready Home Rev 07 model table (rules/doe-zerh-rev07.csv,
// code-limits.csv READ): 2 ACH50 for detached homes in zones 5–7, 3 ACH50 for attached dwellings.
let rater: Client
let programId: number

const check = (cfm50: number, buildingType: 'detached' | 'attached', countyFips = '08005') => ({
  units: 'ip',
  building: { volume: 18000 },
  test: { direction: 'depressurization', readings: [{ pressure: -50, flow: cfm50 }] },
  address: { line1: '88 Sorrel Bend', city: 'Aurora', state: 'CO', postalCode: '80012', countyFips },
  permitDate: '2024-05-01',
  buildingType,
  jurisdictionId: programId,
})

beforeAll(async () => {
  const admin = new Client(undefined, freshAddress())
  await admin.signIn('admin@tightwell.test')
  const map = await admin.post('/api/zone-maps', { name: 'Program test map', edition: 'IECC 2021' })
  expect(map.status).toBe(201)
  expect((await admin.request('PUT', `/api/zone-maps/${map.body.id}/counties/08005`, { zone: '5B', countyName: 'Arapahoe', stateCode: 'CO' })).status).toBeLessThan(300)
  const set = await admin.post('/api/rule-sets/from-model', { file: 'doe-zerh-rev07.csv', name: 'ZERH Rev 07 (program test)' })
  expect(set.status).toBe(201)
  expect((await admin.post(`/api/rule-sets/${set.body.id}/publish`, { note: 'As shipped' })).status).toBeLessThan(300)
  const program = await admin.post('/api/jurisdictions', { name: 'Test efficiency program', kind: 'program', stateCode: 'CO', zoneMapId: map.body.id })
  expect(program.status).toBe(201)
  programId = program.body.id
  expect((await admin.request('PUT', `/api/jurisdictions/${programId}/coverage`, { counties: ['08005', '08059'] })).status).toBeLessThan(300)
  expect((await admin.post(`/api/jurisdictions/${programId}/editions`, { name: 'ZERH Rev 07', ruleSetId: set.body.id, effectiveFrom: '2020-01-01' })).status).toBe(201)
  rater = new Client(undefined, freshAddress())
  await rater.signIn('rater@tightwell.test')
})

describe('POST /api/checks with a program jurisdiction', () => {
  it('detached, zone 5B: 2.2 ACH50 (660 CFM50 on 18 000 ft³) does not meet 2 ACH50', async () => {
    const c = (await rater.post('/api/checks', check(660, 'detached'))).body
    expect(c.jurisdiction.name).toBe('Test efficiency program')
    expect(c.zone).toBe('5B')
    expect(c.verdict).toBe('does-not-comply')
    expect(c.rules.map((r: { id: string }) => r.id)).toEqual(['r3'])
    expect(c.maxCfm50).toBe(600) // 2 × 18 000 / 60
  })

  it('the attached-unit rule: the same house as an attached dwelling meets 3 ACH50', async () => {
    const c = (await rater.post('/api/checks', check(660, 'attached'))).body
    expect(c.verdict).toBe('complies')
    expect(c.rules.map((r: { id: string }) => r.id)).toEqual(['r5'])
    expect(c.rules[0].citation).toBe('DOE Zero Energy Ready Home Rev 07 Exhibit 2')
  })

  it('a covered county missing from the zone map → no-rule (no-zone), never a pass', async () => {
    const c = (await rater.post('/api/checks', check(100, 'detached', '08059'))).body
    expect(c.verdict).toBe('no-rule')
    expect(c.noRule.reason).toBe('no-zone')
    expect(c.noRule.message).toContain('08059')
  })
})
