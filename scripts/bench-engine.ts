/**
 * Throughput of the leakage engine on one thread: analyses per second for a one-reading and a
 * ten-reading test (already-validated input; zod validation is timed separately for reference,
 * it is not part of the analysis hot path). Run: npm run bench:engine
 */
import { CalculationRequest, analyzeLeakage, type LeakageInput } from '../shared/leakage/index'

const building = { volume: 18000, floorArea: 2000, enclosureArea: 4340, height: 18 }

const onePoint: LeakageInput = {
  units: 'ip',
  building,
  test: {
    direction: 'depressurization',
    baseline: { before: -1.8, after: -1.2 },
    readings: [{ pressure: -34, flow: 4200 }],
    insideTemperature: 70,
    outsideTemperature: 32,
    assumedExponent: 0.65,
  },
}

// Ten readings on Q = 112.6·ΔP^0.643 with a little scatter (synthetic).
const scatter = [1.01, 0.99, 1.005, 0.995, 1.0, 1.012, 0.988, 1.003, 0.997, 1.0]
const tenPoint: LeakageInput = {
  units: 'ip',
  building,
  test: {
    direction: 'depressurization',
    baseline: { before: -1.8, after: -1.2 },
    readings: scatter.map((s, i) => {
      const dp = 15 + i * 5
      return { pressure: -(dp + 1.5), flow: 112.6 * Math.pow(dp, 0.643) * s }
    }),
    insideTemperature: 70,
    outsideTemperature: 32,
  },
}

interface Measure {
  perSecond: number
  microseconds: number
}

// Runs batches until `seconds` have passed; the checksum keeps the work observable so the JIT
// cannot drop it.
function measure(run: () => number, seconds: number): Measure {
  let checksum = 0
  const warmEnd = performance.now() + 300
  while (performance.now() < warmEnd) for (let i = 0; i < 1000; i++) checksum += run()
  let count = 0
  const start = performance.now()
  const end = start + seconds * 1000
  let now = start
  while (now < end) {
    for (let i = 0; i < 2000; i++) checksum += run()
    count += 2000
    now = performance.now()
  }
  if (!Number.isFinite(checksum)) throw new Error('benchmark produced a non-finite checksum')
  const elapsed = (now - start) / 1000
  return { perSecond: count / elapsed, microseconds: (elapsed / count) * 1e6 }
}

function report(label: string, m: Measure): void {
  const rate = Math.round(m.perSecond).toLocaleString('en-US')
  console.log(`${label.padEnd(34)} ${rate.padStart(12)} /s   ${m.microseconds.toFixed(2)} µs each`)
}

const seconds = Number(process.env.BENCH_SECONDS ?? 2)
console.log(`Leakage engine, one thread, Node ${process.version}, ${seconds} s per case`)
report('analysis, 1 reading', measure(() => analyzeLeakage(onePoint).cfm50, seconds))
const ten = measure(() => analyzeLeakage(tenPoint).cfm50, seconds)
report('analysis, 10 readings', ten)
report('zod validation only, 10 readings', measure(() => (CalculationRequest.safeParse(tenPoint).success ? 1 : 0), seconds))

const TARGET = 200_000
console.log(ten.perSecond >= TARGET ? `OK: ≥ ${TARGET.toLocaleString('en-US')} ten-reading analyses/s` : `BELOW TARGET of ${TARGET.toLocaleString('en-US')} ten-reading analyses/s`)
