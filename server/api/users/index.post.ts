import { sql } from 'drizzle-orm'
import { CreateUserBody } from '#shared/schemas/people'
import { users } from '../../database/schema'

export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  const body = await readBodyAs(event, CreateUserBody)
  const jurisdictionId = await checkJurisdictionFor(body.role, body.jurisdictionId)
  const db = await useDb()
  const existing = await db.query.users.findFirst({ where: sql`lower(${users.email}) = ${body.email}` })
  if (existing) throw createError({ statusCode: 409, statusMessage: 'Conflict', message: `email: ${body.email} already has an account.`, data: { field: 'email', reason: 'already has an account' } })
  const [row] = await db.insert(users).values({
    email: body.email,
    name: body.name,
    role: body.role,
    jurisdictionId,
    passwordHash: await hashPassword(body.password),
  }).returning()
  setResponseStatus(event, 201)
  return publicUser(row!)
})
