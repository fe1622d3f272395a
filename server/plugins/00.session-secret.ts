export default defineNitroPlugin(() => {
  const outcome = resolveSessionSecret()
  if (!outcome.ok) {
    console.error(`\n[tightwell] Cannot start: ${outcome.message}\n`)
    process.exit(1)
  }
  // nuxt-auth-utils reads NUXT_SESSION_PASSWORD from the environment on each call (runtime config is frozen).
  process.env.NUXT_SESSION_PASSWORD = outcome.secret
  if (outcome.source === 'generated') console.info(`[tightwell] Generated a session secret into ${SECRET_FILE}`)
})
