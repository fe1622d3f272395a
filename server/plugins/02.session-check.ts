// The session endpoint of nuxt-auth-utils (/api/_auth/session) reads only the cookie; check the
// user row there too, so a deactivated account's pages sign it out on the next navigation.
export default defineNitroPlugin(() => {
  sessionHooks.hook('fetch', async (session, event) => {
    if (!session.user) return
    const row = await activeUserRow(session.user.id)
    if (!row) {
      await clearUserSession(event)
      throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: 'Your session has ended. Sign in again.' })
    }
    session.user = toSessionUser(row)
  })
})
