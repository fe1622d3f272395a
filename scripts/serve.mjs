// Runs the built server (`nuxt build` first; `npm start` does both).
// The session secret and the demo seed are settled by the server itself at start-up.
import { existsSync } from 'node:fs'
import { fileURLToPath } from 'node:url'

const entry = fileURLToPath(new URL('../.output/server/index.mjs', import.meta.url))
if (!existsSync(entry)) {
  console.error('[tightwell] No build found. Run `npm run build` (or `npm start`, which builds first).')
  process.exit(1)
}
process.env.PORT ??= '3000'
console.info(`[tightwell] Starting on http://localhost:${process.env.PORT}`)
await import(entry)
