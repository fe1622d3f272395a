import { eq } from 'drizzle-orm'
import { ChangeRoleBody, IdParams } from '#shared/schemas/people'
import { users } from '../../../database/schema'

export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const { id } = paramsAs(event, IdParams)
  const body = await readBodyAs(event, ChangeRoleBody)
  const row = await findUserOr404(id)
  if (row.id === admin.id && body.role !== 'admin') {
    throw badRequest([{ field: 'role', reason: 'you cannot remove your own admin role; ask another admin' }])
  }
  const jurisdictionId = await checkJurisdictionFor(body.role, body.jurisdictionId === undefined ? row.jurisdictionId : body.jurisdictionId)
  const db = await useDb()
  const [updated] = await db.update(users).set({ role: body.role, jurisdictionId }).where(eq(users.id, id)).returning()
  userChanged(id)
  return publicUser(updated!)
})
