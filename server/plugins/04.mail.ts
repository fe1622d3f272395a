// The mail worker: sends queued notices every TIGHTWELL_MAIL_POLL_MS (and at once when one is queued).
export default defineNitroPlugin((nitroApp) => {
  const { pollMs } = mailSettings()
  const timer = pollMs > 0 ? setInterval(() => { void drainMail() }, pollMs) : undefined
  timer?.unref()
  // Mail queued before a restart goes out soon after start.
  useDb().then(() => drainMail()).catch(() => {})
  nitroApp.hooks.hook('close', async () => {
    if (timer) clearInterval(timer)
    await stopMail()
  })
})
