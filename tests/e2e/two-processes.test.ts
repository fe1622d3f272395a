import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { Client } from '../support/http'
import { startBuiltServer, type RunningServer } from '../support/server'

// Two server processes on ONE database file: a publish or a deactivation made through one is
// honoured by the other (within TIGHTWELL_FRESHNESS_MS, here 100 ms).
let dir: string
let a: RunningServer
let b: RunningServer

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'tw-two-'))
  const env = { NUXT_DATABASE_URL: `file:${join(dir, 'shared.db')}`, NUXT_SESSION_PASSWORD: 'z'.repeat(48), TIGHTWELL_FRESHNESS_MS: '100' }
  a = await startBuiltServer(env)
  // B starts after A migrated and seeded, as a second instance would.
  b = await startBuiltServer(env)
})
afterAll(async () => {
  await a?.stop()
  await b?.stop()
  rmSync(dir, { recursive: true, force: true })
})

// Denver County CO, City of Juniper Flats, IECC 2015 model table (≤ 3 ACH50 in zones 3–8).
const check = (cfm50: number) => ({
  units: 'ip',
  building: { volume: 18000 },
  test: { direction: 'depressurization', readings: [{ pressure: -50, flow: cfm50 }] },
  address: { line1: '410 Larkspur Court', city: 'Juniper Flats', state: 'CO', postalCode: '80202', countyFips: '08031' },
  permitDate: '2024-05-01',
  buildingType: 'detached',
})

async function until<T>(fn: () => Promise<T>, ok: (v: T) => boolean, ms = 3000): Promise<T> {
  const end = Date.now() + ms
  let last = await fn()
  while (!ok(last) && Date.now() < end) {
    await new Promise(r => setTimeout(r, 50))
    last = await fn()
  }
  return last
}

describe('two processes sharing one database', () => {
  it('a version published through A decides the next checks in B', async () => {
    const adminA = new Client(a.url, '192.0.2.20')
    await adminA.signIn('admin@tightwell.test')
    const raterB = new Client(b.url, '192.0.2.21')
    await raterB.signIn('rater@tightwell.test')

    // 2.8 ACH50 (840 CFM50 on 18 000 ft³) meets 3 ACH50.
    const before = (await raterB.post('/api/checks?dryRun=1', check(840))).body
    expect(before.verdict).toBe('complies')
    const setId = before.ruleSetVersion && (await adminA.get('/api/rule-sets')).body.find((s: { name: string }) => s.name === 'IECC 2015 air leakage (model)').id
    const set = (await adminA.get(`/api/rule-sets/${setId}`)).body
    const rules = set.draft.map((r: { key: string, logic: unknown }) => r.key === 'r2' ? { ...r, logic: { '<=': [{ var: 'ach50' }, 2.5] }, summary: 'Air leakage not exceeding 2.5 ACH50 (local amendment, test only)' } : r)
    expect((await adminA.request('PUT', `/api/rule-sets/${setId}/draft`, { rules, baseRevision: set.draftRevision })).status).toBe(200)
    const published = await adminA.post(`/api/rule-sets/${setId}/publish`, { note: 'Tighter local amendment (test)' })
    expect(published.status).toBeLessThan(300)

    const after = await until(() => raterB.post('/api/checks?dryRun=1', check(840)).then(r => r.body), v => v.verdict === 'does-not-comply')
    expect(after.verdict).toBe('does-not-comply')
    expect(after.ruleSetVersion.number).toBe(before.ruleSetVersion.number + 1)
    expect(after.rules[0].limit).toBe(2.5)
  })

  it('a rater deactivated through A is signed out in B', async () => {
    const adminA = new Client(a.url, '192.0.2.22')
    await adminA.signIn('admin@tightwell.test')
    const made = await adminA.post('/api/users', { email: 'twoproc@tightwell.test', name: 'Lorcan Beale', role: 'rater', password: 'a-long-first-password' })
    const raterB = new Client(b.url, '192.0.2.23')
    await raterB.signIn('twoproc@tightwell.test', 'a-long-first-password')
    expect((await raterB.get('/api/auth/me')).status).toBe(200)
    await adminA.post(`/api/users/${made.body.id}/deactivate`)
    const res = await until(() => raterB.get('/api/auth/me'), r => r.status === 401)
    expect(res.status).toBe(401)
  })
})
