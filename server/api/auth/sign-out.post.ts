// Public: signing out with no session is harmless.
export default defineEventHandler(async (event) => {
  forgetSession(event)
  await clearUserSession(event)
  return { ok: true }
})
