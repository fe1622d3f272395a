import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { applicableRules, editionInForce, inForce, isIsoDate, spansOverlap } from '#shared/rules'

describe('the edition in force on a permit date', () => {
  // The demo scenario's invented adoption dates (server/utils/seed.ts).
  const editions = [
    { name: 'IECC 2012', effectiveFrom: '2013-07-01', effectiveUntil: '2016-06-30' },
    { name: 'IECC 2015', effectiveFrom: '2016-07-01', effectiveUntil: null },
  ]
  it.each([
    ['2013-06-30', undefined], ['2013-07-01', 'IECC 2012'], ['2016-06-30', 'IECC 2012'], ['2016-07-01', 'IECC 2015'], ['2099-12-31', 'IECC 2015'],
  ])('%s → %s (both ends inclusive)', (date, name) => {
    expect(editionInForce(editions, date)?.name).toBe(name)
  })

  it('overlap: each span starts before the other ends', () => {
    expect(spansOverlap(editions[0]!, editions[1]!)).toBe(false)
    expect(spansOverlap(editions[0]!, { effectiveFrom: '2016-06-30', effectiveUntil: null })).toBe(true)
    expect(spansOverlap({ effectiveFrom: '2020-01-01', effectiveUntil: null }, { effectiveFrom: '2010-01-01', effectiveUntil: null })).toBe(true)
    expect(inForce({ effectiveFrom: '2020-01-01', effectiveUntil: '2020-01-01' }, '2020-01-01')).toBe(true)
  })

  it.each([['2024-02-29', true], ['2023-02-29', false], ['2023-13-01', false], ['2023-1-01', false], ['20230101', false]])('isIsoDate(%j) = %s', (date, ok) => {
    expect(isIsoDate(date)).toBe(ok)
  })

  it('isIsoDate agrees with the calendar of JavaScript\'s Date (proleptic Gregorian, ECMA-262 §21.4.1) on every day shape', () => {
    const viaDate = (v: string) => {
      const d = new Date(`${v}T00:00:00Z`)
      return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === v
    }
    const pad = (n: number, w: number) => String(n).padStart(w, '0')
    fc.assert(fc.property(fc.integer({ min: 0, max: 9999 }), fc.integer({ min: 0, max: 13 }), fc.integer({ min: 0, max: 32 }), (y, m, d) => {
      const v = `${pad(y, 4)}-${pad(m, 2)}-${pad(d, 2)}`
      expect(isIsoDate(v)).toBe(viaDate(v))
    }), { numRuns: 20000, seed: 20261202 })
    for (const y of [1900, 2000, 2023, 2024, 2100, 2400]) expect(isIsoDate(`${y}-02-29`)).toBe(viaDate(`${y}-02-29`))
  })
})

describe('rules that apply to a zone and building type', () => {
  // DOE Zero Energy Ready Home Rev 07 Exhibit 2 [code-limits.csv, READ]: by zone for detached, 3 ACH50 attached.
  const rules = [
    { key: 'r1', zones: '1-2', buildingType: 'detached' as const },
    { key: 'r2', zones: '3-4', buildingType: 'detached' as const },
    { key: 'r3', zones: '5-7', buildingType: 'detached' as const },
    { key: 'r4', zones: '8', buildingType: 'detached' as const },
    { key: 'r5', zones: 'all', buildingType: 'attached' as const },
    { key: 'advisory', zones: 'all', buildingType: 'any' as const },
  ]
  it.each([
    ['4C', 'detached', ['r2', 'advisory']], ['7', 'detached', ['r3', 'advisory']], ['8', 'detached', ['r4', 'advisory']],
    ['4C', 'attached', ['r5', 'advisory']], ['0A', 'detached', ['advisory']],
  ] as const)('zone %s, %s → %j', (zone, type, keys) => {
    expect(applicableRules(rules, zone, type).map(r => r.key)).toEqual(keys)
  })
})
