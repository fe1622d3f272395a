import { eq, sql } from 'drizzle-orm'
import { SignInBody } from '#shared/schemas/people'
import { users } from '../../database/schema'

const GENERIC = 'That e-mail and password do not match an active account.'

// Verifying against a throwaway hash keeps the time for an unknown e-mail close to a known one.
let decoy: Promise<string> | undefined

export default defineEventHandler(async (event) => {
  const { email, password } = await readBodyAs(event, SignInBody)
  const address = clientAddress(event)

  const wait = await retryAfterSeconds(email, address)
  if (wait > 0) {
    setResponseHeader(event, 'Retry-After', wait)
    throw createError({ statusCode: 429, statusMessage: 'Too Many Requests', message: `Too many failed sign-in attempts. Try again in ${Math.ceil(wait / 60)} minute(s).` })
  }

  const db = await useDb()
  const row = await db.query.users.findFirst({ where: eq(sql`lower(${users.email})`, email) })
  decoy ??= hashPassword('decoy-password-for-timing')
  const valid = row ? await verifyPassword(row.passwordHash, password) : (await verifyPassword(await decoy, password), false)

  if (!row || !valid || !row.active) {
    await recordSignInFailure(email, address)
    throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: GENERIC })
  }

  await clearEmailFailures(email)
  const user = toSessionUser(row)
  await replaceUserSession(event, { user, signedInAt: Date.now() })
  return { user }
})
