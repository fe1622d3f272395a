import { spawnSync } from 'node:child_process'
import { existsSync, mkdtempSync, readdirSync, readFileSync, statSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { createClient } from '@libsql/client'
import { describe, expect, it } from 'vitest'
import { ROOT, SERVER_ENTRY, startBuiltServer } from '../support/server'

function runBuilt(env: Record<string, string>) {
  const cwd = mkdtempSync(join(tmpdir(), 'tw-start-'))
  return spawnSync(process.execPath, [SERVER_ENTRY], {
    cwd,
    env: { PATH: process.env.PATH ?? '', PORT: '0', HOST: '127.0.0.1', NUXT_DATABASE_URL: `file:${join(cwd, 'db.sqlite')}`, ...env },
    encoding: 'utf8',
    timeout: 20_000,
  })
}

describe('start-up of the built server', () => {
  it('in production, a missing session secret stops start-up with a clear message', () => {
    const res = runBuilt({ NODE_ENV: 'production' })
    expect(res.status).toBe(1)
    expect(res.stderr).toContain('NUXT_SESSION_PASSWORD is not set')
  })

  it('in production, a short session secret stops start-up naming the minimum', () => {
    const res = runBuilt({ NODE_ENV: 'production', NUXT_SESSION_PASSWORD: 'only-20-characters!!' })
    expect(res.status).toBe(1)
    expect(res.stderr).toContain('at least 32')
  })

  it('with no environment, generates .data/session-secret (mode 600), migrates, seeds, and uses WAL with foreign keys on', async () => {
    const server = await startBuiltServer({ NUXT_DATABASE_URL: '', TIGHTWELL_DEMO: '' })
    try {
      const secret = join(server.dataDir, '.data/session-secret')
      expect(existsSync(secret)).toBe(true)
      expect(statSync(secret).mode & 0o777).toBe(0o600)
      expect(readFileSync(secret, 'utf8').trim()).toHaveLength(48)
      const res = await fetch(`${server.url}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: 'admin@tightwell.test', password: 'tightwell-demo' }) })
      expect(res.status).toBe(200)
      const db = createClient({ url: `file:${join(server.dataDir, '.data/tightwell.db')}` })
      expect((await db.execute('PRAGMA journal_mode')).rows[0]!.journal_mode).toBe('wal')
      expect((await db.execute('PRAGMA foreign_keys')).rows[0]!.foreign_keys).toBe(1)
      db.close()
    }
    finally {
      await server.stop()
    }
  })

  it('demo data is not seeded in production unless TIGHTWELL_DEMO=1', async () => {
    const secret = 'y'.repeat(48)
    const plain = await startBuiltServer({ NODE_ENV: 'production', TIGHTWELL_DEMO: '', NUXT_SESSION_PASSWORD: secret })
    try {
      const res = await fetch(`${plain.url}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: 'admin@tightwell.test', password: 'tightwell-demo' }) })
      expect(res.status).toBe(401)
    }
    finally {
      await plain.stop()
    }
  })

  it('the build references no external font (Noto Sans ships with the app)', () => {
    const dir = join(ROOT, '.output/public/_nuxt')
    const css = readdirSync(dir).filter(f => f.endsWith('.css')).map(f => readFileSync(join(dir, f), 'utf8')).join('\n')
    expect(css).toContain('Noto Sans')
    expect(css).not.toMatch(/@import\s+url\(\s*['"]?https?:/)
    expect(css).not.toMatch(/fonts\.(googleapis|gstatic)/)
    const fonts = readdirSync(dir).filter(f => /noto-sans.*\.woff2$/.test(f))
    expect(fonts.length).toBeGreaterThanOrEqual(3)
  })
})
