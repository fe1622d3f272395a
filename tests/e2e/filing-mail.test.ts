import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { Client, freshAddress } from '../support/http'
import { filedTest, oneReading } from '../support/filing'
import { startBuiltServer, type RunningServer } from '../support/server'

// A failed send never loses the decision: the notice waits in the outbox and is retried.
// This server's capture SMTP server refuses its first 3 messages (451), and retries come fast.
let server: RunningServer
beforeAll(async () => {
  server = await startBuiltServer({ TIGHTWELL_MAIL_CAPTURE_REJECT: '3', TIGHTWELL_MAIL_RETRY_SECONDS: '0.3', TIGHTWELL_MAIL_POLL_MS: '100' })
})
afterAll(async () => { await server?.stop() })

describe('mail queue with retry', () => {
  it('decisions stand while sending fails; the notices go out on a later attempt', async () => {
    const rater = new Client(server.url, freshAddress())
    const reviewer = new Client(server.url, freshAddress())
    const admin = new Client(server.url, freshAddress())
    await rater.signIn('rater@tightwell.test')
    await reviewer.signIn('reviewer2@tightwell.test')
    await admin.signIn('admin@tightwell.test')

    const { filing } = await filedTest(rater, oneReading(870))
    expect(filing.status).toBe('filed')
    const up = await reviewer.post(`/api/filings/${filing.id}/take-up`, { version: filing.version })
    const decided = await reviewer.post(`/api/filings/${filing.id}/decision`, { decision: 'return', reason: 'Attach the signed report.', version: up.body.version })
    expect(decided.status).toBe(200)
    expect(decided.body.status).toBe('returned')

    // Some attempts were refused (the seeded demo notice takes the first refusal at start)…
    let rows: any[] = []
    const until = Date.now() + 20_000
    while (Date.now() < until) {
      rows = (await admin.get('/api/outbox')).body
      if (rows.length >= 3 && rows.every(r => r.status === 'sent')) break
      await new Promise(r => setTimeout(r, 150))
    }
    // …and every notice went out in the end, each once, with the refusals on record.
    expect(rows.map(r => r.status)).toEqual(['sent', 'sent', 'sent'])
    const retried = rows.filter(r => r.attempts > 1)
    expect(retried.length).toBeGreaterThanOrEqual(1)
    expect(rows.reduce((n, r) => n + r.attempts - 1, 0)).toBe(3)
    expect(rows.filter(r => r.filingId === filing.id).map(r => r.kind).sort()).toEqual(['filing-returned', 'filing-submitted'])
    expect(rows.every(r => r.captured !== null)).toBe(true)
    // The decision was never undone.
    expect((await rater.get(`/api/filings/${filing.id}`)).body.status).toBe('returned')
  })
})

describe('a notice that failed for good', () => {
  // Each send is tried once here, and the capture server refuses the first 2 messages: the demo
  // notice queued at start and the next one fail for good.
  let failing: RunningServer
  beforeAll(async () => {
    failing = await startBuiltServer({ TIGHTWELL_MAIL_CAPTURE_REJECT: '2', TIGHTWELL_MAIL_MAX_ATTEMPTS: '1', TIGHTWELL_MAIL_RETRY_SECONDS: '0.3', TIGHTWELL_MAIL_POLL_MS: '100' })
  })
  afterAll(async () => { await failing?.stop() })

  it('an admin corrects the address and sends it again; bad input is a 400, a sent notice a 404', async () => {
    const rater = new Client(failing.url, freshAddress())
    const admin = new Client(failing.url, freshAddress())
    await rater.signIn('rater@tightwell.test')
    await admin.signIn('admin@tightwell.test')
    const { filing } = await filedTest(rater, oneReading(870))
    const outbox = async () => (await admin.get('/api/outbox')).body as { id: number, status: string, to: string, filingId: number | null, captured: { envelopeTo: string[] } | null }[]
    let notice: Awaited<ReturnType<typeof outbox>>[number] | undefined
    const until = Date.now() + 20_000
    while (Date.now() < until) {
      notice = (await outbox()).find(r => r.filingId === filing.id)
      if (notice?.status === 'failed') break
      await new Promise(r => setTimeout(r, 150))
    }
    expect(notice?.status).toBe('failed')

    const bad = await admin.post(`/api/outbox/${notice!.id}/retry`, { to: 'not an address' })
    expect(bad.status).toBe(400)
    expect(bad.body.data.field).toBe('to')
    expect((await rater.post(`/api/outbox/${notice!.id}/retry`, {})).status).toBe(403)

    expect((await admin.post(`/api/outbox/${notice!.id}/retry`, { to: 'permits-desk@juniperflats.test' })).status).toBe(200)
    let sent: typeof notice
    const until2 = Date.now() + 20_000
    while (Date.now() < until2) {
      sent = (await outbox()).find(r => r.id === notice!.id)
      if (sent?.status === 'sent' && sent.captured) break
      await new Promise(r => setTimeout(r, 150))
    }
    expect(sent).toMatchObject({ status: 'sent', to: 'permits-desk@juniperflats.test' })
    expect(sent!.captured!.envelopeTo).toEqual(['permits-desk@juniperflats.test'])
    expect((await admin.post(`/api/outbox/${notice!.id}/retry`, {})).status).toBe(404)
  })
})
