import { existsSync, readFileSync } from 'node:fs'
import { join, resolve } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { Client, freshAddress } from '../support/http'
import { ROOT, startBuiltServer, type RunningServer } from '../support/server'

/**
 * Rule tables over HTTP on the built server. The county files are open data read from
 * ../shared/reference (never copied into the project):
 * - county-zones-iecc2021.csv: US DOE/PNNL county climate-zone data, 2021 IECC map (fields
 *   IECC21/Moisture21), via the MIT-licensed compbiolover/housing-nutrition-label repository;
 * - county-zones-pre2021.csv: the county table compiled from the US DOE Building America county
 *   lists (IECC 2006–2018 map), via joesimeone/climate_regions.
 * Spot checks and the 373-county difference: ../shared/reference/README.md.
 */
const REFERENCE = resolve(ROOT, '../shared/reference')
const hasReference = existsSync(join(REFERENCE, 'county-zones-iecc2021.csv'))
if (!hasReference) console.warn(`[rule-tables] ${REFERENCE} is absent: the reference-file imports are skipped (CI always has it).`)
const readRef = (name: string) => readFileSync(join(REFERENCE, name), 'utf8')

/** The 2021 file read independently of the importer: plain split (it has no quotes). */
function expected2021(): Map<string, string> {
  const lines = readRef('county-zones-iecc2021.csv').split('\r\n').filter(Boolean)
  expect(lines[0]).toBe('county_fips,iecc_zone')
  return new Map(lines.slice(1).map(l => l.split(',') as [string, string]))
}
/** The pre-2021 file: zone = IECC Climate Zone + IECC Moisture Regime ("N/A" → none). */
function expectedPre2021(): Map<string, { zone: string, name: string, state: string }> {
  const lines = readRef('county-zones-pre2021.csv').split(/\r?\n/).filter(Boolean)
  expect(lines[0]).toBe('State,State FIPS,County FIPS,IECC Climate Zone,IECC Moisture Regime,BA Climate Zone,County Name')
  return new Map(lines.slice(1).map((l) => {
    const [state, sf, cf, cz, m, , name] = l.split(',')
    return [`${sf}${cf}`, { zone: cz + (m === 'N/A' ? '' : m), name: name!, state: state! }]
  }))
}

async function signedIn(email: string, baseUrl?: string) {
  const c = new Client(baseUrl, freshAddress())
  await c.signIn(email)
  return c
}
const admin = () => signedIn('admin@tightwell.test')

let counter = 0
async function newZoneMap(c: Client, label = 'map'): Promise<number> {
  counter += 1
  const res = await c.post('/api/zone-maps', { name: `Test ${label} ${Date.now()}-${counter}`, edition: 'test' })
  expect(res.status).toBe(201)
  return res.body.id
}
async function rows(c: Client, mapId: number): Promise<{ countyFips: string, zone: string, countyName: string | null, stateCode: string | null }[]> {
  const res = await c.get(`/api/zone-maps/${mapId}/counties`)
  expect(res.status).toBe(200)
  return res.body.rows
}
const importCsv = (c: Client, mapId: number, csv: string, mode = 'replace', columns?: Record<string, string>) => c.post(`/api/zone-maps/${mapId}/import`, { mode, csv, ...(columns ? { columns } : {}) })

describe.skipIf(!hasReference)('importing the reference county maps', () => {
  let c: Client
  let map2021: number
  let mapOld: number
  beforeAll(async () => {
    c = await admin()
    map2021 = await newZoneMap(c, '2021')
    mapOld = await newZoneMap(c, 'pre-2021')
  })

  it('imports county-zones-iecc2021.csv (3,235 rows, CRLF) and stores every zone as in the file', async () => {
    const res = await importCsv(c, map2021, readRef('county-zones-iecc2021.csv'))
    expect(res.status).toBe(200)
    expect(res.body).toMatchObject({ rowsInFile: 3235, added: 3235, changed: 0, removed: 0, rowCount: 3235, warningCount: 0 })
    expect(res.body.columns).toEqual({ fips: 'county_fips', zone: 'iecc_zone' })
    expect(res.headers.get('server-timing')).toMatch(/^import;dur=/)
    const stored = await rows(c, map2021)
    const expected = expected2021()
    expect(stored).toHaveLength(expected.size)
    for (const row of stored) expect(row.zone, row.countyFips).toBe(expected.get(row.countyFips))
  })

  it('imports county-zones-pre2021.csv (another layout: State FIPS + County FIPS, zone + moisture) as raw text/csv', async () => {
    const res = await c.request('POST', `/api/zone-maps/${mapOld}/import?mode=replace`, readRef('county-zones-pre2021.csv'), { 'content-type': 'text/csv' })
    expect(res.status).toBe(200)
    expect(res.body.columns).toEqual({ stateFips: 'State FIPS', countyFips: 'County FIPS', zone: 'IECC Climate Zone', moisture: 'IECC Moisture Regime', countyName: 'County Name', state: 'State' })
    expect(res.body.ignoredColumns).toEqual(['BA Climate Zone'])
    expect(res.body.rowCount).toBe(3237)
    const stored = await rows(c, mapOld)
    const expected = expectedPre2021()
    expect(stored).toHaveLength(3237)
    for (const row of stored) {
      const e = expected.get(row.countyFips)!
      expect({ zone: row.zone, name: row.countyName, state: row.stateCode }, row.countyFips).toEqual(e)
    }
  })

  // ../shared/reference/README.md, spot checks "that agree with both files" [MEMORY, confirmed by both files].
  it.each([
    ['12086', '1A'], ['48201', '2A'], ['04013', '2B'], ['06037', '3B'], ['06075', '3C'], ['13121', '3A'],
    ['36061', '4A'], ['53033', '4C'], ['25025', '5A'], ['08031', '5B'], ['27053', '6A'], ['02090', '8'],
  ])('spot check: county %s is %s on both maps', async (fips, zone) => {
    const [a, b] = await Promise.all([rows(c, map2021), rows(c, mapOld)])
    expect(a.find(r => r.countyFips === fips)?.zone).toBe(zone)
    expect(b.find(r => r.countyFips === fips)?.zone).toBe(zone)
  })

  it('the maps differ where README says: 373 counties; Palm Beach 2A → 1A; Kitsap 4C → 5C; Marquette 6A → 7', async () => {
    const a = new Map((await rows(c, map2021)).map(r => [r.countyFips, r.zone]))
    const b = new Map((await rows(c, mapOld)).map(r => [r.countyFips, r.zone]))
    const differ = [...a.keys()].filter(f => b.has(f) && a.get(f) !== b.get(f))
    expect(differ).toHaveLength(373)
    expect([b.get('12099'), a.get('12099')]).toEqual(['2A', '1A'])
    expect([b.get('53035'), a.get('53035')]).toEqual(['4C', '5C'])
    expect([b.get('26103'), a.get('26103')]).toEqual(['6A', '7'])
    // Quirks named in the README: old Connecticut counties and Valdez-Cordova are in the 2021 file.
    expect(a.get('09001')).toBeDefined()
    expect(a.get('02261')).toBeDefined()
  })

  it('a failed import leaves the map exactly as it was (one bad row among 3,235)', async () => {
    const before = await rows(c, map2021)
    const revision = (await c.get(`/api/zone-maps/${map2021}`)).body.revision
    const auditBefore = (await c.get(`/api/audit?entityType=zone-map&entityId=${map2021}`)).body.length
    const lines = readRef('county-zones-iecc2021.csv').split('\r\n')
    lines[3000] = lines[3000]!.replace(/,.*/, ',3D')
    for (const mode of ['replace', 'merge']) {
      const res = await importCsv(c, map2021, lines.join('\r\n'), mode)
      expect(res.status).toBe(400)
      expect(res.body.data.problems).toEqual([{ line: 3001, column: 'iecc_zone', reason: '"3D" is not a climate zone; zone 3 takes A, B, C' }])
    }
    expect(await rows(c, map2021)).toEqual(before)
    expect((await c.get(`/api/zone-maps/${map2021}`)).body.revision).toBe(revision)
    expect((await c.get(`/api/audit?entityType=zone-map&entityId=${map2021}`)).body.length).toBe(auditBefore)
  })

  it('export then re-import gives identical rows (both maps)', async () => {
    for (const id of [map2021, mapOld]) {
      const exported = await c.get(`/api/zone-maps/${id}/export`)
      expect(exported.status).toBe(200)
      expect(exported.headers.get('content-type')).toMatch(/^text\/csv/)
      expect(exported.text.startsWith('county_fips,zone,county_name,state\r\n')).toBe(true)
      const copy = await newZoneMap(c, 'copy')
      const res = await importCsv(c, copy, exported.text)
      expect(res.status).toBe(200)
      expect(await rows(c, copy)).toEqual(await rows(c, id))
    }
  })

  it('merge updates only the counties in the file and keeps stored county names', async () => {
    const copy = await newZoneMap(c, 'merge')
    await c.request('POST', `/api/zone-maps/${copy}/import?mode=replace`, readRef('county-zones-pre2021.csv'), { 'content-type': 'text/csv' })
    const res = await importCsv(c, copy, readRef('county-zones-iecc2021.csv'), 'merge')
    expect(res.status).toBe(200)
    // 3,235 counties in the 2021 file, 373 of them in another zone [README]; the 2 counties only in the old file stay.
    expect(res.body).toMatchObject({ added: 0, changed: 373, unchanged: 3235 - 373, removed: 0, rowCount: 3237 })
    const kitsap = (await rows(c, copy)).find(r => r.countyFips === '53035')
    expect(kitsap).toEqual({ countyFips: '53035', zone: '5C', countyName: 'Kitsap', stateCode: 'WA' })
  })
})

describe('zone-map CSV: bad input is a clear per-row error and nothing is written', () => {
  let c: Client
  let mapId: number
  beforeAll(async () => {
    c = await admin()
    mapId = await newZoneMap(c, 'bad-input')
    expect((await importCsv(c, mapId, 'county_fips,zone,county_name,state\n53035,5C,Kitsap,WA\n')).status).toBe(200)
  })

  const refused: [string, string, { line: number, column: string, reason: RegExp }][] = [
    ['a missing zone column', 'county_fips,county_name\n53035,Kitsap\n', { line: 1, column: '(header)', reason: /no climate-zone column/ }],
    ['a missing FIPS column', 'zone\n5C\n', { line: 1, column: '(header)', reason: /no county FIPS column/ }],
    ['an extra field in a row', 'county_fips,zone\n53035,5C,extra\n', { line: 2, column: '(row)', reason: /has 3 fields; the header has 2/ }],
    ['a missing field in a row', 'county_fips,zone,county_name\n53035,5C\n', { line: 2, column: '(row)', reason: /has 2 fields; the header has 3/ }],
    ['a duplicate county', 'county_fips,zone\n53035,5C\n08031,5B\n53035,4C\n', { line: 4, column: 'county_fips', reason: /county 53035 is already on line 2/ }],
    ['zone 9', 'county_fips,zone\n53035,9\n', { line: 2, column: 'zone', reason: /zones run from 0 to 8/ }],
    ['zone 3D', 'county_fips,zone\n53035,3D\n', { line: 2, column: 'zone', reason: /zone 3 takes A, B, C/ }],
    ['a bare 4 (no moisture letter)', 'county_fips,zone\n53035,4\n', { line: 2, column: 'zone', reason: /zone 4 needs a moisture letter/ }],
    ['7A (zones 7 and 8 take no letter)', 'county_fips,zone\n53035,7A\n', { line: 2, column: 'zone', reason: /takes no moisture letter/ }],
    ['a 3-digit FIPS', 'county_fips,zone\n535,5C\n', { line: 2, column: 'county_fips', reason: /not a 5-digit county FIPS/ }],
    ['a state that contradicts the FIPS', 'county_fips,zone,state\n53035,5C,OR\n', { line: 2, column: 'state', reason: /OR does not match the FIPS state code 53 \(WA\)/ }],
    ['blank lines still count in line numbers', 'county_fips,zone\n\n53035,5C\n\n\n08031,9\n', { line: 6, column: 'zone', reason: /zones run from 0 to 8/ }],
    ['an empty file', '\n\n', { line: 1, column: '(file)', reason: /the file is empty/ }],
    ['a header with no rows', 'county_fips,zone\n', { line: 2, column: '(file)', reason: /header but no rows/ }],
  ]
  it.each(refused)('refuses %s with line, column and reason', async (_label, csv, problem) => {
    const before = await rows(c, mapId)
    const res = await importCsv(c, mapId, csv)
    expect(res.status).toBe(400)
    const first = res.body.data.problems[0]
    expect(first.line).toBe(problem.line)
    expect(first.column).toBe(problem.column)
    expect(first.reason).toMatch(problem.reason)
    expect(res.body.message).toMatch(new RegExp(`^line ${problem.line}, `))
    expect(await rows(c, mapId)).toEqual(before)
  })

  it('reports every bad row at once', async () => {
    const res = await importCsv(c, mapId, 'county_fips,zone\n53035,9\n08031,3D\n1,5B\n')
    expect(res.status).toBe(400)
    expect(res.body.data.problems.map((p: { line: number }) => p.line)).toEqual([2, 3, 4])
    expect(res.body.data.problemCount).toBe(3)
  })

  const accepted: [string, string, { countyFips: string, zone: string, countyName: string | null }[], number][] = [
    ['a byte-order mark and CRLF line ends', '\uFEFFcounty_fips,zone,county_name\r\n53035,5C,Kitsap\r\n08031,5B,Denver\r\n', [{ countyFips: '08031', zone: '5B', countyName: 'Denver' }, { countyFips: '53035', zone: '5C', countyName: 'Kitsap' }], 0],
    ['semicolon delimiters (decimal-comma spreadsheets)', 'county_fips;zone;county_name\n53035;5c;Kitsap\n', [{ countyFips: '53035', zone: '5C', countyName: 'Kitsap' }], 0],
    ['a quoted comma', 'county_fips,zone,county_name\n53035,5C,"Kitsap, the county"\n', [{ countyFips: '53035', zone: '5C', countyName: 'Kitsap, the county' }], 0],
    ['blank lines', 'county_fips,zone\n\n53035,5C\n\n\n', [{ countyFips: '53035', zone: '5C', countyName: null }], 0],
    // Decision (README): a 4-digit FIPS lost its leading zero in a spreadsheet; it is repaired with a warning.
    ['a FIPS that lost its leading zero (repaired, with a warning)', 'county_fips,zone\n8031,5B\n', [{ countyFips: '08031', zone: '5B', countyName: null }], 1],
  ]
  it.each(accepted)('accepts %s', async (_label, csv, expected, warnings) => {
    const target = await newZoneMap(c, 'accepted')
    const res = await importCsv(c, target, csv)
    expect(res.status).toBe(200)
    expect(res.body.warningCount).toBe(warnings)
    if (warnings) expect(res.body.warnings[0]).toEqual({ line: 2, column: 'county_fips', reason: '"8031" lost its leading zero; read as 08031' })
    expect((await rows(c, target)).map(r => ({ countyFips: r.countyFips, zone: r.zone, countyName: r.countyName }))).toEqual(expected)
  })

  it('an explicit column mapping overrides the guess', async () => {
    const target = await newZoneMap(c, 'mapped')
    const res = await importCsv(c, target, 'geo,cz,label\n53035,5C,Kitsap\n', 'replace', { fips: 'geo', zone: 'cz', countyName: 'label' })
    expect(res.status).toBe(200)
    expect(await rows(c, target)).toEqual([{ countyFips: '53035', zone: '5C', countyName: 'Kitsap', stateCode: 'WA' }])
  })

  it('a file over the size limit is 413 with the limit in the message, and nothing is written', async () => {
    const before = await rows(c, mapId)
    const big = 'county_fips,zone\n' + '53035,5C\n'.repeat(600_000)
    const res = await importCsv(c, mapId, big)
    expect(res.status).toBe(413)
    expect(res.body.message).toMatch(/the limit is 5 MB/)
    const raw = await c.request('POST', `/api/zone-maps/${mapId}/import?mode=replace`, big, { 'content-type': 'text/csv' })
    expect(raw.status).toBe(413)
    expect(await rows(c, mapId)).toEqual(before)
  })

  it('the limit is on the CSV, not on its JSON escaping: 3 MB of quotes (6 MB as JSON) is read, then refused per row', async () => {
    const csv = `county_fips,zone,county_name\n53035,5C,"${'""'.repeat(1_500_000)}"\n`
    const res = await importCsv(c, mapId, csv)
    expect(res.status).toBe(400)
    expect(res.body.data.problems[0]).toEqual({ line: 2, column: 'county_name', reason: 'is longer than 100 characters' })
  })

  it('a bad mode or body is a 400 naming the field', async () => {
    const res = await c.post(`/api/zone-maps/${mapId}/import`, { mode: 'append', csv: 'x' })
    expect(res.status).toBe(400)
    expect(res.body.data.field).toBe('mode')
    expect((await c.post(`/api/zone-maps/${mapId}/import`, '{"mode":')).body.data.field).toBe('(body)')
  })

  it('inline edits: change a zone, refuse an invalid one, add and delete a row, every change audited', async () => {
    const bad = await c.request('PUT', `/api/zone-maps/${mapId}/counties/53035`, { zone: '3D' })
    expect(bad.status).toBe(400)
    expect(bad.body.data.field).toBe('zone')
    const ok = await c.request('PUT', `/api/zone-maps/${mapId}/counties/53035`, { zone: '4c' })
    expect(ok.status).toBe(200)
    expect(ok.body).toEqual({ countyFips: '53035', zone: '4C', countyName: 'Kitsap', stateCode: 'WA' })
    const lostZero = await c.request('PUT', `/api/zone-maps/${mapId}/counties/8031`, { zone: '5B' })
    expect(lostZero.status).toBe(400)
    expect(lostZero.body.data.field).toBe('fips')
    expect((await c.request('PUT', `/api/zone-maps/${mapId}/counties/08031`, { zone: '5B', countyName: 'Denver' })).status).toBe(201)
    expect((await c.request('DELETE', `/api/zone-maps/${mapId}/counties/08031`)).status).toBe(204)
    expect((await c.request('DELETE', `/api/zone-maps/${mapId}/counties/08031`)).status).toBe(404)
    const log = (await c.get(`/api/audit?entityType=zone-map&entityId=${mapId}`)).body
    expect(log.slice(0, 3).map((e: { action: string }) => e.action)).toEqual(['zone-map.row.delete', 'zone-map.row.add', 'zone-map.row.update'])
    expect(log[2].before).toMatchObject({ zone: '5C' })
    expect(log[2].after).toMatchObject({ zone: '4C' })
    expect(log[2].userName).toBe('Imogen Castellanos')
  })

  it('a hostile cell is exported neutralised and comes back unchanged (lossless round trip)', async () => {
    const hostile = '=HYPERLINK("http://example.invalid","x")'
    expect((await c.request('PUT', `/api/zone-maps/${mapId}/counties/53035`, { zone: '5C', countyName: hostile })).status).toBe(200)
    for (const start of ['+SUM(1)', '-2+3', '@cmd', '\tTAB', '\rCR']) {
      expect((await c.request('PUT', `/api/zone-maps/${mapId}/counties/0803${['+', '-', '@', '\t', '\r'].indexOf(start[0]!) + 1}`, { zone: '5B', countyName: start })).status).toBeLessThan(300)
    }
    const exported = (await c.get(`/api/zone-maps/${mapId}/export`)).text
    // OWASP CSV injection: the cell begins with an apostrophe in the file.
    expect(exported).toContain(`"'=HYPERLINK(""http://example.invalid"",""x"")"`)
    expect(exported).toContain('\'+SUM(1)')
    expect(exported).toContain('\'-2+3')
    expect(exported).toContain('\'@cmd')
    expect(exported.split('\r\n').some(l => /^[^,]*,[^,]*,[=+\-@\t\r]/.test(l))).toBe(false)
    const copy = await newZoneMap(c, 'hostile-copy')
    expect((await importCsv(c, copy, exported)).status).toBe(200)
    expect(await rows(c, copy)).toEqual(await rows(c, mapId))
    expect((await c.get(`/api/zone-maps/${copy}/export`)).text).toBe(exported)
  })
})

/** A limits table of our own (from the IECC 2015 model), so seeded tables stay as they are for other test files. */
async function newRuleSet(c: Client, label: string): Promise<number> {
  counter += 1
  const res = await c.post('/api/rule-sets/from-model', { file: 'iecc-2015.csv', name: `Test ${label} ${Date.now()}-${counter}` })
  expect(res.status).toBe(201)
  return res.body.id
}
const draftOf = async (c: Client, id: number) => (await c.get(`/api/rule-sets/${id}`)).body

describe('limits tables: draft, validation, publish, versions and diff', () => {
  let c: Client
  let setId: number
  beforeAll(async () => {
    c = await admin()
    setId = await newRuleSet(c, 'limits')
  })

  it('the model table arrives as a draft citing the code; the shipped tables are listed', async () => {
    const models = (await c.get('/api/rule-sets/models')).body
    expect(models.map((m: { file: string }) => m.file)).toEqual(['iecc-2009.csv', 'iecc-2012.csv', 'iecc-2015.csv', 'fbc-2017-energy.csv', 'doe-zerh-rev07.csv', 'phi-passive-house-classic.csv'])
    const set = await draftOf(c, setId)
    expect(set.latestVersion).toBeNull()
    expect(set.unpublishedChanges).toBe(true)
    // code-limits.csv: IECC 2015 R402.4.1.2, zones 3-8, ACH50 <= 3 [READ (secondary)].
    expect(set.draft[1]).toMatchObject({ key: 'r2', zones: '3-8', logic: { '<=': [{ var: 'ach50' }, 3] }, citationCode: 'IECC', citationEdition: '2015', citationSection: 'R402.4.1.2' })
  })

  const hostile: [string, unknown, string, RegExp][] = [
    ['an unknown operator', { method: [{ var: 'ach50' }, 'toString'] }, 'rules.0.logic', /operator "method" is not allowed/],
    ['an unknown variable', { '<=': [{ var: 'constructor' }, 3] }, 'rules.0.logic', /unknown variable "constructor"/],
    ['a rule nested 1,000 deep', (() => { let r: unknown = { '<=': [{ var: 'ach50' }, 3] }; for (let i = 0; i < 1000; i++) r = { '!': r }; return r })(), 'rules.0.logic', /too long|nested too deep/],
    ['a rule nested 13 deep (short enough, too deep)', (() => { let r: unknown = { '<=': [{ var: 'ach50' }, 3] }; for (let i = 0; i < 12; i++) r = { '!': r }; return r })(), 'rules.0.logic', /nested too deep \(more than 12 levels\)/],
    ['a number compared with text', { '<=': [{ var: 'ach50' }, '3'] }, 'rules.0.logic', /compares a number with text/],
    ['a rule with no variable', { '<=': [1, 3] }, 'rules.0.logic', /at least one variable/],
  ]
  it.each(hostile)('refuses %s (400, field and reason) and leaves the draft as it was', async (_label, logic, field, reason) => {
    const before = await draftOf(c, setId)
    const rules = [{ ...before.draft[0], logic }, ...before.draft.slice(1)]
    const res = await c.request('PUT', `/api/rule-sets/${setId}/draft`, { rules })
    expect(res.status).toBe(400)
    expect(res.body.data.field).toBe(field)
    expect(res.body.data.reason).toMatch(reason)
    const after = await draftOf(c, setId)
    expect(after.draft).toEqual(before.draft)
    expect(after.draftRevision).toBe(before.draftRevision)
  })

  it('refuses bad cells with their field: zones, building type, citation, duplicate key', async () => {
    const { draft } = await draftOf(c, setId)
    const cases: [Record<string, unknown>, string][] = [
      [{ zones: '9' }, 'rules.0.zones'],
      [{ zones: '3A-5A' }, 'rules.0.zones'],
      [{ buildingType: 'duplex' }, 'rules.0.buildingType'],
      [{ citationSection: ' ' }, 'rules.0.citationSection'],
      [{ key: 'r2' }, 'rules.1.key'],
    ]
    for (const [change, field] of cases) {
      const res = await c.request('PUT', `/api/rule-sets/${setId}/draft`, { rules: [{ ...draft[0], ...change }, ...draft.slice(1)] })
      expect(res.status, JSON.stringify(change)).toBe(400)
      expect(res.body.data.problems.map((p: { field: string }) => p.field)).toContain(field)
    }
  })

  it('publishes version 1, then an edit as version 2 with a note; the diff shows the change; old versions stay readable', async () => {
    const v1 = await c.post(`/api/rule-sets/${setId}/publish`, { note: 'As shipped' })
    expect(v1.status).toBe(201)
    expect(v1.body).toMatchObject({ number: 1, note: 'As shipped', publishedBy: 'Imogen Castellanos' })
    const again = await c.post(`/api/rule-sets/${setId}/publish`, { note: 'Nothing changed' })
    expect(again.status).toBe(409)
    expect(again.body.message).toMatch(/same as version 1/)

    const set = await draftOf(c, setId)
    const rules = structuredClone(set.draft)
    rules[1].logic = { or: [{ '<=': [{ var: 'ach50' }, 3] }, { '<=': [{ var: 'cfm50PerEnclosureArea' }, 0.28] }] }
    rules.push({ ...rules[0], key: 'attached-exception', zones: 'all', buildingType: 'attached', logic: { '<=': [{ var: 'cfm50PerEnclosureArea' }, 0.3] }, summary: 'Local amendment for attached units (test)', citationCode: 'Local amendment', citationEdition: '2024', citationSection: '1.2' })
    const saved = await c.request('PUT', `/api/rule-sets/${setId}/draft`, { rules, baseRevision: set.draftRevision })
    expect(saved.status).toBe(200)
    // A second editor that opened the draft before that save is refused, not silently overwritten.
    const stale = await c.request('PUT', `/api/rule-sets/${setId}/draft`, { rules: set.draft, baseRevision: set.draftRevision })
    expect(stale.status).toBe(409)
    expect(await draftOf(c, setId)).toMatchObject({ unpublishedChanges: true, latestVersion: 1 })

    const missingNote = await c.post(`/api/rule-sets/${setId}/publish`, { note: '' })
    expect(missingNote.status).toBe(400)
    expect(missingNote.body.data.field).toBe('note')
    const v2 = await c.post(`/api/rule-sets/${setId}/publish`, { note: 'Alternative metric; attached units' })
    expect(v2.status).toBe(201)
    expect(v2.body.number).toBe(2)

    const diff = (await c.get(`/api/rule-sets/${setId}/diff?from=1&to=2`)).body
    expect(diff.added.map((r: { key: string }) => r.key)).toEqual(['attached-exception'])
    expect(diff.removed).toEqual([])
    expect(diff.changed).toHaveLength(1)
    expect(diff.changed[0]).toMatchObject({ key: 'r2', fields: ['logic'] })
    expect(diff.unchanged).toBe(2)

    const old = (await c.get(`/api/rule-sets/${setId}/versions/1`)).body
    expect(old.rules[1].logic).toEqual({ '<=': [{ var: 'ach50' }, 3] })
    expect((await c.get(`/api/rule-sets/${setId}/versions/3`)).status).toBe(404)
    const history = (await draftOf(c, setId)).versions
    expect(history.map((v: { number: number, note: string }) => [v.number, v.note])).toEqual([[2, 'Alternative metric; attached units'], [1, 'As shipped']])
    const log = (await c.get(`/api/audit?entityType=rule-set&entityId=${setId}`)).body
    expect(log[0]).toMatchObject({ action: 'rule-set.publish', userName: 'Imogen Castellanos' })
    expect(log[0].before.version).toBe(1)
    expect(log[0].after.version).toBe(2)
  })

  it('limits export then import (replace) gives an identical draft; a hostile summary is neutralised in the file', async () => {
    const set = await draftOf(c, setId)
    const rules = structuredClone(set.draft)
    rules[0].summary = '=HYPERLINK("http://example.invalid")'
    rules[0].notes = '@SUM(A1:A2), "quoted", and a\nnewline'
    expect((await c.request('PUT', `/api/rule-sets/${setId}/draft`, { rules })).status).toBe(200)
    const exported = await c.get(`/api/rule-sets/${setId}/export`)
    expect(exported.status).toBe(200)
    expect(exported.text.split('\r\n')[0]).toBe('key,zones,building_type,kind,metric,comparison,limit,logic,summary,citation_code,citation_edition,citation_section,notes')
    expect(exported.text).toContain(`"'=HYPERLINK(""http://example.invalid"")"`)
    expect(exported.text).toContain(`"'@SUM(A1:A2)`)
    const copy = await newRuleSet(c, 'limits-copy')
    const res = await c.post(`/api/rule-sets/${copy}/import`, { mode: 'replace', csv: exported.text })
    expect(res.status).toBe(200)
    expect((await draftOf(c, copy)).draft).toEqual((await draftOf(c, setId)).draft)
    expect((await c.get(`/api/rule-sets/${copy}/export`)).text).toBe(exported.text)
    const v1 = await c.get(`/api/rule-sets/${setId}/export?version=1`)
    expect(v1.text).toContain('r2,3-8,any,limit,ach50,<=,3,')
  })

  const badLimits: [string, string, { line: number, column: string, reason: RegExp }][] = [
    ['a decimal-comma limit', 'zones,metric,comparison,limit,citation_code,citation_edition,citation_section\n3-8,ach50,<=,"0,28",IECC,2015,R402.4.1.2\n', { line: 2, column: 'limit', reason: /use a point for decimals/ }],
    ['a non-numeric limit', 'zones,metric,comparison,limit,citation_code,citation_edition,citation_section\n3-8,ach50,<=,three,IECC,2015,R402.4.1.2\n', { line: 2, column: 'limit', reason: /"three" is not a number/ }],
    ['an unknown metric', 'zones,metric,comparison,limit,citation_code,citation_edition,citation_section\n3-8,ach49,<=,3,IECC,2015,R402.4.1.2\n', { line: 2, column: 'metric', reason: /"ach49" is not a rule variable/ }],
    ['an unknown operator in logic', 'zones,logic,citation_code,citation_edition,citation_section\n3-8,"{""log"":[{""var"":""ach50""}]}",IECC,2015,R402.4.1.2\n', { line: 2, column: 'logic', reason: /operator "log" is not allowed/ }],
    ['logic that is not JSON', 'zones,logic,citation_code,citation_edition,citation_section\n3-8,{<=,IECC,2015,R402.4.1.2\n', { line: 2, column: 'logic', reason: /is not valid JSON/ }],
    ['an unknown column', 'zones,metric,comparison,limit,citation_code,citation_edition,citation_section,colour\n3-8,ach50,<=,3,IECC,2015,R402.4.1.2,red\n', { line: 1, column: 'colour', reason: /not a limits-table column/ }],
    ['a missing citation column', 'zones,metric,comparison,limit\n3-8,ach50,<=,3\n', { line: 1, column: 'citation_code', reason: /this column is missing/ }],
    ['a duplicate key', 'key,zones,metric,comparison,limit,citation_code,citation_edition,citation_section\na,3-8,ach50,<=,3,IECC,2015,R1\na,1-2,ach50,<=,5,IECC,2015,R1\n', { line: 3, column: 'key', reason: /already the key of rule 1/ }],
    ['logic and metric that disagree', 'zones,metric,comparison,limit,logic,citation_code,citation_edition,citation_section\n3-8,ach50,<=,3,"{""<="":[{""var"":""ach50""},5]}",IECC,2015,R1\n', { line: 2, column: 'logic', reason: /disagrees with metric/ }],
    ['an unknown zone', 'zones,metric,comparison,limit,citation_code,citation_edition,citation_section\n3D,ach50,<=,3,IECC,2015,R1\n', { line: 2, column: 'zones', reason: /zone 3 takes A, B, C/ }],
  ]
  it.each(badLimits)('limits import refuses %s; the draft stays as it was', async (_label, csv, problem) => {
    const before = (await draftOf(c, setId)).draft
    const res = await c.post(`/api/rule-sets/${setId}/import`, { mode: 'replace', csv })
    expect(res.status).toBe(400)
    expect(res.body.data.problems[0]).toMatchObject({ line: problem.line, column: problem.column })
    expect(res.body.data.problems[0].reason).toMatch(problem.reason)
    expect((await draftOf(c, setId)).draft).toEqual(before)
  })

  it('limits import merge updates by key and appends new rules; semicolons and a BOM are fine', async () => {
    const copy = await newRuleSet(c, 'merge')
    const csv = '\uFEFFkey;zones;metric;comparison;limit;citation_code;citation_edition;citation_section\r\nr2;3-8;ach50;<=;2.5;IECC;2015;R402.4.1.2\r\nnew;4C;ach50;≤;2;Local;2024;9.9\r\n'
    const res = await c.post(`/api/rule-sets/${copy}/import`, { mode: 'merge', csv })
    expect(res.status).toBe(200)
    const draft = (await draftOf(c, copy)).draft
    expect(draft.map((r: { key: string }) => r.key)).toEqual(['r1', 'r2', 'irc-r303.4', 'new'])
    expect(draft[1].logic).toEqual({ '<=': [{ var: 'ach50' }, 2.5] })
    expect(draft[3]).toMatchObject({ zones: '4C', logic: { '<=': [{ var: 'ach50' }, 2] } })
  })

  it('limits import over the size limit is 413', async () => {
    const res = await c.post(`/api/rule-sets/${setId}/import`, { mode: 'replace', csv: 'x'.repeat(5 * 1024 * 1024 + 10) })
    expect(res.status).toBe(413)
    expect(res.body.message).toMatch(/5 MB/)
  })
})

describe('resolving the rules in force', () => {
  let c: Client
  let jurisdictionId: number
  let ruleSet2012: number
  let ruleSet2015: number
  let mapOld: number
  let mapNew: number
  const resolveQ = (q: Record<string, string | number>) => c.get(`/api/rulebook/resolve?${new URLSearchParams(Object.entries(q).map(([k, v]) => [k, String(v)]))}`)

  beforeAll(async () => {
    c = await admin()
    mapOld = await newZoneMap(c, 'resolve-old')
    mapNew = await newZoneMap(c, 'resolve-new')
    // King County WA (53033) is 4C on both maps; Clallam (53009) 4C → 5C [README, 373 changes].
    await importCsv(c, mapOld, 'county_fips,zone,county_name\n53033,4C,King\n53009,4C,Clallam\n')
    await importCsv(c, mapNew, 'county_fips,zone,county_name\n53033,4C,King\n53009,5C,Clallam\n')
    ruleSet2012 = await newRuleSet(c, 'resolve-2012')
    ruleSet2015 = await newRuleSet(c, 'resolve-2015')
    expect((await c.post(`/api/rule-sets/${ruleSet2012}/publish`, { note: 'v1' })).status).toBe(201)
    const j = await c.post('/api/jurisdictions', { name: `Test Cedar Hollow Permits ${Date.now()}`, kind: 'county', stateCode: 'WA', contactEmail: 'Permits@CedarHollow.test', zoneMapId: mapNew })
    expect(j.status).toBe(201)
    jurisdictionId = j.body.id
    expect((await c.request('PUT', `/api/jurisdictions/${jurisdictionId}/coverage`, { counties: ['53009'], postalCodes: [] })).status).toBe(200)
    expect((await c.post(`/api/jurisdictions/${jurisdictionId}/editions`, { name: 'IECC 2012', ruleSetId: ruleSet2012, zoneMapId: mapOld, effectiveFrom: '2014-01-01', effectiveUntil: '2018-06-30' })).status).toBe(201)
    expect((await c.post(`/api/jurisdictions/${jurisdictionId}/editions`, { name: 'IECC 2015', ruleSetId: ruleSet2015, effectiveFrom: '2018-07-01' })).status).toBe(201)
  })

  it('refuses overlapping editions and dates that are not dates', async () => {
    const overlap = await c.post(`/api/jurisdictions/${jurisdictionId}/editions`, { name: 'IECC 2018', ruleSetId: ruleSet2015, effectiveFrom: '2018-06-30' })
    expect(overlap.status).toBe(400)
    expect(overlap.body.data.field).toBe('effectiveFrom')
    expect(overlap.body.data.reason).toMatch(/overlaps IECC 2012/)
    const notADate = await c.post(`/api/jurisdictions/${jurisdictionId}/editions`, { name: 'X', ruleSetId: ruleSet2015, effectiveFrom: '2023-02-30' })
    expect(notADate.status).toBe(400)
    expect(notADate.body.data.field).toBe('effectiveFrom')
    const backwards = await c.post(`/api/jurisdictions/${jurisdictionId}/editions`, { name: 'X', ruleSetId: ruleSet2015, effectiveFrom: '2030-01-01', effectiveUntil: '2029-01-01' })
    expect(backwards.body.data.field).toBe('effectiveUntil')
    const wrongState = await c.request('PUT', `/api/jurisdictions/${jurisdictionId}/coverage`, { counties: ['08031'] })
    expect(wrongState.status).toBe(400)
    expect(wrongState.body.data.field).toBe('counties.0')
  })

  it('the edition in force on the permit date decides, with its own zone map (the edition span is inclusive)', async () => {
    const r2012 = (await resolveQ({ countyFips: '53009', permitDate: '2018-06-30', buildingType: 'detached' })).body
    expect(r2012).toMatchObject({ ok: true, edition: { name: 'IECC 2012' }, zone: '4C', ruleSetVersion: { number: 1 } })
    expect(r2012.zoneMap.id).toBe(mapOld)
    // code-limits.csv: IECC 2012 R402.4.1.2 zones 3-8, ACH50 <= 3; IRC R303.4 advisory below 5.
    expect(r2012.limits.map((r: { logic: unknown }) => r.logic)).toEqual([{ '<=': [{ var: 'ach50' }, 3] }])
    expect(r2012.limits[0].terms).toEqual({ combinator: 'single', terms: [{ metric: 'ach50', comparison: '<=', limit: 3 }] })
    expect(r2012.advisories.map((r: { citationSection: string }) => r.citationSection)).toEqual(['R303.4'])
    // The next day the 2015 edition applies, on the jurisdiction's default (2021) map: Clallam is 5C there.
    const r2015 = (await resolveQ({ jurisdictionId, countyFips: '53009', permitDate: '2018-07-01', buildingType: 'detached' })).body
    expect(r2015).toMatchObject({ ok: false, reason: 'no-published-version' })
  })

  it('publishing makes the new version answer at once (the cache follows the generation)', async () => {
    expect((await c.post(`/api/rule-sets/${ruleSet2015}/publish`, { note: 'v1' })).status).toBe(201)
    const r = (await resolveQ({ countyFips: '53009', permitDate: '2024-05-01', buildingType: 'attached' })).body
    expect(r).toMatchObject({ ok: true, edition: { name: 'IECC 2015' }, zone: '5C', zoneMap: { id: mapNew }, ruleSetVersion: { number: 1 }, jurisdiction: { id: jurisdictionId, contactEmail: 'permits@cedarhollow.test' } })
    const set = await draftOf(c, ruleSet2015)
    const rules = structuredClone(set.draft)
    rules[1].logic = { '<=': [{ var: 'ach50' }, 2.5] }
    await c.request('PUT', `/api/rule-sets/${ruleSet2015}/draft`, { rules })
    expect((await c.post(`/api/rule-sets/${ruleSet2015}/publish`, { note: 'Local tightening' })).status).toBe(201)
    const after = (await resolveQ({ countyFips: '53009', permitDate: '2024-05-01', buildingType: 'attached' })).body
    expect(after.ruleSetVersion.number).toBe(2)
    expect(after.limits[0].logic).toEqual({ '<=': [{ var: 'ach50' }, 2.5] })
    // Each rule set answers with its own latest version (the 2012 table is still at version 1).
    expect((await resolveQ({ countyFips: '53009', permitDate: '2015-01-01', buildingType: 'detached' })).body.ruleSetVersion.number).toBe(1)
    const list = (await c.get('/api/rule-sets')).body as { id: number, latestVersion: number | null }[]
    expect([list.find(s => s.id === ruleSet2012)!.latestVersion, list.find(s => s.id === ruleSet2015)!.latestVersion]).toEqual([1, 2])
  })

  it('says why when no rule applies', async () => {
    const cases: [Record<string, string | number>, string][] = [
      [{ countyFips: '53033', permitDate: '2020-01-01', buildingType: 'detached' }, 'no-jurisdiction'],
      [{ countyFips: '53009', permitDate: '2013-12-31', buildingType: 'detached' }, 'no-edition'],
      [{ jurisdictionId, countyFips: '53033', permitDate: '2020-01-01', buildingType: 'detached' }, 'county-not-covered'],
      [{ jurisdictionId: 999999, permitDate: '2020-01-01', buildingType: 'detached' }, 'no-jurisdiction'],
    ]
    for (const [q, reason] of cases) {
      const r = await resolveQ(q)
      expect(r.status).toBe(200)
      expect(r.body, JSON.stringify(q)).toMatchObject({ ok: false, reason })
      expect(r.body.message).toBeTruthy()
    }
    const bad = await resolveQ({ countyFips: '53009', permitDate: '2020-13-01', buildingType: 'detached' })
    expect(bad.status).toBe(400)
    expect(bad.body.data.field).toBe('permitDate')
  })

  it('the demo scenario: Alder Valley (Kitsap 53035) uses the older map for IECC 2015 — 4C, not 5C', async () => {
    const r = (await resolveQ({ countyFips: '53035', permitDate: '2024-05-01', buildingType: 'detached' })).body
    // Kitsap WA 53035: 4C on the pre-2021 map, 5C on the 2021 map [README; both reference files].
    expect(r).toMatchObject({ ok: true, jurisdiction: { name: 'Alder Valley Building Department' }, edition: { name: 'IECC 2015' }, zone: '4C' })
    const denver = (await resolveQ({ countyFips: '08031', permitDate: '2012-03-01', buildingType: 'detached' })).body
    // Denver CO 08031 = 5B [README spot checks]; IECC 2009 402.4.2.1: less than 7 ACH50 [code-limits.csv, READ].
    expect(denver).toMatchObject({ ok: true, jurisdiction: { name: 'City of Juniper Flats' }, edition: { name: 'IECC 2009' }, zone: '5B' })
    expect(denver.limits[0].logic).toEqual({ '<': [{ var: 'ach50' }, 7] })
  })

  it('jurisdiction detail lists editions with dates, the zone map in use and the coverage', async () => {
    const d = (await c.get(`/api/jurisdictions/${jurisdictionId}`)).body
    expect(d.counties).toEqual([{ countyFips: '53009', countyName: 'Clallam', zone: '5C' }])
    expect(d.editions.map((e: { name: string, effectiveFrom: string, effectiveUntil: string | null, zoneMap: { id: number }, zoneMapIsOwn: boolean }) => [e.name, e.effectiveFrom, e.effectiveUntil, e.zoneMap.id, e.zoneMapIsOwn]))
      .toEqual([['IECC 2012', '2014-01-01', '2018-06-30', mapOld, true], ['IECC 2015', '2018-07-01', null, mapNew, false]])
    const del = await c.request('DELETE', `/api/zone-maps/${mapOld}`)
    expect(del.status).toBe(409)
    expect(del.body.message).toMatch(/in use/)
  })
})

describe('two server processes on one database', () => {
  let a: RunningServer
  let b: RunningServer
  beforeAll(async () => {
    a = await startBuiltServer()
    b = await startBuiltServer({ NUXT_DATABASE_URL: `file:${join(a.dataDir, 'tightwell.db')}` })
  })
  afterAll(async () => {
    await b?.stop()
    await a?.stop()
  })

  it('a version published through one process is what the other resolves on its next request', async () => {
    const onA = await signedIn('admin@tightwell.test', a.url)
    const onB = await signedIn('rater@tightwell.test', b.url)
    const q = '/api/rulebook/resolve?countyFips=53035&permitDate=2024-05-01&buildingType=detached'
    const before = (await onB.get(q)).body
    expect(before).toMatchObject({ ok: true, ruleSetVersion: { number: 1 } })
    const sets = (await onA.get('/api/rule-sets')).body as { id: number, name: string }[]
    const iecc2015 = sets.find(s => s.name === 'IECC 2015 air leakage (model)')!
    const set = (await onA.get(`/api/rule-sets/${iecc2015.id}`)).body
    const rules = structuredClone(set.draft)
    rules[1].logic = { '<=': [{ var: 'ach50' }, 2.5] }
    expect((await onA.request('PUT', `/api/rule-sets/${iecc2015.id}/draft`, { rules })).status).toBe(200)
    expect((await onA.post(`/api/rule-sets/${iecc2015.id}/publish`, { note: 'Tighter' })).status).toBe(201)
    const after = (await onB.get(q)).body
    expect(after.ruleSetVersion.number).toBe(2)
    expect(after.limits[0].logic).toEqual({ '<=': [{ var: 'ach50' }, 2.5] })
  })
})

describe('roles: raters and reviewers read; only admins write', () => {
  const writes: [string, string, unknown?][] = [
    ['POST', '/api/zone-maps', { name: 'X' }],
    ['PATCH', '/api/zone-maps/1', { name: 'X' }],
    ['DELETE', '/api/zone-maps/1'],
    ['PUT', '/api/zone-maps/1/counties/53035', { zone: '5C' }],
    ['DELETE', '/api/zone-maps/1/counties/53035'],
    ['POST', '/api/zone-maps/1/import', { mode: 'replace', csv: 'county_fips,zone\n53035,5C\n' }],
    ['POST', '/api/rule-sets', { name: 'X', code: 'X', edition: '1' }],
    ['POST', '/api/rule-sets/from-model', { file: 'iecc-2015.csv', name: 'X' }],
    ['PATCH', '/api/rule-sets/1', { name: 'X', code: 'X', edition: '1' }],
    ['PUT', '/api/rule-sets/1/draft', { rules: [] }],
    ['POST', '/api/rule-sets/1/publish', { note: 'x' }],
    ['POST', '/api/rule-sets/1/discard-draft'],
    ['POST', '/api/rule-sets/1/import', { mode: 'replace', csv: 'x' }],
    ['POST', '/api/jurisdictions', { name: 'X', kind: 'city', stateCode: 'WA' }],
    ['PATCH', '/api/jurisdictions/1', { name: 'X', kind: 'city', stateCode: 'WA' }],
    ['PUT', '/api/jurisdictions/1/coverage', { counties: [] }],
    ['POST', '/api/jurisdictions/1/editions', { name: 'X', ruleSetId: 1, effectiveFrom: '2030-01-01' }],
    ['PATCH', '/api/editions/1', { name: 'X', ruleSetId: 1, effectiveFrom: '2030-01-01' }],
    ['DELETE', '/api/editions/1'],
    ['GET', '/api/audit'],
  ]
  it.each(writes)('anonymous %s %s → 401', async (method, path, body) => {
    const res = await new Client().request(method, path, body)
    expect(res.status).toBe(401)
    expect(res.body.message).toBe('Sign in to continue.')
  })
  it.each(writes)('rater and reviewer %s %s → 403', async (method, path, body) => {
    for (const email of ['rater@tightwell.test', 'reviewer@tightwell.test']) {
      const c = await signedIn(email)
      const res = await c.request(method, path, body)
      expect(res.status, email).toBe(403)
      expect(res.body.message).toMatch(/admin role/)
    }
  })

  it('nothing changed after all those refused writes', async () => {
    const c = await signedIn('reviewer@tightwell.test')
    const sets = (await c.get('/api/rule-sets')).body as { id: number, latestVersion: number, draftRevision: number }[]
    expect(sets.find(s => s.id === 1)).toMatchObject({ latestVersion: 1, draftRevision: 1 })
    const jurisdictions = (await c.get('/api/jurisdictions')).body as { id: number, name: string }[]
    expect(jurisdictions.some(j => j.name === 'X')).toBe(false)
  })

  const reads = ['/api/zone-maps', '/api/zone-maps/1', '/api/zone-maps/1/counties', '/api/zone-maps/1/export', '/api/rule-sets', '/api/rule-sets/1', '/api/rule-sets/1/versions/1', '/api/rule-sets/1/export', '/api/rule-sets/models', '/api/jurisdictions', '/api/jurisdictions/1', '/api/rulebook/resolve?countyFips=53035&permitDate=2020-01-01&buildingType=detached']
  it.each(reads)('a rater reads %s; anonymous gets 401', async (path) => {
    const c = await signedIn('rater@tightwell.test')
    expect((await c.get(path)).status).toBe(200)
    expect((await new Client().get(path)).status).toBe(401)
  })
})
