import { Client } from './http'

/**
 * Fixtures of the filing tests: invented addresses in the demo City of Juniper Flats (Denver
 * County CO 08031, zone 5B, IECC 2015 from 2017-01-01 — server/utils/seed.ts) and small files.
 */
let street = 100
export function projectBody(overrides: Record<string, unknown> = {}) {
  street += 1
  return {
    address: { line1: `${street} Thimbleberry Way`, city: 'Juniper Flats', state: 'CO', postalCode: '80202', countyFips: '08031' },
    permitNumber: `JF-T-${street}`,
    permitDate: '2024-04-01',
    builderCompany: 'Larchmont Framing Co.',
    builderContact: 'Wendell Ashby',
    buildingType: 'detached',
    units: 'ip',
    building: { volume: 18000, floorArea: 2000, enclosureArea: 4340, height: 18 },
    notes: '',
    ...overrides,
  }
}

export const ALL_SAFETY = ['combustion', 'fire', 'dust', 'people', 'openings']

export function testBody(overrides: Record<string, unknown> = {}) {
  return {
    testedOn: '2024-09-10',
    stage: 'final',
    tester: 'Tobias Wren',
    equipment: 'Blower fan ring B; digital manometer calibrated 2024-02-01',
    wind: 'calm',
    insideTemperature: 70,
    outsideTemperature: 70,
    direction: 'depressurization',
    readings: [],
    safety: ALL_SAFETY,
    notes: '',
    ...overrides,
  }
}

/** One reading at 50 Pa: CFM50 = the flow; volume 18 000 ft³ → ACH50 = flow × 60 / 18 000. */
export function oneReading(flow: number) {
  return [{ pressure: -50, flow }]
}

// 1×1 PNG (a valid image), a JPEG start and end, a tiny PDF.
export const PNG = Uint8Array.from(Buffer.from('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNkYPhfDwAChwGA60e6kgAAAABJRU5ErkJggg==', 'base64'))
export const JPEG = Uint8Array.from([0xFF, 0xD8, 0xFF, 0xE0, 0x00, 0x10, 0x4A, 0x46, 0x49, 0x46, 0x00, 0x01, 0x01, 0x00, 0x00, 0x01, 0x00, 0x01, 0x00, 0x00, 0xFF, 0xD9])
export const PDF = new TextEncoder().encode('%PDF-1.4\n1 0 obj << /Type /Catalog >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n')

/** A rater's project with one test of the given readings, filed (and submitted unless `draft`). */
export async function filedTest(rater: Client, readings: { pressure: number, flow: number }[], opts: { draft?: boolean, project?: Record<string, unknown>, test?: Record<string, unknown> } = {}) {
  const project = await rater.post('/api/projects', projectBody(opts.project))
  if (project.status !== 201) throw new Error(`project: ${project.status} ${project.text}`)
  const test = await rater.post(`/api/projects/${project.body.id}/tests`, testBody({ readings, ...opts.test }))
  if (test.status !== 201) throw new Error(`test: ${test.status} ${test.text}`)
  const filing = await rater.post(`/api/tests/${test.body.id}/filing`, {})
  if (filing.status !== 201) throw new Error(`filing: ${filing.status} ${filing.text}`)
  if (opts.draft) return { project: project.body, test: test.body, filing: filing.body }
  const submitted = await rater.post(`/api/filings/${filing.body.id}/submit`, { note: 'Filed by a test.' })
  if (submitted.status !== 200) throw new Error(`submit: ${submitted.status} ${submitted.text}`)
  return { project: project.body, test: test.body, filing: submitted.body }
}

/** Waits until every outbox row of a filing has left the queue (sent or failed). */
export async function settledMail(admin: Client, filingId: number, count: number, timeoutMs = 20_000) {
  const until = Date.now() + timeoutMs
  let rows: any[] = []
  while (Date.now() < until) {
    const res = await admin.get('/api/outbox?limit=500')
    rows = (res.body as any[]).filter(r => r.filingId === filingId)
    if (rows.length >= count && rows.every(r => r.status === 'sent' && r.captured)) return rows
    await new Promise(r => setTimeout(r, 200))
  }
  throw new Error(`mail of filing ${filingId} did not settle: ${JSON.stringify(rows.map(r => ({ kind: r.kind, status: r.status, err: r.lastError })))}`)
}
