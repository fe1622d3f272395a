/**
 * Zone-map import benchmark: starts the BUILT server (run `npm run build` first) on a fresh
 * database, imports the 3,235-row county file and a generated 100,000-row map through the API,
 * and prints the server-side time (measured inside the route, returned as `timingMs` and in the
 * Server-Timing header) and the server process's peak memory (VmHWM from /proc).
 * Targets: 3,235 rows under 0.5 s; 100,000 rows under 10 s.
 */
import { existsSync, readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { ROOT, SERVER_ENTRY, startBuiltServer } from '../tests/support/server'

const REFERENCE = resolve(ROOT, '../shared/reference/county-zones-iecc2021.csv')
const ZONES = ['1A', '2A', '2B', '3A', '3B', '3C', '4A', '4B', '4C', '5A', '5B', '5C', '6A', '6B', '7', '8']

function memoryMb(pid: number | undefined, field: 'VmHWM' | 'VmRSS'): string {
  if (!pid || !existsSync(`/proc/${pid}/status`)) return 'n/a'
  const line = readFileSync(`/proc/${pid}/status`, 'utf8').split('\n').find(l => l.startsWith(`${field}:`))
  const kb = Number(line?.replace(/\D+/g, ''))
  return Number.isFinite(kb) ? `${(kb / 1024).toFixed(0)} MB` : 'n/a'
}

function countyFile(): { csv: string, label: string } {
  if (existsSync(REFERENCE)) return { csv: readFileSync(REFERENCE, 'utf8'), label: 'county-zones-iecc2021.csv (3,235 rows, CRLF)' }
  console.warn(`[bench] ${REFERENCE} is absent: a generated 3,235-row file stands in.`)
  return { csv: generated(3235), label: 'generated 3,235-row map' }
}

/** A synthetic map: every 5-digit FIPS from 00000, a zone and a county name. */
function generated(rows: number): string {
  const lines = ['county_fips,zone,county_name']
  for (let i = 0; i < rows; i++) lines.push(`${String(i).padStart(5, '0')},${ZONES[(i * 7) % ZONES.length]},County ${i}`)
  return lines.join('\n') + '\n'
}

async function main() {
  if (!existsSync(SERVER_ENTRY)) {
    console.error('No build found: run `npm run build` first.')
    process.exit(1)
  }
  const server = await startBuiltServer({ TIGHTWELL_DEMO: '1' })
  try {
    const headers: Record<string, string> = { 'content-type': 'application/json', 'x-forwarded-for': '203.0.113.200' }
    const signIn = await fetch(`${server.url}/api/auth/sign-in`, { method: 'POST', headers, body: JSON.stringify({ email: 'admin@tightwell.test', password: 'tightwell-demo' }) })
    const cookie = signIn.headers.getSetCookie().map(c => c.split(';')[0]).join('; ')
    const call = async (method: string, path: string, body: unknown) => {
      const res = await fetch(server.url + path, { method, headers: { ...headers, cookie }, body: JSON.stringify(body) })
      const json = await res.json() as Record<string, unknown>
      if (!res.ok) throw new Error(`${method} ${path}: ${res.status} ${JSON.stringify(json).slice(0, 300)}`)
      return { json, serverTiming: res.headers.get('server-timing') }
    }
    console.log(`Server memory at start: ${memoryMb(server.pid, 'VmRSS')}`)
    const runs: { label: string, csv: string, mode: 'replace' | 'merge', mapName: string, target: number }[] = []
    const county = countyFile()
    runs.push({ label: county.label, csv: county.csv, mode: 'replace', mapName: 'bench 2021', target: 500 })
    runs.push({ label: `${county.label}, again (merge, nothing changes)`, csv: county.csv, mode: 'merge', mapName: 'bench 2021', target: 500 })
    const big = generated(100_000)
    runs.push({ label: `generated 100,000-row map (${(big.length / 1024 / 1024).toFixed(1)} MB)`, csv: big, mode: 'replace', mapName: 'bench 100k', target: 10_000 })
    runs.push({ label: 'generated 100,000-row map, replaced again', csv: big, mode: 'replace', mapName: 'bench 100k', target: 10_000 })
    const maps = new Map<string, number>()
    console.log('\n| import | rows | server time | target | round trip | server peak memory |')
    console.log('|---|---|---|---|---|---|')
    for (const run of runs) {
      if (!maps.has(run.mapName)) maps.set(run.mapName, Number((await call('POST', '/api/zone-maps', { name: run.mapName })).json.id))
      const started = performance.now()
      const { json } = await call('POST', `/api/zone-maps/${maps.get(run.mapName)}/import`, { mode: run.mode, csv: run.csv })
      const roundTrip = performance.now() - started
      const ms = Number(json.timingMs)
      console.log(`| ${run.label} (${run.mode}) | ${Number(json.rowsInFile).toLocaleString('en-US')} | ${ms.toFixed(0)} ms ${ms <= run.target ? '✓' : '✗'} | < ${run.target.toLocaleString('en-US')} ms | ${roundTrip.toFixed(0)} ms | ${memoryMb(server.pid, 'VmHWM')} |`)
    }
  }
  finally {
    await server.stop()
  }
}

main().catch((error) => {
  console.error(error)
  process.exit(1)
})
