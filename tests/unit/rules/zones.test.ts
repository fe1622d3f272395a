import { describe, expect, it } from 'vitest'
import { CLIMATE_ZONES, normaliseZone, parseZoneSpec, zoneMatches } from '#shared/rules'

describe('climate zones (IECC map notation: number 0–8, moisture letter A/B/C for 0–6, none for 7 and 8) [common practice]', () => {
  it('has the 19 zones of the trade', () => {
    expect(CLIMATE_ZONES).toEqual(['0A', '0B', '1A', '1B', '2A', '2B', '3A', '3B', '3C', '4A', '4B', '4C', '5A', '5B', '5C', '6A', '6B', '7', '8'])
  })

  it.each([
    ['4C', undefined, '4C'], [' 4c ', undefined, '4C'], ['7', undefined, '7'], ['8', 'N/A', '8'], ['4', 'C', '4C'], ['5', ' b ', '5B'], ['0', 'A', '0A'],
  ])('reads %j (moisture %j) as %s', (zone, moisture, expected) => {
    expect(normaliseZone(zone, moisture)).toEqual({ ok: true, zone: expected })
  })

  it.each([
    ['9', undefined, /zones run from 0 to 8/],
    ['10', undefined, /zones run from 0 to 8/],
    ['3D', undefined, /zone 3 takes A, B, C/],
    ['6C', undefined, /zone 6 takes A, B/],
    ['4', undefined, /zone 4 needs a moisture letter \(A, B, C\)/],
    ['7A', undefined, /zone 7 takes no moisture letter/],
    ['7', 'A', /zone 7 takes no moisture letter/],
    ['4C', 'C', /already has a letter/],
    ['', undefined, /is empty/],
    ['warm', undefined, /is not a climate zone/],
  ])('refuses %j (moisture %j)', (zone, moisture, reason) => {
    const r = normaliseZone(zone, moisture)
    expect(r.ok).toBe(false)
    if (!r.ok) expect(r.reason).toMatch(reason)
  })
})

describe('zone specs: which zones a rule applies to', () => {
  it.each([
    ['all', 'all'], ['ALL', 'all'], ['3-8', '3-8'], ['3 - 8', '3-8'], ['3–8', '3-8'], ['1-2', '1-2'], ['4', '4'],
    ['4c, 5C', '4C, 5C'], ['2A 3A', '2A, 3A'], ['1-2, 4C', '1-2, 4C'], ['3-8, all', 'all'],
  ])('parses %j as %j', (spec, canonical) => {
    const r = parseZoneSpec(spec)
    expect(r.ok && r.canonical).toBe(canonical)
  })

  it.each([
    ['', /is empty/], ['9', /zones run from 0 to 8/], ['3-9', /past zone 8/], ['8-3', /runs backwards/], ['3A-5A', /ranges are of zone numbers only/], ['3D', /zone 3 takes A, B, C/], ['1-2 / 3-4', /not a climate zone/],
  ])('refuses %j', (spec, reason) => {
    const r = parseZoneSpec(spec)
    expect(r.ok).toBe(false)
    if (!r.ok) expect(r.reason).toMatch(reason)
  })

  it.each([
    ['3-8', '3A', true], ['3-8', '8', true], ['3-8', '2B', false], ['1-2', '2B', true], ['1-2', '0A', false],
    ['4', '4C', true], ['4', '5C', false], ['4C, 5C', '5C', true], ['4C, 5C', '5B', false], ['all', '0B', true],
    ['all', 'bogus', false], ['9', '4C', false],
  ])('%j covers %s: %s', (spec, zone, expected) => {
    expect(zoneMatches(spec, zone)).toBe(expected)
  })
})
