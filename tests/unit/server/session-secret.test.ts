import { mkdtempSync, readFileSync, statSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { MIN_SECRET_LENGTH, resolveSessionSecret } from '../../../server/utils/session-secret'
import { demoMode } from '../../../server/utils/demo'

const tempFile = () => join(mkdtempSync(join(tmpdir(), 'tw-secret-')), 'nested', 'session-secret')

describe('session secret', () => {
  it('generates a 48-character secret once, stores it with mode 600, and reuses it', () => {
    const file = tempFile()
    const first = resolveSessionSecret({}, file)
    expect(first).toMatchObject({ ok: true, source: 'generated' })
    if (!first.ok) throw new Error('unreachable')
    expect(first.secret).toHaveLength(48)
    expect(statSync(file).mode & 0o777).toBe(0o600)
    const second = resolveSessionSecret({}, file)
    expect(second).toEqual({ ok: true, secret: first.secret, source: 'file' })
    expect(readFileSync(file, 'utf8').trim()).toBe(first.secret)
  })

  it('prefers the environment', () => {
    const secret = 'x'.repeat(40)
    expect(resolveSessionSecret({ NUXT_SESSION_PASSWORD: secret }, tempFile())).toEqual({ ok: true, secret, source: 'environment' })
  })

  it(`refuses a secret shorter than ${MIN_SECRET_LENGTH} characters, saying how long it must be`, () => {
    const out = resolveSessionSecret({ NUXT_SESSION_PASSWORD: 'short' }, tempFile())
    expect(out.ok).toBe(false)
    if (!out.ok) expect(out.message).toContain(`at least ${MIN_SECRET_LENGTH}`)
  })

  it('refuses to invent a secret in production', () => {
    const file = tempFile()
    const out = resolveSessionSecret({ NODE_ENV: 'production' }, file)
    expect(out.ok).toBe(false)
    if (!out.ok) expect(out.message).toMatch(/NUXT_SESSION_PASSWORD is not set/)
  })

  it('ignores a truncated stored secret and writes a new one', () => {
    const file = tempFile()
    resolveSessionSecret({}, file)
    writeFileSync(file, 'too-short')
    const out = resolveSessionSecret({}, file)
    expect(out).toMatchObject({ ok: true, source: 'generated' })
  })
})

describe('demo mode', () => {
  it.each([
    [{}, true],
    [{ NODE_ENV: 'development' }, true],
    [{ NODE_ENV: 'production' }, false],
    [{ NODE_ENV: 'production', TIGHTWELL_DEMO: '1' }, true],
    [{ TIGHTWELL_DEMO: '0' }, false],
  ] as const)('%o → %s', (env, expected) => {
    expect(demoMode(env as NodeJS.ProcessEnv)).toBe(expected)
  })
})
