/**
 * County FIPS codes: 5 digits as text, state (2) + county (3), leading zeros kept.
 *
 * Decision: a 4-digit code is REPAIRED with a warning ("1001" → "01001"): spreadsheet programs
 * drop the leading zero of the ten states whose state code starts with 0 (AL, AK, AZ, AR, CA, CO,
 * CT, and 01–09), and a 4-digit all-digit code can only be that. Anything else that is not 5
 * digits is refused.
 */

/** State FIPS (FIPS 5-2 / ANSI INCITS 38) → USPS code: 50 states, DC and the territories. [from memory; the unit tests check it against the county files' State and State FIPS columns] */
export const STATE_BY_FIPS: Readonly<Record<string, string>> = {
  '01': 'AL', '02': 'AK', '04': 'AZ', '05': 'AR', '06': 'CA', '08': 'CO', '09': 'CT', '10': 'DE', '11': 'DC',
  '12': 'FL', '13': 'GA', '15': 'HI', '16': 'ID', '17': 'IL', '18': 'IN', '19': 'IA', '20': 'KS', '21': 'KY',
  '22': 'LA', '23': 'ME', '24': 'MD', '25': 'MA', '26': 'MI', '27': 'MN', '28': 'MS', '29': 'MO', '30': 'MT',
  '31': 'NE', '32': 'NV', '33': 'NH', '34': 'NJ', '35': 'NM', '36': 'NY', '37': 'NC', '38': 'ND', '39': 'OH',
  '40': 'OK', '41': 'OR', '42': 'PA', '44': 'RI', '45': 'SC', '46': 'SD', '47': 'TN', '48': 'TX', '49': 'UT',
  '50': 'VT', '51': 'VA', '53': 'WA', '54': 'WV', '55': 'WI', '56': 'WY',
  '60': 'AS', '66': 'GU', '69': 'MP', '72': 'PR', '74': 'UM', '78': 'VI',
}
export const STATE_CODES: readonly string[] = Object.values(STATE_BY_FIPS)
const STATE_CODE_SET = new Set(STATE_CODES)

export function isStateCode(value: unknown): value is string {
  return typeof value === 'string' && STATE_CODE_SET.has(value)
}

/** The USPS state code of a county FIPS, when its first two digits name a state. */
export function stateForFips(fips: string): string | undefined {
  return STATE_BY_FIPS[fips.slice(0, 2)]
}

export type FipsResult =
  | { ok: true, fips: string, warning?: string }
  | { ok: false, reason: string }

export function normaliseFips(raw: string): FipsResult {
  const value = raw.trim()
  if (/^\d{5}$/.test(value)) return { ok: true, fips: value }
  if (/^\d{4}$/.test(value)) return { ok: true, fips: `0${value}`, warning: `"${value}" lost its leading zero; read as 0${value}` }
  if (value === '') return { ok: false, reason: 'is empty; expected a 5-digit county FIPS code such as 53035' }
  return { ok: false, reason: `"${value}" is not a 5-digit county FIPS code (state 2 digits + county 3 digits, e.g. 53035)` }
}

/** Builds a county FIPS from separate state (1–2 digits) and county (1–3 digits) parts. */
export function fipsFromParts(state: string, county: string): FipsResult {
  const s = state.trim()
  const c = county.trim()
  if (!/^\d{1,2}$/.test(s)) return { ok: false, reason: `state FIPS "${s}" is not 1–2 digits` }
  if (!/^\d{1,3}$/.test(c)) return { ok: false, reason: `county FIPS "${c}" is not 1–3 digits` }
  const fips = s.padStart(2, '0') + c.padStart(3, '0')
  const repaired = s.length < 2 || c.length < 3
  return repaired ? { ok: true, fips, warning: `state "${s}" + county "${c}" lost leading zeros; read as ${fips}` } : { ok: true, fips }
}

/** A US postal (ZIP) code: 5 digits; ZIP+4 is cut to 5. */
export function normalisePostalCode(raw: string): { ok: true, postalCode: string } | { ok: false, reason: string } {
  const value = raw.trim()
  const m = /^(\d{5})(?:-\d{4})?$/.exec(value)
  if (m) return { ok: true, postalCode: m[1]! }
  return { ok: false, reason: `"${value}" is not a 5-digit postal code` }
}
