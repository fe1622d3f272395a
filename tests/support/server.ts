import { spawn, type ChildProcess } from 'node:child_process'
import { mkdtempSync, rmSync } from 'node:fs'
import { createServer } from 'node:net'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'

export const ROOT = resolve(import.meta.dirname, '../..')
export const SERVER_ENTRY = join(ROOT, '.output/server/index.mjs')

export async function freePort(): Promise<number> {
  return await new Promise((ok, fail) => {
    const srv = createServer()
    srv.unref()
    srv.on('error', fail)
    srv.listen(0, '127.0.0.1', () => {
      const address = srv.address()
      const port = typeof address === 'object' && address ? address.port : 0
      srv.close(() => ok(port))
    })
  })
}

export async function waitForHttp(url: string, timeoutMs = 30_000, child?: ChildProcess, log?: () => string): Promise<void> {
  const until = Date.now() + timeoutMs
  while (Date.now() < until) {
    if (child && child.exitCode !== null) throw new Error(`server exited with ${child.exitCode}\n${log?.() ?? ''}`)
    try {
      const res = await fetch(url)
      if (res.ok) return
    }
    catch { /* not up yet */ }
    await new Promise(r => setTimeout(r, 150))
  }
  throw new Error(`timed out waiting for ${url}\n${log?.() ?? ''}`)
}

export interface RunningServer {
  url: string
  dataDir: string
  /** The server's process id (benchmarks read its memory from /proc). */
  pid: number | undefined
  stop: () => Promise<void>
  output: () => string
}

/**
 * Starts the built server on a free loopback port with its own data folder (database file and
 * session secret), demo data on, and X-Forwarded-For trusted so tests can play several clients.
 */
export async function startBuiltServer(env: Record<string, string> = {}, prefix: string[] = []): Promise<RunningServer> {
  const port = await freePort()
  const dataDir = mkdtempSync(join(tmpdir(), 'tightwell-test-'))
  let out = ''
  // `prefix` runs the server through another command, e.g. ['taskset', '-c', '0'] in a benchmark.
  const [command, ...args] = [...prefix, process.execPath, SERVER_ENTRY]
  const child = spawn(command!, args, {
    cwd: dataDir,
    env: {
      ...process.env,
      NODE_ENV: 'test',
      HOST: '127.0.0.1',
      PORT: String(port),
      NUXT_DATABASE_URL: `file:${join(dataDir, 'tightwell.db')}`,
      TIGHTWELL_DEMO: '1',
      TIGHTWELL_TRUST_PROXY: '1',
      TIGHTWELL_MIGRATIONS_DIR: join(ROOT, '.output/server/drizzle'),
      NUXT_SESSION_PASSWORD: '',
      ...env,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  child.stdout!.on('data', (d) => { out += d })
  child.stderr!.on('data', (d) => { out += d })
  child.on('exit', (code, signal) => { out += `\n[server exited: code ${code}, signal ${signal}]\n` })
  const url = `http://127.0.0.1:${port}`
  await waitForHttp(`${url}/api/health`, 30_000, child, () => out)
  return {
    url,
    dataDir,
    pid: child.pid,
    output: () => out,
    async stop() {
      if (child.exitCode === null) {
        const exited = new Promise(r => child.once('exit', r))
        child.kill('SIGTERM')
        await Promise.race([exited, new Promise(r => setTimeout(r, 5000))])
        if (child.exitCode === null) child.kill('SIGKILL')
      }
      rmSync(dataDir, { recursive: true, force: true })
    },
  }
}
