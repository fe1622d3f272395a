import { runtimeEnv } from './demo'
import { randomBytes } from 'node:crypto'
import { chmodSync, existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs'
import { dirname, resolve } from 'node:path'

export const MIN_SECRET_LENGTH = 32
export const SECRET_FILE = '.data/session-secret'

export type SecretOutcome =
  | { ok: true, secret: string, source: 'environment' | 'file' | 'generated' }
  | { ok: false, message: string }

/**
 * Decides the cookie-sealing secret. The environment wins; outside production a missing one is
 * generated once into .data/session-secret (mode 600) so a clone runs with no set-up; in
 * production a missing or short secret is refused with a message, instead of 500s on every sign-in.
 */
export function resolveSessionSecret(env: NodeJS.ProcessEnv = runtimeEnv(), file = resolve(SECRET_FILE)): SecretOutcome {
  const fromEnv = env.NUXT_SESSION_PASSWORD
  if (fromEnv) {
    if (fromEnv.length < MIN_SECRET_LENGTH) {
      return { ok: false, message: `NUXT_SESSION_PASSWORD is ${fromEnv.length} characters; it must be at least ${MIN_SECRET_LENGTH}. Generate one with: openssl rand -base64 36` }
    }
    return { ok: true, secret: fromEnv, source: 'environment' }
  }
  if (env.NODE_ENV === 'production') {
    return { ok: false, message: `NUXT_SESSION_PASSWORD is not set. In production set it to a random secret of at least ${MIN_SECRET_LENGTH} characters (e.g. openssl rand -base64 36) and keep it stable across restarts.` }
  }
  if (existsSync(file)) {
    const stored = readFileSync(file, 'utf8').trim()
    if (stored.length >= MIN_SECRET_LENGTH) return { ok: true, secret: stored, source: 'file' }
  }
  // 36 random bytes → 48 base64url characters.
  const secret = randomBytes(36).toString('base64url')
  mkdirSync(dirname(file), { recursive: true })
  writeFileSync(file, secret + '\n', { mode: 0o600 })
  chmodSync(file, 0o600)
  return { ok: true, secret, source: 'generated' }
}
