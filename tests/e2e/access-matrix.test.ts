import { beforeAll, describe, expect, it } from 'vitest'
import { Client, freshAddress } from '../support/http'
import { PNG, filedTest, oneReading, projectBody, settledMail, testBody } from '../support/filing'

// Who may do what (README "API"): anonymous → 401; a role the route does not serve → 403; a row
// you may not see (another rater's, another jurisdiction's, a draft for a reviewer) → 404.
// Actors: the owning rater, another rater, the filing jurisdiction's reviewer (Juniper Flats),
// a reviewer of another jurisdiction (Alder Valley), an admin, and nobody signed in.
type Actor = 'anonymous' | 'admin' | 'owner' | 'otherRater' | 'reviewer' | 'otherReviewer'
const ACTORS: Actor[] = ['anonymous', 'admin', 'owner', 'otherRater', 'reviewer', 'otherReviewer']
const clients = {} as Record<Actor, Client>

let f: { projectId: number, testId: number, uploadId: number, filingId: number, version: number, draftFilingId: number, acceptedFilingId: number, code: string, draftUploadId: number, mailId: number }

beforeAll(async () => {
  for (const a of ACTORS) clients[a] = new Client(undefined, freshAddress())
  await clients.admin.signIn('admin@tightwell.test')
  await clients.owner.signIn('rater@tightwell.test')
  await clients.otherRater.signIn('rater2@tightwell.test')
  await clients.reviewer.signIn('reviewer2@tightwell.test')
  await clients.otherReviewer.signIn('reviewer@tightwell.test')

  const owner = clients.owner
  const project = await owner.post('/api/projects', projectBody())
  const test = await owner.post(`/api/projects/${project.body.id}/tests`, testBody({ readings: oneReading(850) }))
  const upload = await owner.upload(`/api/tests/${test.body.id}/uploads`, PNG, 'door.png', 'image/png')
  const filing = await owner.post(`/api/tests/${test.body.id}/filing`, {})
  const filed = await owner.post(`/api/filings/${filing.body.id}/submit`, {})
  const draft = await filedTest(owner, oneReading(800), { draft: true })
  const draftUpload = await owner.upload(`/api/tests/${draft.test.id}/uploads`, PNG, 'draft.png', 'image/png')
  const accepted = await filedTest(owner, oneReading(820))
  const up = await clients.reviewer.post(`/api/filings/${accepted.filing.id}/take-up`, { version: accepted.filing.version })
  const decided = await clients.reviewer.post(`/api/filings/${accepted.filing.id}/decision`, { decision: 'accept', version: up.body.version })
  const mail = await settledMail(clients.admin, accepted.filing.id, 2)
  f = {
    projectId: project.body.id, testId: test.body.id, uploadId: upload.body.id, filingId: filed.body.id, version: filed.body.version,
    draftFilingId: draft.filing.id, draftUploadId: draftUpload.body.id, acceptedFilingId: accepted.filing.id, code: decided.body.certificate.code, mailId: mail[0].id,
  }
})

interface Route {
  name: string
  call: (c: Client) => Promise<{ status: number }>
  expect: Record<Actor, number>
}

const r = (anonymous: number, admin: number, owner: number, otherRater: number, reviewer: number, otherReviewer: number): Record<Actor, number> =>
  ({ anonymous, admin, owner, otherRater, reviewer, otherReviewer })

// Mutating calls use bodies that cannot change the shared fixture for the actors allowed past the
// checks: frozen records (409), stale versions (409), or harmless additions (a comment, a project).
const ROUTES: Route[] = [
  { name: 'GET /api/projects', call: c => c.get('/api/projects'), expect: r(401, 200, 200, 200, 403, 403) },
  { name: 'POST /api/projects', call: c => c.post('/api/projects', projectBody()), expect: r(401, 403, 201, 201, 403, 403) },
  { name: 'GET /api/projects/:id', call: c => c.get(`/api/projects/${f.projectId}`), expect: r(401, 200, 200, 404, 403, 403) },
  { name: 'PATCH /api/projects/:id (frozen by its filing)', call: c => c.patch(`/api/projects/${f.projectId}`, projectBody()), expect: r(401, 403, 409, 404, 403, 403) },
  { name: 'POST /api/projects/:id/tests', call: c => c.post(`/api/projects/${f.projectId}/tests`, testBody()), expect: r(401, 403, 201, 404, 403, 403) },
  { name: 'GET /api/tests/:id', call: c => c.get(`/api/tests/${f.testId}`), expect: r(401, 200, 200, 404, 403, 403) },
  { name: 'PATCH /api/tests/:id (frozen)', call: c => c.patch(`/api/tests/${f.testId}`, testBody()), expect: r(401, 403, 409, 404, 403, 403) },
  { name: 'DELETE /api/tests/:id (filed)', call: c => c.delete(`/api/tests/${f.testId}`), expect: r(401, 403, 409, 404, 403, 403) },
  { name: 'POST /api/tests/:id/readings-file (frozen)', call: c => c.upload(`/api/tests/${f.testId}/readings-file`, 'P,Q\n-50,900\n', 'r.csv', 'text/csv'), expect: r(401, 403, 409, 404, 403, 403) },
  { name: 'POST /api/tests/:id/readings-import (frozen)', call: c => c.post(`/api/tests/${f.testId}/readings-import`, { uploadId: f.uploadId, pressureColumn: 0, flowColumn: 1, hasHeader: true }), expect: r(401, 403, 409, 404, 403, 403) },
  { name: 'POST /api/tests/:id/uploads (frozen)', call: c => c.upload(`/api/tests/${f.testId}/uploads`, PNG, 'x.png', 'image/png'), expect: r(401, 403, 409, 404, 403, 403) },
  { name: 'POST /api/tests/:id/filing (already filed)', call: c => c.post(`/api/tests/${f.testId}/filing`, {}), expect: r(401, 403, 409, 404, 403, 403) },
  { name: 'GET /api/uploads/:id (filed)', call: c => c.get(`/api/uploads/${f.uploadId}`), expect: r(401, 200, 200, 404, 200, 404) },
  { name: 'GET /api/uploads/:id (draft)', call: c => c.get(`/api/uploads/${f.draftUploadId}`), expect: r(401, 200, 200, 404, 404, 404) },
  { name: 'DELETE /api/uploads/:id (frozen)', call: c => c.delete(`/api/uploads/${f.uploadId}`), expect: r(401, 403, 409, 404, 403, 403) },
  { name: 'GET /api/filings', call: c => c.get('/api/filings'), expect: r(401, 200, 200, 200, 200, 200) },
  { name: 'GET /api/filings/summary', call: c => c.get('/api/filings/summary'), expect: r(401, 200, 200, 200, 200, 200) },
  { name: 'GET /api/filings/:id', call: c => c.get(`/api/filings/${f.filingId}`), expect: r(401, 200, 200, 404, 200, 404) },
  { name: 'GET /api/filings/:id (draft)', call: c => c.get(`/api/filings/${f.draftFilingId}`), expect: r(401, 200, 200, 404, 404, 404) },
  { name: 'POST /api/filings/:id/submit (already filed)', call: c => c.post(`/api/filings/${f.filingId}/submit`, {}), expect: r(401, 403, 409, 404, 403, 403) },
  { name: 'POST /api/filings/:id/take-up (stale version)', call: c => c.post(`/api/filings/${f.filingId}/take-up`, { version: 999 }), expect: r(401, 403, 403, 403, 409, 404) },
  { name: 'POST /api/filings/:id/decision (not in review)', call: c => c.post(`/api/filings/${f.filingId}/decision`, { decision: 'accept', version: f.version }), expect: r(401, 403, 403, 403, 409, 404) },
  { name: 'POST /api/filings/:id/comments', call: c => c.post(`/api/filings/${f.filingId}/comments`, { body: 'Matrix comment.' }), expect: r(401, 201, 201, 404, 201, 404) },
  { name: 'POST /api/filings/:id/comments (draft)', call: c => c.post(`/api/filings/${f.draftFilingId}/comments`, { body: 'Matrix comment.' }), expect: r(401, 201, 201, 404, 404, 404) },
  { name: 'GET /api/filings/:id/certificate (not accepted)', call: c => c.get(`/api/filings/${f.filingId}/certificate`), expect: r(401, 404, 404, 404, 404, 404) },
  { name: 'GET /api/filings/:id/certificate (accepted)', call: c => c.get(`/api/filings/${f.acceptedFilingId}/certificate`), expect: r(401, 200, 200, 404, 200, 404) },
  { name: 'GET /api/filings/:id/certificate.pdf (accepted)', call: c => c.get(`/api/filings/${f.acceptedFilingId}/certificate.pdf`), expect: r(401, 200, 200, 404, 200, 404) },
  { name: 'GET /api/verify/:code (public)', call: c => c.get(`/api/verify/${f.code}`), expect: r(200, 200, 200, 200, 200, 200) },
  { name: 'GET /api/outbox', call: c => c.get('/api/outbox'), expect: r(401, 200, 403, 403, 403, 403) },
  { name: 'POST /api/outbox/:id/retry (already sent)', call: c => c.post(`/api/outbox/${f.mailId}/retry`, {}), expect: r(401, 404, 403, 403, 403, 403) },
]

describe('access matrix: every filing, project and upload route × every kind of user', () => {
  for (const route of ROUTES) {
    it(route.name, async () => {
      const got = {} as Record<Actor, number>
      for (const a of ACTORS) got[a] = (await route.call(clients[a])).status
      expect(got).toEqual(route.expect)
    })
  }

  it('lists are scoped: nobody sees another rater\'s or another jurisdiction\'s filings', async () => {
    const ids = async (c: Client) => ((await c.get('/api/filings?pageSize=100')).body.rows as { id: number }[]).map(x => x.id)
    expect(await ids(clients.owner)).toEqual(expect.arrayContaining([f.filingId, f.draftFilingId]))
    expect(await ids(clients.reviewer)).toContain(f.filingId)
    expect(await ids(clients.reviewer)).not.toContain(f.draftFilingId)
    expect(await ids(clients.otherRater)).not.toContain(f.filingId)
    expect(await ids(clients.otherReviewer)).not.toContain(f.filingId)
    const projects = ((await clients.otherRater.get('/api/projects')).body as { id: number }[]).map(p => p.id)
    expect(projects).not.toContain(f.projectId)
  })

  it('bad ids answer 400 naming the field, before any lookup', async () => {
    for (const path of ['/api/projects/abc', '/api/tests/-1', '/api/filings/1.5', '/api/uploads/0']) {
      const res = await clients.owner.get(path)
      expect(res.status, path).toBe(400)
      expect(res.body.data.field).toBe('id')
    }
  })
})
