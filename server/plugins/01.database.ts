// Start migrations at boot so the first request rarely waits; handlers still await useDb().
export default defineNitroPlugin(() => {
  useDb().catch((error) => {
    console.error('[tightwell] Database start-up failed:', error)
  })
})
