import { describe, expect, it } from 'vitest'
import { Client, freshAddress } from '../support/http'

const DEMO = ['admin', 'rater', 'rater2', 'reviewer', 'reviewer2'].map(n => `${n}@tightwell.test`)

/** Every string value anywhere in a JSON body, to prove no route hands out a password hash. */
function leaksHash(body: unknown): boolean {
  return JSON.stringify(body ?? '').includes('$scrypt$') || /passwordHash|password_hash/.test(JSON.stringify(body ?? ''))
}

describe('sign-in and sessions', () => {
  it.each(DEMO)('demo account %s signs in and reads its own session', async (email) => {
    const c = new Client(undefined, freshAddress())
    const res = await c.signIn(email)
    expect(res.body.user.email).toBe(email)
    expect(leaksHash(res.body)).toBe(false)
    const me = await c.get('/api/auth/me')
    expect(me.status).toBe(200)
    expect(me.body.user.email).toBe(email)
  })

  it('e-mail is case-insensitive', async () => {
    const c = new Client(undefined, freshAddress())
    const res = await c.post('/api/auth/sign-in', { email: '  Rater@Tightwell.TEST ', password: 'tightwell-demo' })
    expect(res.status).toBe(200)
    expect(res.body.user.email).toBe('rater@tightwell.test')
  })

  it('a wrong password and an unknown e-mail get the same generic answer', async () => {
    const c = new Client(undefined, freshAddress())
    const wrong = await c.post('/api/auth/sign-in', { email: 'rater@tightwell.test', password: 'not-the-password' })
    const unknown = await c.post('/api/auth/sign-in', { email: 'nobody@tightwell.test', password: 'not-the-password' })
    expect(wrong.status).toBe(401)
    expect(unknown.status).toBe(401)
    expect(wrong.body.message).toBe(unknown.body.message)
  })

  it('sign-out ends the session', async () => {
    const c = new Client(undefined, freshAddress())
    await c.signIn('rater@tightwell.test')
    const cookie = c.cookie
    expect((await c.post('/api/auth/sign-out')).status).toBe(200)
    expect((await c.get('/api/auth/me')).status).toBe(401)
    // The sealed cookie only holds identity; the server still answers for a replayed one, so
    // deactivation (below) is what truly ends access. Here we check the browser's cookie was cleared.
    expect(c.cookie).not.toBe(cookie)
  })
})

describe('sign-in limit', () => {
  it('the 11th wrong password for one e-mail answers 429 with Retry-After, even with the right password', async () => {
    // A throwaway account: the server is shared by every e2e file, so no demo account gets locked.
    const admin = new Client(undefined, freshAddress())
    await admin.signIn('admin@tightwell.test')
    const email = 'locked.out@tightwell.test'
    expect((await admin.post('/api/users', { email, name: 'Ottilie Marchbank', role: 'rater', password: 'tightwell-demo' })).status).toBe(201)
    for (let i = 0; i < 10; i++) {
      // A new client address each time: the per-e-mail limit alone must trigger.
      const res = await new Client(undefined, freshAddress()).post('/api/auth/sign-in', { email, password: `wrong-${i}` })
      expect(res.status).toBe(401)
    }
    const blocked = await new Client(undefined, freshAddress()).post('/api/auth/sign-in', { email, password: 'tightwell-demo' })
    expect(blocked.status).toBe(429)
    const retry = Number(blocked.headers.get('retry-after'))
    expect(retry).toBeGreaterThan(0)
    expect(retry).toBeLessThanOrEqual(15 * 60)
    expect(blocked.body.message).toMatch(/Too many failed sign-in attempts/)
  })

  it('an unknown e-mail is limited the same way, so the limit does not reveal which accounts exist', async () => {
    const email = 'ghost@tightwell.test'
    for (let i = 0; i < 10; i++) {
      await new Client(undefined, freshAddress()).post('/api/auth/sign-in', { email, password: `wrong-${i}` })
    }
    const blocked = await new Client(undefined, freshAddress()).post('/api/auth/sign-in', { email, password: 'whatever-here' })
    expect(blocked.status).toBe(429)
    expect(blocked.headers.get('retry-after')).toBeTruthy()
  })

  it('one client address is limited across e-mails (50 per 15 minutes)', async () => {
    const address = '203.0.113.77'
    for (let i = 0; i < 50; i++) {
      const res = await new Client(undefined, address).post('/api/auth/sign-in', { email: `spray${i}@tightwell.test`, password: 'wrong-password' })
      expect(res.status).toBe(401)
    }
    const blocked = await new Client(undefined, address).post('/api/auth/sign-in', { email: 'admin@tightwell.test', password: 'tightwell-demo' })
    expect(blocked.status).toBe(429)
  })
})

describe('roles and access', () => {
  const adminOnly: [string, string, unknown?][] = [
    ['GET', '/api/users'],
    ['POST', '/api/users', { email: 'x@tightwell.test', name: 'X', role: 'rater', password: 'long-enough-password' }],
    ['POST', '/api/users/1/role', { role: 'rater' }],
    ['POST', '/api/users/2/deactivate'],
    ['POST', '/api/users/2/reactivate'],
  ]

  it.each(adminOnly)('anonymous %s %s → 401', async (method, path, body) => {
    const res = await new Client().request(method, path, body)
    expect(res.status).toBe(401)
    expect(res.body.message).toBe('Sign in to continue.')
  })

  it.each(adminOnly)('a rater %s %s → 403', async (method, path, body) => {
    const c = new Client(undefined, freshAddress())
    await c.signIn('rater@tightwell.test')
    const res = await c.request(method, path, body)
    expect(res.status).toBe(403)
    expect(res.body.message).toMatch(/admin role/)
  })

  it.each(['/api/auth/me', '/api/jurisdictions'])('anonymous GET %s → 401', async (path) => {
    expect((await new Client().get(path)).status).toBe(401)
  })

  it('an admin creates a reviewer who signs in; deactivating ends the reviewer\'s live session; reactivating restores sign-in', async () => {
    const admin = new Client(undefined, freshAddress())
    await admin.signIn('admin@tightwell.test')
    const jurisdictions = (await admin.get('/api/jurisdictions')).body
    const created = await admin.post('/api/users', {
      email: 'New.Reviewer@Tightwell.test', name: 'Rosalind Varga', role: 'reviewer', password: 'a-long-first-password', jurisdictionId: jurisdictions[0].id,
    })
    expect(created.status).toBe(201)
    expect(created.body.email).toBe('new.reviewer@tightwell.test')
    expect(leaksHash(created.body)).toBe(false)

    const dup = await admin.post('/api/users', { email: 'NEW.reviewer@tightwell.test', name: 'Dup', role: 'rater', password: 'a-long-first-password' })
    expect(dup.status).toBe(409)

    const reviewer = new Client(undefined, freshAddress())
    await reviewer.signIn('new.reviewer@tightwell.test', 'a-long-first-password')
    expect((await reviewer.get('/api/auth/me')).status).toBe(200)

    const off = await admin.post(`/api/users/${created.body.id}/deactivate`)
    expect(off.status).toBe(200)
    expect(off.body.active).toBe(false)
    // The reviewer's cookie is still sealed and valid, but the user row now says no.
    const stale = new Client(undefined, freshAddress())
    stale.cookie = reviewer.cookie
    // The page-side session endpoint checks the row too.
    expect((await stale.get('/api/_auth/session')).status).toBe(401)
    const after = await reviewer.get('/api/auth/me')
    expect(after.status).toBe(401)
    expect(after.body.message).toMatch(/session has ended/)
    const again = await new Client(undefined, freshAddress()).post('/api/auth/sign-in', { email: 'new.reviewer@tightwell.test', password: 'a-long-first-password' })
    expect(again.status).toBe(401)

    expect((await admin.post(`/api/users/${created.body.id}/reactivate`)).body.active).toBe(true)
    await new Client(undefined, freshAddress()).signIn('new.reviewer@tightwell.test', 'a-long-first-password')
  })

  it('a role change applies on the next request of a live session', async () => {
    const admin = new Client(undefined, freshAddress())
    await admin.signIn('admin@tightwell.test')
    const made = await admin.post('/api/users', { email: 'shifty@tightwell.test', name: 'Otto Brannigan', role: 'admin', password: 'a-long-first-password' })
    const other = new Client(undefined, freshAddress())
    await other.signIn('shifty@tightwell.test', 'a-long-first-password')
    expect((await other.get('/api/users')).status).toBe(200)
    expect((await admin.post(`/api/users/${made.body.id}/role`, { role: 'rater' })).status).toBe(200)
    expect((await other.get('/api/users')).status).toBe(403)
  })

  it('no route returns a password hash', async () => {
    const admin = new Client(undefined, freshAddress())
    const signIn = await admin.signIn('admin@tightwell.test')
    for (const res of [signIn, await admin.get('/api/users'), await admin.get('/api/auth/me'), await admin.get('/api/_auth/session')]) {
      expect(res.status).toBe(200)
      expect(leaksHash(res.body)).toBe(false)
    }
  })

  it('an admin cannot deactivate themself or drop their own admin role', async () => {
    const admin = new Client(undefined, freshAddress())
    const me = (await admin.signIn('admin@tightwell.test')).body.user
    const res = await admin.post(`/api/users/${me.id}/deactivate`)
    expect(res.status).toBe(400)
    expect(res.body.data.field).toBe('id')
    expect((await admin.post(`/api/users/${me.id}/role`, { role: 'rater' })).status).toBe(400)
  })

  it('an unknown person is a 404', async () => {
    const admin = new Client(undefined, freshAddress())
    await admin.signIn('admin@tightwell.test')
    expect((await admin.post('/api/users/99999/deactivate')).status).toBe(404)
  })
})

describe('bad input → 400 naming the field', () => {
  const cases: [string, string, unknown, string][] = [
    ['/api/users', 'bad e-mail', { email: 'not-an-email', name: 'A', role: 'rater', password: 'a-long-first-password' }, 'email'],
    ['/api/users', 'short password', { email: 'a@tightwell.test', name: 'A', role: 'rater', password: 'short' }, 'password'],
    ['/api/users', 'unknown role', { email: 'a@tightwell.test', name: 'A', role: 'owner', password: 'a-long-first-password' }, 'role'],
    ['/api/users', 'unknown field', { email: 'a@tightwell.test', name: 'A', role: 'rater', password: 'a-long-first-password', isAdmin: true }, 'isAdmin'],
    ['/api/users', 'missing name', { email: 'a@tightwell.test', role: 'rater', password: 'a-long-first-password' }, 'name'],
    ['/api/users', 'unknown jurisdiction', { email: 'a@tightwell.test', name: 'A', role: 'reviewer', password: 'a-long-first-password', jurisdictionId: 9999 }, 'jurisdictionId'],
    ['/api/users', 'malformed JSON', '{"email": ', '(body)'],
    ['/api/users/abc/role', 'non-numeric id', { role: 'rater' }, 'id'],
  ]
  it.each(cases)('POST %s with %s', async (path, _label, body, field) => {
    const admin = new Client(undefined, freshAddress())
    await admin.signIn('admin@tightwell.test')
    const res = await admin.post(path, body)
    expect(res.status).toBe(400)
    expect(res.body.data.field).toBe(field)
    expect(res.body.message).toContain(`${field}:`)
  })

  it('sign-in with a non-object body is a 400, not a 500', async () => {
    const res = await new Client(undefined, freshAddress()).post('/api/auth/sign-in', '[1,2,3]')
    expect(res.status).toBe(400)
  })

  it('the password change needs the current password and 12+ characters', async () => {
    const admin = new Client(undefined, freshAddress())
    await admin.signIn('admin@tightwell.test')
    await admin.post('/api/users', { email: 'pw@tightwell.test', name: 'Wendell Pike', role: 'rater', password: 'first-password-here' })
    const c = new Client(undefined, freshAddress())
    await c.signIn('pw@tightwell.test', 'first-password-here')
    const wrongCurrent = await c.post('/api/account/password', { currentPassword: 'nope-nope-nope', newPassword: 'second-password-here' })
    expect(wrongCurrent.status).toBe(400)
    expect(wrongCurrent.body.data.field).toBe('currentPassword')
    const short = await c.post('/api/account/password', { currentPassword: 'first-password-here', newPassword: 'short' })
    expect(short.status).toBe(400)
    expect(short.body.data.field).toBe('newPassword')
    expect((await c.post('/api/account/password', { currentPassword: 'first-password-here', newPassword: 'second-password-here' })).status).toBe(200)
    await new Client(undefined, freshAddress()).signIn('pw@tightwell.test', 'second-password-here')
  })
})
