import { ASSUMED_EXPONENT_RANGE, MAX_READINGS, checkCalculation, checkTestReadings } from '../leakage/schema'
import { isStateCode, stateForFips } from '../rules/fips'
import { isIsoDate } from '../rules/resolve'
import { latestPermitDate, type CheckRequest } from './schema'

/**
 * The accept-only fast path of {@link CheckRequest} for the checker's hot route.
 *
 * It answers either the request exactly as `CheckRequest.parse` would (same values, same
 * transforms: trimmed text, upper-case state, five-digit postal code) or `undefined` when the body
 * is not plainly valid — then the caller runs the zod schema, which words every problem. It never
 * rejects anything on its own and never words an error, so the zod schema stays the one statement
 * of what a valid check is; a property test holds the two together (tests/unit/check-accept.test.ts).
 *
 * Objects without transforms (building, test, readings) are passed through rather than copied;
 * JSON.parse gives every request its own objects, so nothing is shared between requests.
 */
export function acceptCheckRequest(input: unknown, now: number = Date.now()): CheckRequest | undefined {
  if (!isPlain(input) || !onlyKeys(input, TOP_KEYS)) return undefined
  const { units, building, test, reverse, address, permitDate, buildingType, jurisdictionId } = input
  if (units !== 'ip' && units !== 'si') return undefined
  if (!acceptBuilding(building)) return undefined
  if (!acceptTest(test)) return undefined
  if (reverse !== undefined && !acceptTest(reverse)) return undefined
  const where = acceptAddress(address)
  if (!where) return undefined
  if (typeof permitDate !== 'string' || !isIsoDate(permitDate) || permitDate > latestPermitDateAt(now)) return undefined
  if (buildingType !== 'detached' && buildingType !== 'attached') return undefined
  if (jurisdictionId !== undefined && !(Number.isSafeInteger(jurisdictionId) && (jurisdictionId as number) > 0)) return undefined

  const request = { units, building, test } as CheckRequest
  if (reverse !== undefined) request.reverse = reverse as CheckRequest['test']
  request.address = where
  request.permitDate = permitDate
  request.buildingType = buildingType
  if (jurisdictionId !== undefined) request.jurisdictionId = jurisdictionId as number

  const sink = new Sink()
  checkCalculation(request, sink)
  return sink.clean ? request : undefined
}

type Plain = Record<string, unknown>

const TOP_KEYS = new Set(['units', 'building', 'test', 'reverse', 'address', 'permitDate', 'buildingType', 'jurisdictionId'])
const BUILDING_KEYS = new Set(['volume', 'floorArea', 'enclosureArea', 'height', 'elevation'])
const TEST_KEYS = new Set(['direction', 'baseline', 'readings', 'insideTemperature', 'outsideTemperature', 'assumedExponent'])
const BASELINE_KEYS = new Set(['before', 'after'])
const READING_KEYS = new Set(['pressure', 'flow'])
const ADDRESS_KEYS = new Set(['line1', 'city', 'state', 'postalCode', 'countyFips'])
const POSTAL_CODE = /^\d{5}(-\d{4})?$/
const COUNTY_FIPS = /^\d{5}$/

/** Collects whether a cross-field check raised anything (the fast path only needs yes or no). */
class Sink {
  clean = true
  addIssue() { this.clean = false }
}

function isPlain(value: unknown): value is Plain {
  return typeof value === 'object' && value !== null && !Array.isArray(value)
}

function onlyKeys(value: Plain, allowed: ReadonlySet<string>): boolean {
  for (const key in value) if (!allowed.has(key)) return false
  return true
}

function finite(value: unknown): value is number {
  return typeof value === 'number' && Number.isFinite(value)
}

function positive(value: unknown): boolean {
  return finite(value) && value > 0
}

function optionalFinite(value: unknown): boolean {
  return value === undefined || finite(value)
}

function optionalPositive(value: unknown): boolean {
  return value === undefined || positive(value)
}

function acceptBuilding(value: unknown): boolean {
  return isPlain(value) && onlyKeys(value, BUILDING_KEYS)
    && positive(value.volume) && optionalPositive(value.floorArea) && optionalPositive(value.enclosureArea)
    && optionalPositive(value.height) && optionalFinite(value.elevation)
}

function acceptTest(value: unknown): boolean {
  if (!isPlain(value) || !onlyKeys(value, TEST_KEYS)) return false
  if (value.direction !== 'depressurization' && value.direction !== 'pressurization') return false
  const baseline = value.baseline
  if (baseline !== undefined && !(isPlain(baseline) && onlyKeys(baseline, BASELINE_KEYS) && optionalFinite(baseline.before) && optionalFinite(baseline.after))) return false
  const readings = value.readings
  if (!Array.isArray(readings) || readings.length < 1 || readings.length > MAX_READINGS) return false
  for (const reading of readings) {
    if (!isPlain(reading) || !onlyKeys(reading, READING_KEYS) || !finite(reading.pressure) || !positive(reading.flow)) return false
  }
  if (!optionalFinite(value.insideTemperature) || !optionalFinite(value.outsideTemperature)) return false
  const exponent = value.assumedExponent
  if (exponent !== undefined && !(finite(exponent) && exponent >= ASSUMED_EXPONENT_RANGE.min && exponent <= ASSUMED_EXPONENT_RANGE.max)) return false
  const sink = new Sink()
  checkTestReadings(value as unknown as CheckRequest['test'], sink)
  return sink.clean
}

function acceptAddress(value: unknown): CheckRequest['address'] | undefined {
  if (!isPlain(value) || !onlyKeys(value, ADDRESS_KEYS)) return undefined
  const { line1, city, state, postalCode, countyFips } = value
  if (typeof line1 !== 'string' || typeof city !== 'string' || typeof state !== 'string' || typeof postalCode !== 'string') return undefined
  const address = {
    line1: line1.trim(),
    city: city.trim(),
    state: state.trim().toUpperCase(),
    postalCode: postalCode.trim(),
  } as CheckRequest['address']
  if (address.line1.length < 1 || address.line1.length > 200 || address.city.length < 1 || address.city.length > 100) return undefined
  if (!isStateCode(address.state) || !POSTAL_CODE.test(address.postalCode)) return undefined
  address.postalCode = address.postalCode.slice(0, 5)
  if (countyFips !== undefined) {
    if (typeof countyFips !== 'string') return undefined
    const fips = countyFips.trim()
    if (!COUNTY_FIPS.test(fips) || stateForFips(fips) !== address.state) return undefined
    address.countyFips = fips
  }
  return address
}

/** latestPermitDate, remembered per minute (a day boundary is a minute boundary). */
let latest = { minute: Number.NaN, date: '' }
function latestPermitDateAt(now: number): string {
  const minute = Math.floor(now / 60_000)
  if (minute !== latest.minute) latest = { minute, date: latestPermitDate(new Date(minute * 60_000)) }
  return latest.date
}
