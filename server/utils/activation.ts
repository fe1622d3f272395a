import type { H3Event } from 'h3'
import { eq } from 'drizzle-orm'
import { IdParams } from '../../shared/schemas/people'
import { users } from '../database/schema'

/** Shared by the deactivate and reactivate routes: each state change stays its own small route. */
export async function setActive(event: H3Event, active: boolean) {
  const admin = await requireRole(event, 'admin')
  const { id } = paramsAs(event, IdParams)
  const row = await findUserOr404(id)
  if (!active && row.id === admin.id) {
    throw badRequest([{ field: 'id', reason: 'you cannot deactivate your own account' }])
  }
  const db = await useDb()
  const [updated] = await db.update(users).set({ active }).where(eq(users.id, id)).returning()
  userChanged(id)
  return publicUser(updated!)
}
