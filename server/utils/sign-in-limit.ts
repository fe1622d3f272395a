import { and, eq, gte, inArray, lt, sql } from 'drizzle-orm'
import { signInFailures } from '../database/schema'

function intEnv(name: string, fallback: number): number {
  const value = Number(process.env[name])
  return Number.isInteger(value) && value > 0 ? value : fallback
}

/** Limits, read per call so tests and operators can tune them by environment. */
export function signInLimits() {
  return {
    windowMs: intEnv('TIGHTWELL_SIGNIN_WINDOW_SECONDS', 15 * 60) * 1000,
    perEmail: intEnv('TIGHTWELL_SIGNIN_MAX_PER_EMAIL', 10),
    // Offices share one address behind NAT, so the per-address limit is looser.
    perAddress: intEnv('TIGHTWELL_SIGNIN_MAX_PER_ADDRESS', 50),
  }
}

export const emailKey = (email: string) => `email:${email.toLowerCase()}`
export const addressKey = (address: string) => `ip:${address}`

/**
 * Seconds until another attempt is allowed, or 0. Counts failures whether or not the account
 * exists, so the answer says nothing about which e-mail addresses have accounts.
 */
export async function retryAfterSeconds(email: string, address: string, now = Date.now()): Promise<number> {
  const { windowMs, perEmail, perAddress } = signInLimits()
  const db = await useDb()
  const since = now - windowMs
  const rows = await db.select({ key: signInFailures.key, count: sql<number>`count(*)`, oldest: sql<number>`min(${signInFailures.at})` })
    .from(signInFailures)
    .where(and(inArray(signInFailures.key, [emailKey(email), addressKey(address)]), gte(signInFailures.at, since)))
    .groupBy(signInFailures.key)
  let wait = 0
  for (const row of rows) {
    const max = row.key.startsWith('email:') ? perEmail : perAddress
    if (row.count >= max) wait = Math.max(wait, Math.ceil((row.oldest + windowMs - now) / 1000))
  }
  return wait
}

export async function recordSignInFailure(email: string, address: string, now = Date.now()): Promise<void> {
  const db = await useDb()
  const { windowMs } = signInLimits()
  await db.batch([
    db.insert(signInFailures).values([{ key: emailKey(email), at: now }, { key: addressKey(address), at: now }]),
    // Old rows are no longer counted; drop them as we go so the table stays small.
    db.delete(signInFailures).where(lt(signInFailures.at, now - windowMs)),
  ])
}

export async function clearEmailFailures(email: string): Promise<void> {
  const db = await useDb()
  await db.delete(signInFailures).where(eq(signInFailures.key, emailKey(email)))
}

/** The client address; X-Forwarded-For only counts behind a trusted proxy (TIGHTWELL_TRUST_PROXY=1). */
export function clientAddress(event: Parameters<typeof getRequestIP>[0]): string {
  const trust = process.env.TIGHTWELL_TRUST_PROXY === '1'
  return getRequestIP(event, { xForwardedFor: trust }) ?? 'unknown'
}
