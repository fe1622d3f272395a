import type { H3Event } from 'h3'
import type { User } from '#auth-utils'
import { eq } from 'drizzle-orm'
import type { Role } from '../../shared/types/roles'
import { users, type UserRow } from '../database/schema'

export const SESSION_COOKIE = 'tightwell-session'

export function toSessionUser(row: Pick<UserRow, 'id' | 'email' | 'name' | 'role' | 'jurisdictionId'>): User {
  return { id: row.id, email: row.email, name: row.name, role: row.role, jurisdictionId: row.jurisdictionId }
}

/** The user row behind a session, or null when it is gone or deactivated. */
export async function activeUserRow(id: number): Promise<UserRow | null> {
  const db = await useDb()
  const row = await db.query.users.findFirst({ where: eq(users.id, id) })
  return row && row.active ? row : null
}

/**
 * Unsealing a session cookie costs a key derivation; the same sealed value always unseals to the
 * same user, so remember it briefly (a sealed cookie cannot be forged without the secret). The
 * user row is still read on every request — that is what ends a deactivated user's session.
 */
const unsealed = new Map<string, { userId: number, until: number }>()
const UNSEALED_TTL_MS = 60_000

async function sessionUserId(event: H3Event): Promise<number | null> {
  const sealed = getCookie(event, SESSION_COOKIE)
  if (!sealed) return null
  const now = Date.now()
  const hit = unsealed.get(sealed)
  if (hit && hit.until > now) return hit.userId
  const session = await getUserSession(event)
  const id = session.user?.id ?? null
  if (id !== null) {
    if (unsealed.size >= 10_000) unsealed.clear()
    unsealed.set(sealed, { userId: id, until: now + UNSEALED_TTL_MS })
  }
  return id
}

/** Forget the remembered unsealing of this request's cookie (sign-out). */
export function forgetSession(event: H3Event): void {
  const sealed = getCookie(event, SESSION_COOKIE)
  if (sealed) unsealed.delete(sealed)
}

/**
 * The signed-in user, checked against the user row on every request (through the freshness
 * cache, see freshness.ts): a deactivated account's cookie stops working, and a role change
 * applies, on its next request. The rulebook generation comes along for the checker.
 */
export async function requireUser(event: H3Event): Promise<User> {
  if (event.context.user) return event.context.user as User
  const id = await sessionUserId(event)
  if (id === null) throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: 'Sign in to continue.' })
  const fresh = await freshUser(id)
  if (!fresh) {
    forgetSession(event)
    await clearUserSession(event)
    throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: 'Your session has ended. Sign in again.' })
  }
  event.context.user = fresh.user
  event.context.rulebookGeneration = fresh.generation
  return fresh.user
}

/** requireUser, then 403 unless the user has one of the roles. */
export async function requireRole(event: H3Event, ...roles: Role[]): Promise<User> {
  const user = await requireUser(event)
  if (!roles.includes(user.role)) {
    throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: `This needs the ${roles.join(' or ')} role.` })
  }
  return user
}
