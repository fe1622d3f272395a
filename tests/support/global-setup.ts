import { execFileSync } from 'node:child_process'
import { existsSync, readFileSync, writeFileSync } from 'node:fs'
import { join } from 'node:path'
import type { TestProject } from 'vitest/node'
import { ROOT, SERVER_ENTRY, startBuiltServer } from './server'

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string
  }
}

const STAMP = join(ROOT, '.output/.test-run')

/**
 * One build per `vitest run` for every e2e and browser file (the stamp holds the run's id, set
 * in vitest.config.ts), then one built server per project on a fresh database.
 * TIGHTWELL_TEST_NO_BUILD=1 reuses an existing .output.
 */
export default async function setup(project: TestProject) {
  const runId = process.env.TIGHTWELL_TEST_RUN ?? 'manual'
  const reuse = process.env.TIGHTWELL_TEST_NO_BUILD === '1' && existsSync(SERVER_ENTRY)
  const built = existsSync(STAMP) && readFileSync(STAMP, 'utf8') === runId
  if (!reuse && !built) {
    console.info('[tests] building the app once for e2e and browser tests…')
    execFileSync(process.execPath, [join(ROOT, 'node_modules/@nuxt/cli/bin/nuxi.mjs'), 'build'], { cwd: ROOT, stdio: 'inherit' })
    writeFileSync(STAMP, runId)
  }
  const server = await startBuiltServer()
  project.provide('baseUrl', server.url)
  return async () => {
    await server.stop()
  }
}
