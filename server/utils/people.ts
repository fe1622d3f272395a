import { eq } from 'drizzle-orm'
import type { Role } from '../../shared/types/roles'
import { jurisdictions, users, type UserRow } from '../database/schema'

/** What routes may return about a person: never the password hash. */
export function publicUser(row: UserRow) {
  return {
    id: row.id,
    email: row.email,
    name: row.name,
    role: row.role,
    active: row.active,
    jurisdictionId: row.jurisdictionId,
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
  }
}
export type PublicUser = ReturnType<typeof publicUser>

/** Raters belong to no jurisdiction; a named jurisdiction must exist. */
export async function checkJurisdictionFor(role: Role, jurisdictionId: number | null | undefined): Promise<number | null> {
  if (role === 'rater' || jurisdictionId == null) return null
  const db = await useDb()
  const found = await db.query.jurisdictions.findFirst({ where: eq(jurisdictions.id, jurisdictionId) })
  if (!found) throw badRequest([{ field: 'jurisdictionId', reason: `no jurisdiction has id ${jurisdictionId}` }])
  return jurisdictionId
}

export async function findUserOr404(id: number): Promise<UserRow> {
  const db = await useDb()
  const row = await db.query.users.findFirst({ where: eq(users.id, id) })
  if (!row) throw createError({ statusCode: 404, statusMessage: 'Not Found', message: `No person with id ${id}.` })
  return row
}
