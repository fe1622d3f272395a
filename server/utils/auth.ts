import type { H3Event } from 'h3'
import type { User } from '#auth-utils'
import { eq } from 'drizzle-orm'
import type { Role } from '../../shared/types/roles'
import { users, type UserRow } from '../database/schema'

export function toSessionUser(row: UserRow): User {
  return { id: row.id, email: row.email, name: row.name, role: row.role, jurisdictionId: row.jurisdictionId }
}

/** The user row behind a session, or null when it is gone or deactivated. */
export async function activeUserRow(id: number): Promise<UserRow | null> {
  const db = await useDb()
  const row = await db.query.users.findFirst({ where: eq(users.id, id) })
  return row && row.active ? row : null
}

/**
 * The signed-in user, checked against the user row on every request: a deactivated account's
 * cookie stops working at once, and a role change applies at once.
 */
export async function requireUser(event: H3Event): Promise<User> {
  if (event.context.user) return event.context.user as User
  const session = await getUserSession(event)
  if (!session.user) throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: 'Sign in to continue.' })
  const row = await activeUserRow(session.user.id)
  if (!row) {
    await clearUserSession(event)
    throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: 'Your session has ended. Sign in again.' })
  }
  const user = toSessionUser(row)
  event.context.user = user
  return user
}

/** requireUser, then 403 unless the user has one of the roles. */
export async function requireRole(event: H3Event, ...roles: Role[]): Promise<User> {
  const user = await requireUser(event)
  if (!roles.includes(user.role)) {
    throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: `This needs the ${roles.join(' or ')} role.` })
  }
  return user
}
