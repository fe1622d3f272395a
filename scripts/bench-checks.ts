/**
 * Throughput of the checker against the BUILT server (run `npm run build` first; this script
 * builds nothing). autocannon, 50 connections, 10 s per route, on loopback:
 *   (a) GET /api/health — a bare JSON route
 *   (b) POST /api/checks?dryRun=1 — the whole check, nothing stored
 *   (c) POST /api/checks — the whole check, stored
 * Prints requests/s, p99 latency, errors and the ratios (b)/(a), (c)/(a).
 * Targets: (b) ≥ 50 % of (a), (c) ≥ 30 % of (a), p99 < 20 ms, zero errors.
 *
 * The 10 s of each route are run as BENCH_ROUNDS rounds of (a), (b), (c) in turn (default 5 × 2 s),
 * so a shared machine that speeds up or slows down during the run moves all three alike; the
 * ratios are printed over the whole run and per round (median and range). p99 is the worst round's.
 */
import { spawnSync } from 'node:child_process'
import { existsSync } from 'node:fs'
import { availableParallelism } from 'node:os'
import autocannon from 'autocannon'
import { SERVER_ENTRY, startBuiltServer } from '../tests/support/server'

const DURATION = Number(process.env.BENCH_SECONDS ?? 10)
const CONNECTIONS = Number(process.env.BENCH_CONNECTIONS ?? 50)
const ROUNDS = Math.max(1, Number(process.env.BENCH_ROUNDS ?? 5))

if (!existsSync(SERVER_ENTRY)) {
  console.error('No build found: run `npm run build` first.')
  process.exit(1)
}

// A demo house (SYNTHETIC): Kitsap County WA, 8-point depressurization test.
const body = JSON.stringify({
  units: 'ip',
  building: { volume: 18000, floorArea: 2000, enclosureArea: 4340, height: 18 },
  test: {
    direction: 'depressurization',
    baseline: { before: -0.8, after: -0.6 },
    readings: [[10, 302], [15, 392], [20, 470], [25, 540], [30, 605], [40, 730], [50, 840], [60, 945]].map(([p, q]) => ({ pressure: -p!, flow: q! })),
    insideTemperature: 68, outsideTemperature: 45,
  },
  address: { line1: '27 Cedar Loop Road', city: 'Port Alder', state: 'WA', postalCode: '98366', countyFips: '53035' },
  permitDate: '2024-05-01',
  buildingType: 'detached',
})

interface Slice { requests: number, seconds: number, p99: number, errors: number }

async function slice(opts: autocannon.Options): Promise<Slice> {
  const result = await autocannon({ connections: CONNECTIONS, duration: DURATION / ROUNDS, ...opts })
  return { requests: result.requests.total, seconds: result.duration, p99: result.latency.p99, errors: result.errors + result.timeouts + result.non2xx }
}

function summary(slices: Slice[]) {
  const rps = slices.reduce((n, s) => n + s.requests, 0) / slices.reduce((n, s) => n + s.seconds, 0)
  return { rps, p99: Math.max(...slices.map(s => s.p99)), errors: slices.reduce((n, s) => n + s.errors, 0), perRound: slices.map(s => s.requests / s.seconds) }
}

// On Linux with 2+ cores, give the server core 0 and this load generator core 1, so the figures
// measure the server rather than the two fighting over one core.
const canPin = process.platform === 'linux' && availableParallelism() >= 2 && spawnSync('taskset', ['-V']).status === 0
if (canPin) spawnSync('taskset', ['-a', '-p', '-c', '1', String(process.pid)])
const server = await startBuiltServer({ TIGHTWELL_SIGNIN_MAX_PER_ADDRESS: '1000' }, canPin ? ['taskset', '-c', '0'] : [])
try {
  const signIn = await fetch(`${server.url}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: 'rater@tightwell.test', password: 'tightwell-demo' }) })
  const cookie = signIn.headers.getSetCookie().map(c => c.split(';')[0]).join('; ')
  const headers = { 'content-type': 'application/json', cookie }
  // Warm up every route (the ZIP data set, the rulebook cache, the JIT) before measuring.
  const warm = { connections: CONNECTIONS, duration: 3 }
  await autocannon({ ...warm, url: `${server.url}/api/health` })
  await autocannon({ ...warm, url: `${server.url}/api/checks?dryRun=1`, method: 'POST', headers, body })
  await autocannon({ ...warm, url: `${server.url}/api/checks`, method: 'POST', headers, body })

  console.log(`Checker benchmark: ${CONNECTIONS} connections, ${DURATION} s per route in ${ROUNDS} rounds, Node ${process.version}, built server on loopback${canPin ? ', server pinned to core 0, load generator to core 1' : ''}`)
  const routes = [
    { name: '(a) GET /api/health', opts: { url: `${server.url}/api/health` } },
    { name: '(b) POST /api/checks?dryRun=1', opts: { url: `${server.url}/api/checks?dryRun=1`, method: 'POST' as const, headers, body } },
    { name: '(c) POST /api/checks (stored)', opts: { url: `${server.url}/api/checks`, method: 'POST' as const, headers, body } },
  ]
  const slices: Slice[][] = routes.map(() => [])
  for (let round = 0; round < ROUNDS; round++) {
    for (const [i, route] of routes.entries()) slices[i]!.push(await slice(route.opts))
  }
  const [a, b, c] = slices.map(summary) as [ReturnType<typeof summary>, ReturnType<typeof summary>, ReturnType<typeof summary>]
  for (const [i, s] of [a, b, c].entries()) {
    console.log(`${routes[i]!.name.padEnd(34)} ${Math.round(s.rps).toLocaleString('en-US').padStart(8)} req/s   p99 ${String(s.p99).padStart(4)} ms   errors ${s.errors}`)
  }
  const pct = (x: number) => `${(x * 100).toFixed(0)} %`
  const rounds = (s: ReturnType<typeof summary>) => {
    const r = s.perRound.map((x, i) => x / a.perRound[i]!).sort((p, q) => p - q)
    return `median ${pct(r[Math.floor(r.length / 2)]!)}, rounds ${pct(r[0]!)}–${pct(r[r.length - 1]!)}`
  }
  console.log(`(b)/(a) = ${pct(b.rps / a.rps)} (target ≥ 50 %; ${rounds(b)})`)
  console.log(`(c)/(a) = ${pct(c.rps / a.rps)} (target ≥ 30 %; ${rounds(c)})`)
  const ok = b.rps >= a.rps * 0.5 && c.rps >= a.rps * 0.3 && Math.max(b.p99, c.p99) < 20 && a.errors + b.errors + c.errors === 0
  console.log(ok ? 'OK: all targets met' : 'NOT MET: see the figures above')
}
finally {
  await server.stop()
}
