import { existsSync, readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { describe, expect, it } from 'vitest'
import { STATE_BY_FIPS, fipsFromParts, normaliseFips, normalisePostalCode, stateForFips } from '#shared/rules'

const PRE2021 = resolve(import.meta.dirname, '../../../../shared/reference/county-zones-pre2021.csv')

describe('county FIPS codes', () => {
  it.each([
    ['53035', { ok: true, fips: '53035' }],
    [' 08031 ', { ok: true, fips: '08031' }],
    // Decision (fips.ts): a 4-digit code lost its leading zero in a spreadsheet; repaired with a warning.
    ['8031', { ok: true, fips: '08031', warning: '"8031" lost its leading zero; read as 08031' }],
  ])('reads %j', (raw, expected) => {
    expect(normaliseFips(raw)).toEqual(expected)
  })

  it.each(['535', '530350', '53O35', '', '8031.0'])('refuses %j', (raw) => {
    expect(normaliseFips(raw).ok).toBe(false)
  })

  it('builds a FIPS from state and county parts, warning when zeros were lost', () => {
    expect(fipsFromParts('02', '013')).toEqual({ ok: true, fips: '02013' })
    expect(fipsFromParts('2', '13')).toEqual({ ok: true, fips: '02013', warning: 'state "2" + county "13" lost leading zeros; read as 02013' })
    expect(fipsFromParts('123', '013').ok).toBe(false)
  })

  it('postal codes: 5 digits, ZIP+4 cut to 5', () => {
    expect(normalisePostalCode('98110-1234')).toEqual({ ok: true, postalCode: '98110' })
    expect(normalisePostalCode('9811').ok).toBe(false)
  })

  it('maps state FIPS to USPS codes [FIPS 5-2, from memory]', () => {
    expect(stateForFips('53035')).toBe('WA')
    expect(stateForFips('08031')).toBe('CO')
    expect(stateForFips('03001')).toBeUndefined()
  })

  it.skipIf(!existsSync(PRE2021))('every State / State FIPS pair of the pre-2021 county file (open data, DOE Building America lists) agrees with the table', () => {
    const pairs = new Map<string, string>()
    for (const line of readFileSync(PRE2021, 'utf8').split(/\r?\n/).slice(1).filter(Boolean)) {
      const [state, stateFips] = line.split(',')
      pairs.set(stateFips!, state!)
    }
    expect(pairs.size).toBe(57) // 50 states, DC, AS, GU, MP, PR, UM, VI: every entry of the table
    expect(Object.keys(STATE_BY_FIPS)).toHaveLength(57)
    for (const [fips, state] of pairs) expect(STATE_BY_FIPS[fips], fips).toBe(state)
  })
})
