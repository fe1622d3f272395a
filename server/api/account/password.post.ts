import { eq } from 'drizzle-orm'
import { ChangePasswordBody } from '#shared/schemas/people'
import { users } from '../../database/schema'

export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { currentPassword, newPassword } = await readBodyAs(event, ChangePasswordBody)
  const row = await activeUserRow(user.id)
  if (!row || !(await verifyPassword(row.passwordHash, currentPassword))) {
    throw badRequest([{ field: 'currentPassword', reason: 'is not your current password' }])
  }
  if (currentPassword === newPassword) {
    throw badRequest([{ field: 'newPassword', reason: 'must differ from the current password' }])
  }
  const db = await useDb()
  await db.update(users).set({ passwordHash: await hashPassword(newPassword) }).where(eq(users.id, user.id))
  userChanged(user.id)
  return { ok: true }
})
