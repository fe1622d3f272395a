import { beforeAll, describe, expect, inject, it } from 'vitest'
import { simpleParser } from 'mailparser'
import { PDFArray, PDFDocument, PDFRawStream, decodePDFRawStream } from 'pdf-lib'
import { Client, freshAddress } from '../support/http'
import { ALL_SAFETY, PDF, PNG, filedTest, oneReading, projectBody, settledMail, testBody } from '../support/filing'

// The whole flow through the API on the demo scenario (server/utils/seed.ts): City of Juniper Flats
// (Denver County CO 08031, zone 5B) adopted IECC 2015 from 2017-01-01, whose model table limits
// zone 5B to 3 ACH50 (IECC 2015 R402.4.1.2, rules/iecc-2015.csv [READ, secondary]).
// reviewer2@ reviews for Juniper Flats; reviewer@ for Alder Valley.

/** Readings of a gauge export (time, pressure, flow) — SYNTHETIC, on Q = C·ΔP^0.65 through ~1020 cfm at 50 Pa. */
const GAUGE_CSV = [
  'Time,Building pressure (Pa),Fan flow (cfm),Note',
  '10:01,-60.0,1149,',
  '10:02,-50.0,1020,',
  '',
  '10:03,-40.0,882,"steady, light wind"',
  '10:04,-30.0,731,',
  '10:05,-20.0,562,',
].join('\r\n')

/** The corrected file after the return: ~880 cfm at 50 Pa (2.93 ACH50 for 18 000 ft³). */
const CORRECTED_CSV = 'pressure_pa;flow_cfm\n-60;991\n-50;880\n-40;761\n-30;631\n-20;485\n'

const BAD_CSV = 'Pressure,Flow\n-50,1020\nabc,900\n-30,"3,5"\n-20,0\n'

let rater: Client
let reviewer: Client
let otherReviewer: Client
let admin: Client
let anonymous: Client

beforeAll(async () => {
  rater = new Client(undefined, freshAddress())
  reviewer = new Client(undefined, freshAddress())
  otherReviewer = new Client(undefined, freshAddress())
  admin = new Client(undefined, freshAddress())
  anonymous = new Client(undefined, freshAddress())
  await rater.signIn('rater@tightwell.test')
  await reviewer.signIn('reviewer2@tightwell.test')
  await otherReviewer.signIn('reviewer@tightwell.test')
  await admin.signIn('admin@tightwell.test')
})

describe('the whole flow: project → readings file → filing → return → revision → accept → certificate', () => {
  it('runs end to end with the right mail to the right people', async () => {
    // 1. The project; its county is checked against the postal code.
    const project = await rater.post('/api/projects', projectBody({ permitNumber: 'JF-FLOW-0001' }))
    expect(project.status).toBe(201)
    expect(project.body).toMatchObject({ countyFips: '08031', permitNumber: 'JF-FLOW-0001', tests: [], frozen: false })

    // 2. A final test without readings yet: no check.
    const test = await rater.post(`/api/projects/${project.body.id}/tests`, testBody({ statedCfm50: 1020, statedAch50: 3.4 }))
    expect(test.status).toBe(201)
    expect(test.body.check).toBeNull()
    const testId = test.body.id

    // 3. A bad file: every bad row listed with its line, nothing imported.
    const bad = await rater.upload(`/api/tests/${testId}/readings-file`, BAD_CSV, 'bad.csv', 'text/csv')
    expect(bad.status).toBe(201)
    expect(bad.body.preview.problems.map((p: { line: number }) => p.line)).toEqual([3, 4, 5])
    const badImport = await rater.post(`/api/tests/${testId}/readings-import`, { uploadId: bad.body.upload.id, pressureColumn: 0, flowColumn: 1, hasHeader: true })
    expect(badImport.status).toBe(400)
    expect(badImport.body.message).toBe('line 3, Pressure (column 1): "abc" is not a number (and 2 more; nothing was imported)')
    expect(badImport.body.data.problems).toEqual([
      { line: 3, column: 'Pressure (column 1)', reason: '"abc" is not a number' },
      { line: 4, column: 'Flow (column 2)', reason: '"3,5" uses a decimal comma; write it with a point (3.5)' },
      { line: 5, column: 'Flow (column 2)', reason: 'flow must be greater than zero' },
    ])
    expect((await rater.get(`/api/tests/${testId}`)).body.readings).toEqual([])

    // 4. The gauge file: mapping suggested from the header, previewed, then accepted.
    const file = await rater.upload(`/api/tests/${testId}/readings-file`, GAUGE_CSV, 'blower test 2024-09-10.csv', 'text/csv')
    expect(file.status).toBe(201)
    expect(file.body.upload).toMatchObject({ kind: 'readings', contentType: 'text/csv; charset=utf-8', name: 'blower test 2024-09-10.csv' })
    expect(file.body.mapping).toEqual({ pressureColumn: 1, flowColumn: 2, hasHeader: true, flipSign: false })
    expect(file.body.preview.problems).toEqual([])
    expect(file.body.preview.readings).toHaveLength(5)
    const imported = await rater.post(`/api/tests/${testId}/readings-import`, { uploadId: file.body.upload.id, ...file.body.mapping })
    expect(imported.status).toBe(200)
    expect(imported.body.readings).toEqual([
      { pressure: -60, flow: 1149 }, { pressure: -50, flow: 1020 }, { pressure: -40, flow: 882 }, { pressure: -30, flow: 731 }, { pressure: -20, flow: 562 },
    ])
    // 5 points on the power law through ~1020 cfm at 50 Pa → ~3.4 ACH50 > 3: does not comply (IECC 2015 R402.4.1.2).
    expect(imported.body.check.verdict).toBe('does-not-comply')
    expect(imported.body.check.metrics.cfm50).toBeGreaterThan(1010)
    expect(imported.body.check.metrics.cfm50).toBeLessThan(1030)
    expect(imported.body.check.ruleSetVersion.number).toBe(1)

    // 5. A photo and a signed report.
    expect((await rater.upload(`/api/tests/${testId}/uploads`, PNG, 'fan in door.png', 'image/png')).status).toBe(201)
    expect((await rater.upload(`/api/tests/${testId}/uploads`, PDF, 'signed report.pdf', 'application/pdf')).status).toBe(201)

    // 6. A draft the jurisdiction does not see; then filed.
    const draft = await rater.post(`/api/tests/${testId}/filing`, {})
    expect(draft.status).toBe(201)
    expect(draft.body).toMatchObject({ status: 'draft', revision: 0, can: { submit: true } })
    const filingId = draft.body.id
    expect((await reviewer.get(`/api/filings/${filingId}`)).status).toBe(404)
    const filed = await rater.post(`/api/filings/${filingId}/submit`, { note: 'Final test; photos attached.' })
    expect(filed.status).toBe(200)
    expect(filed.body).toMatchObject({ status: 'filed', revision: 1, version: 2 })
    expect(filed.body.snapshot.files.map((f: { name: string }) => f.name)).toEqual(['bad.csv', 'blower test 2024-09-10.csv', 'fan in door.png', 'signed report.pdf'])

    // 7. Frozen: the test, its files and the project refuse changes while filed.
    const frozen = await rater.patch(`/api/tests/${testId}`, testBody({ readings: oneReading(880) }))
    expect(frozen.status).toBe(409)
    expect(frozen.body.message).toContain('frozen while it is reviewed')
    expect((await rater.patch(`/api/projects/${project.body.id}`, projectBody())).status).toBe(409)
    expect((await rater.upload(`/api/tests/${testId}/uploads`, PNG, 'late.png')).status).toBe(409)

    // 8. The reviewer's queue shows it; another jurisdiction's reviewer does not see it.
    const queue = await reviewer.get('/api/filings?status=filed,refiled,in-review&sort=submittedAt&dir=desc')
    expect(queue.status).toBe(200)
    expect(queue.body.rows.map((r: { id: number }) => r.id)).toContain(filingId)
    expect((await otherReviewer.get(`/api/filings/${filingId}`)).status).toBe(404)
    expect((await otherReviewer.get('/api/filings')).body.rows.map((r: { id: number }) => r.id)).not.toContain(filingId)

    // 9. The filing page: stated values side by side with the recomputation under the rules in force on the permit date.
    const page = await reviewer.get(`/api/filings/${filingId}`)
    expect(page.status).toBe(200)
    expect(page.body.recheck.edition.name).toBe('IECC 2015')
    expect(page.body.recheck.ruleSetVersion.number).toBe(1)
    expect(page.body.recheck.zone).toBe('5B')
    expect(page.body.stated.map((s: { metric: string, differs: boolean }) => [s.metric, s.differs])).toEqual([['cfm50', false], ['ach50', false]])
    expect(page.body.can).toEqual({ submit: false, takeUp: true, decide: false, comment: true })

    // 10. Take up, then return — a reason is required.
    const takeUp = await reviewer.post(`/api/filings/${filingId}/take-up`, { version: page.body.version })
    expect(takeUp.body).toMatchObject({ status: 'in-review', reviewerName: 'Desmond Achterberg' })
    const noReason = await reviewer.post(`/api/filings/${filingId}/decision`, { decision: 'return', version: takeUp.body.version })
    expect(noReason.status).toBe(400)
    expect(noReason.body.data.field).toBe('reason')
    const returned = await reviewer.post(`/api/filings/${filingId}/decision`, { decision: 'return', reason: '3.4 ACH50 is over the 3.0 limit; seal and retest.', version: takeUp.body.version })
    expect(returned.status).toBe(200)
    expect(returned.body).toMatchObject({ status: 'returned', returnReason: '3.4 ACH50 is over the 3.0 limit; seal and retest.' })
    expect((await rater.post(`/api/filings/${filingId}/comments`, { body: 'Sealed the rim joists; new readings attached.' })).status).toBe(201)

    // 11. The rater revises: corrected readings (semicolon file), new stated values, filed again.
    const corrected = await rater.upload(`/api/tests/${testId}/readings-file`, CORRECTED_CSV, 'retest.csv', 'text/csv')
    expect(corrected.body.mapping).toEqual({ pressureColumn: 0, flowColumn: 1, hasHeader: true, flipSign: false })
    expect((await rater.post(`/api/tests/${testId}/readings-import`, { uploadId: corrected.body.upload.id, ...corrected.body.mapping })).status).toBe(200)
    const current = (await rater.get(`/api/tests/${testId}`)).body
    const revised = await rater.patch(`/api/tests/${testId}`, testBody({ readings: current.readings, statedCfm50: 880, statedAch50: 2.93, testedOn: '2024-09-24', safety: ALL_SAFETY }))
    expect(revised.status).toBe(200)
    expect(revised.body.check.verdict).toBe('complies')
    const refiled = await rater.post(`/api/filings/${filingId}/submit`, { note: 'Retested after sealing.' })
    expect(refiled.body).toMatchObject({ status: 'refiled', revision: 2 })

    // 12. The reviewer sees what changed between the revisions.
    const second = (await reviewer.get(`/api/filings/${filingId}`)).body
    const changed = second.revisions[1].changes.map((c: { label: string }) => c.label)
    expect(changed).toEqual(expect.arrayContaining(['Test date', 'Readings', 'Stated CFM50', 'Stated ACH50', 'Files', 'Note with the filing']))
    expect(second.revisions[1].changes.find((c: { label: string }) => c.label === 'Stated CFM50')).toMatchObject({ before: '1020', after: '880' })
    expect(second.comments.map((c: { body: string }) => c.body)).toEqual(['Sealed the rim joists; new readings attached.'])

    // 13. Accepted: a certificate with a verification code.
    const up2 = await reviewer.post(`/api/filings/${filingId}/take-up`, { version: second.version })
    const accepted = await reviewer.post(`/api/filings/${filingId}/decision`, { decision: 'accept', version: up2.body.version })
    expect(accepted.status).toBe(200)
    expect(accepted.body.status).toBe('accepted')
    const code: string = accepted.body.certificate.code
    expect(code).toMatch(/^[A-Z2-7]{16}$/)
    expect(accepted.body.transitions.map((t: { action: string, toState: string }) => `${t.action}:${t.toState}`)).toEqual([
      'submit:filed', 'take-up:in-review', 'return:returned', 'submit:refiled', 'take-up:in-review', 'accept:accepted',
    ])

    // 14. The mail went to the right people, each with a link to the filing.
    const mail = await settledMail(admin, filingId, 4)
    const kinds = mail.map(m => `${m.kind}→${m.to}`).sort()
    expect(kinds).toEqual([
      'filing-accepted→rater@tightwell.test',
      'filing-returned→rater@tightwell.test',
      'filing-submitted→reviewer2@tightwell.test',
      'filing-submitted→reviewer2@tightwell.test',
    ])
    for (const m of mail) {
      const parsed = await simpleParser(m.captured.raw)
      expect(m.captured.envelopeTo).toEqual([m.to])
      expect(parsed.subject).toBe(m.subject)
      expect(parsed.text).toContain(`/filings/${filingId}`)
    }
    const acceptedMail = await simpleParser(mail.find(m => m.kind === 'filing-accepted').captured.raw)
    expect(acceptedMail.text).toContain(`/verify/${code}`)
    const returnedMail = await simpleParser(mail.find(m => m.kind === 'filing-returned').captured.raw)
    expect(returnedMail.text).toContain('3.4 ACH50 is over the 3.0 limit')

    // 15. The certificate PDF parses and carries the code and the verify URL.
    const pdf = await rater.bytes(`/api/filings/${filingId}/certificate.pdf`)
    expect(pdf.status).toBe(200)
    expect(pdf.headers.get('content-type')).toBe('application/pdf')
    expect(pdf.headers.get('content-disposition')).toContain(`tightwell-certificate-${code}.pdf`)
    const doc = await PDFDocument.load(pdf.bytes)
    expect(doc.getPageCount()).toBe(1)
    expect(doc.getSubject()).toBe(code)
    expect(doc.getKeywords()).toContain(code)
    const text = pageText(doc)
    expect(text).toContain(`${inject('baseUrl')}/verify/${code}`)
    expect(text).toContain('JF-FLOW-0001')
    expect(text).toContain('IECC 2015 R402.4.1.2')

    // 16. Anyone can verify without signing in, and sees only four things.
    const verified = await anonymous.get(`/api/verify/${code}`)
    expect(verified.status).toBe(200)
    expect(Object.keys(verified.body).sort()).toEqual(['address', 'decisionDate', 'result', 'status'])
    expect(verified.body.status).toBe('accepted')
    expect(verified.body.address).toBe(`${project.body.addressLine}, Juniper Flats CO 80202`)
    expect(Object.keys(verified.body.result).sort()).toEqual(['ach50', 'cfm50'])
    expect(verified.body.result.ach50).toBeCloseTo(verified.body.result.cfm50 * 60 / 18000, 9)
    expect(verified.body.decisionDate).toMatch(/^\d{4}-\d{2}-\d{2}$/)
    expect((await anonymous.get(`/api/verify/${code.toLowerCase().replace(/(.{4})/g, '$1-').slice(0, -1)}`)).status).toBe(200)
    expect((await anonymous.get('/api/verify/AAAAAAAAAAAAAAAA')).status).toBe(404)
    expect((await anonymous.get('/api/verify/not-a-code')).status).toBe(404)
    const html = await fetch(`${inject('baseUrl')}/verify/${code}`, { redirect: 'manual' })
    expect(html.status).toBe(200)
    expect(await html.text()).toContain(project.body.addressLine)
  })
})

/** The text drawn on the first page: pdf-lib writes Helvetica text as hex strings in Flate streams. */
function pageText(doc: PDFDocument): string {
  const contents = doc.getPages()[0]!.node.Contents()
  const streams = contents instanceof PDFArray ? contents.asArray().map(ref => doc.context.lookup(ref)) : [contents]
  let text = ''
  for (const stream of streams) {
    if (!(stream instanceof PDFRawStream)) continue
    const decoded = new TextDecoder('latin1').decode(decodePDFRawStream(stream).decode())
    for (const m of decoded.matchAll(/<([0-9A-Fa-f]*)>\s*Tj/g)) text += `${Buffer.from(m[1]!, 'hex').toString('latin1')}\n`
  }
  return text
}

describe('two reviewers deciding at once', () => {
  it('the second gets 409, the first decision stands, and the second reviewer\'s reason is not written anywhere', async () => {
    const created = await admin.post('/api/users', { email: 'hazel.reviewer@tightwell.test', name: 'Hazel Quintero', role: 'reviewer', password: 'hazel-reviews-1234', jurisdictionId: (await reviewer.get('/api/auth/me')).body.user.jurisdictionId })
    expect(created.status).toBe(201)
    const second = new Client(undefined, freshAddress())
    await second.signIn('hazel.reviewer@tightwell.test', 'hazel-reviews-1234')
    const { filing } = await filedTest(rater, oneReading(850))
    const up = await reviewer.post(`/api/filings/${filing.id}/take-up`, { version: filing.version })
    expect(up.status).toBe(200)
    const [a, b] = await Promise.all([
      reviewer.post(`/api/filings/${filing.id}/decision`, { decision: 'accept', version: up.body.version }),
      second.post(`/api/filings/${filing.id}/decision`, { decision: 'return', reason: 'Second opinion: returning.', version: up.body.version }),
    ])
    expect([a.status, b.status].sort()).toEqual([200, 409])
    const loser = a.status === 409 ? a : b
    expect(loser.body.data).toMatchObject({ field: 'version' })
    const after = (await admin.get(`/api/filings/${filing.id}`)).body
    const winner = a.status === 200 ? 'accepted' : 'returned'
    expect(after.status).toBe(winner)
    expect(after.transitions.filter((t: { action: string }) => t.action === 'accept' || t.action === 'return')).toHaveLength(1)
    expect(after.certificate === null).toBe(winner === 'returned')
    // A stale version is refused the same way, without a race.
    const stale = await reviewer.post(`/api/filings/${filing.id}/decision`, { decision: 'accept', version: up.body.version })
    expect(stale.status).toBe(409)
  })

  it('a reviewer cannot decide a filing they filed (a rater who became a reviewer)', async () => {
    await admin.post('/api/users', { email: 'ivo.rater@tightwell.test', name: 'Ivo Marchetti', role: 'rater', password: 'ivo-rates-houses-1' })
    const ivo = new Client(undefined, freshAddress())
    await ivo.signIn('ivo.rater@tightwell.test', 'ivo-rates-houses-1')
    const { filing } = await filedTest(ivo, oneReading(800))
    const people = (await admin.get('/api/users')).body as { id: number, email: string }[]
    const ivoId = people.find(p => p.email === 'ivo.rater@tightwell.test')!.id
    const juniper = (await reviewer.get('/api/auth/me')).body.user.jurisdictionId
    expect((await admin.post(`/api/users/${ivoId}/role`, { role: 'reviewer', jurisdictionId: juniper })).status).toBe(200)
    const own = await ivo.get(`/api/filings/${filing.id}`)
    expect(own.status).toBe(200)
    expect(own.body.can.takeUp).toBe(false)
    const refused = await ivo.post(`/api/filings/${filing.id}/take-up`, { version: own.body.version })
    expect(refused.status).toBe(403)
    expect(refused.body.message).toContain('another plan reviewer')
  })
})

describe('the queue: server-side sort, filters, search, pages', () => {
  it('sorts and filters in SQL and answers 400 for a bad filter', async () => {
    const { filing } = await filedTest(rater, oneReading(1500), { project: { permitNumber: 'JF-QUEUE-LOUD' } })
    const all = await reviewer.get('/api/filings?pageSize=2&page=1&facets=1')
    expect(all.status).toBe(200)
    expect(all.body.rows).toHaveLength(2)
    expect(all.body.total).toBeGreaterThanOrEqual(3)
    expect(all.body.zones).toEqual(['5B'])
    expect(all.body.raters.map((r: { name: string }) => r.name)).toContain('Tobias Wren')
    expect(all.headers.get('server-timing')).toMatch(/^queue;dur=\d/)

    const byAch = (await reviewer.get('/api/filings?sort=ach50&dir=desc&pageSize=100')).body.rows as { ach50: number }[]
    expect(byAch.map(r => r.ach50)).toEqual([...byAch.map(r => r.ach50)].sort((x, y) => y - x))

    const failing = (await reviewer.get('/api/filings?verdict=does-not-comply&pageSize=100')).body.rows as { id: number, verdict: string }[]
    expect(failing.every(r => r.verdict === 'does-not-comply')).toBe(true)
    expect(failing.map(r => r.id)).toContain(filing.id)

    const searched = (await reviewer.get('/api/filings?q=QUEUE-LOUD')).body
    expect(searched.total).toBe(1)
    expect(searched.rows[0].id).toBe(filing.id)
    expect((await reviewer.get('/api/filings?q=100%25_')).body.total).toBe(0)
    // Any part of the text, in any case, as LIKE '%…%' finds it (through the trigram index).
    const ids = async (q: string) => ((await reviewer.get(`/api/filings?q=${encodeURIComponent(q)}&pageSize=100`)).body.rows as { id: number }[]).map(r => r.id)
    expect(await ids('ueue-lo')).toEqual([filing.id])
    expect(await ids('jf-queue-loud')).toEqual([filing.id])
    // The index's own syntax is just text here: quotes, operators, stars, columns → no error, no match.
    for (const q of ['"', 'QUEUE" OR "x', 'LOUD*', 'NEAR(a b)', 'permit_number:JF', '+QUEUE', 'AND']) {
      const res = await reviewer.get(`/api/filings?q=${encodeURIComponent(q)}`)
      expect(res.status, q).toBe(200)
      expect(res.body.rows.map((r: { id: number }) => r.id), q).not.toContain(filing.id)
    }
    // Shorter than a trigram: still found (by a scan).
    expect((await ids('JF')).length).toBeGreaterThan(0)

    const bad = await reviewer.get('/api/filings?status=lost')
    expect(bad.status).toBe(400)
    expect(bad.body.data.field).toBe('status.0')
    expect((await reviewer.get('/api/filings?pageSize=1000')).body.data.field).toBe('pageSize')
    expect((await reviewer.get('/api/filings?sort=password')).body.data.field).toBe('sort')
  })

  it('the demo filing waits in the demo reviewer\'s queue', async () => {
    const demo = (await reviewer.get('/api/filings?q=Quillback')).body
    expect(demo.rows[0]).toMatchObject({ addressLine: '1187 Quillback Lane', permitNumber: 'JF-2025-04417', stage: 'final', zone: '5B' })
  })
})
