/**
 * Climate zones as the trade writes them (IECC climate-zone map): a number 0–8 and, for zones
 * 0–6, a moisture letter — A (moist), B (dry), C (marine, only zones 3–5). Zones 7 and 8 carry
 * no letter. Zone 0 appears from the 2021 map on.
 *
 * Decision: a zone MAP row must name a full zone ("4C", "7"); a bare "4" is refused there, because
 * a county is in exactly one moisture regime. A zone SPEC (which zones a rule applies to) may name
 * a bare number ("4" = 4A, 4B and 4C), a full zone, a range of numbers ("3-8") or "all".
 */

export const CLIMATE_ZONES = [
  '0A', '0B', '1A', '1B', '2A', '2B', '3A', '3B', '3C', '4A', '4B', '4C', '5A', '5B', '5C', '6A', '6B', '7', '8',
] as const
export type ClimateZone = (typeof CLIMATE_ZONES)[number]

const ZONE_SET: ReadonlySet<string> = new Set(CLIMATE_ZONES)
const LETTERS_BY_NUMBER: Record<number, string> = { 0: 'A, B', 1: 'A, B', 2: 'A, B', 3: 'A, B, C', 4: 'A, B, C', 5: 'A, B, C', 6: 'A, B', 7: '', 8: '' }

export function isClimateZone(value: unknown): value is ClimateZone {
  return typeof value === 'string' && ZONE_SET.has(value)
}

/** The number of a zone: "4C" → 4, "7" → 7. */
export function zoneNumber(zone: string): number {
  return Number.parseInt(zone, 10)
}

export type ZoneResult = { ok: true, zone: ClimateZone } | { ok: false, reason: string }

/** Moisture values that mean "no letter" in published county tables. */
const NO_MOISTURE = new Set(['', 'N/A', 'NA', 'NONE', '-'])

/**
 * Reads a zone from a map row: "4c" → "4C"; with a separate moisture column, ("4", "C") → "4C"
 * and ("7", "N/A") → "7". Refuses "9", "3D", a bare "4", "7A".
 */
export function normaliseZone(raw: string, moisture?: string): ZoneResult {
  let value = raw.trim().toUpperCase().replace(/\s+/g, '')
  if (moisture !== undefined) {
    const m = moisture.trim().toUpperCase()
    if (!NO_MOISTURE.has(m)) {
      if (/[A-Z]$/.test(value)) return { ok: false, reason: `zone "${raw.trim()}" already has a letter and the moisture column says "${moisture.trim()}"` }
      value += m
    }
  }
  if (value === '') return { ok: false, reason: 'is empty; expected a climate zone such as 4C or 7' }
  if (ZONE_SET.has(value)) return { ok: true, zone: value as ClimateZone }
  const match = /^(\d+)([A-Z]*)$/.exec(value)
  if (!match) return { ok: false, reason: `"${raw.trim()}" is not a climate zone; expected 0–8 with a moisture letter (e.g. 4C) or 7 / 8` }
  const n = Number(match[1])
  const letter = match[2]!
  if (!(n >= 0 && n <= 8) || match[1]!.length > 1) return { ok: false, reason: `"${raw.trim()}" is not a climate zone; zones run from 0 to 8` }
  if (n >= 7) return { ok: false, reason: `zone ${n} takes no moisture letter; write "${n}"` }
  if (!letter) return { ok: false, reason: `zone ${n} needs a moisture letter (${LETTERS_BY_NUMBER[n]})` }
  return { ok: false, reason: `"${value}" is not a climate zone; zone ${n} takes ${LETTERS_BY_NUMBER[n]}` }
}

export type ZoneSpecItem =
  | { kind: 'all' }
  | { kind: 'range', from: number, to: number }
  | { kind: 'number', n: number }
  | { kind: 'zone', zone: ClimateZone }

export type ZoneSpecResult = { ok: true, items: ZoneSpecItem[], canonical: string } | { ok: false, reason: string }

/**
 * Parses which zones a rule applies to: "all", "3-8", "1-2", "4", "4C, 5C", "2A 3A".
 * Items are separated by commas or spaces; ranges are of zone numbers ("3-8" = 3A … 8).
 */
export function parseZoneSpec(spec: string): ZoneSpecResult {
  const text = spec.trim()
  if (!text) return { ok: false, reason: 'is empty; write "all", a range such as 3-8, or zones such as 4C, 5C' }
  // "3 - 8" and "3–8" (en dash) are common in print.
  const parts = text.replace(/\s*[-–]\s*/g, '-').split(/[\s,;]+/).filter(Boolean)
  const items: ZoneSpecItem[] = []
  for (const raw of parts) {
    const part = raw.toUpperCase()
    if (part === 'ALL' || part === 'ANY' || part === '*') { items.push({ kind: 'all' }); continue }
    const range = /^(\d)-(\d)$/.exec(part)
    if (range) {
      const from = Number(range[1])
      const to = Number(range[2])
      if (from > 8 || to > 8) return { ok: false, reason: `range "${raw}" goes past zone 8` }
      if (from > to) return { ok: false, reason: `range "${raw}" runs backwards; write ${to}-${from}` }
      items.push({ kind: 'range', from, to })
      continue
    }
    if (/^\d+$/.test(part)) {
      const n = Number(part)
      if (part.length > 1 || n > 8) return { ok: false, reason: `"${raw}" is not a climate zone; zones run from 0 to 8` }
      items.push({ kind: 'number', n })
      continue
    }
    if (/^\d[A-Z]-/.test(part) || /-\d[A-Z]$/.test(part)) return { ok: false, reason: `"${raw}": ranges are of zone numbers only (e.g. 3-5); list lettered zones one by one` }
    const zone = normaliseZone(part)
    if (!zone.ok) return { ok: false, reason: zone.reason }
    items.push({ kind: 'zone', zone: zone.zone })
  }
  if (items.some(i => i.kind === 'all')) return { ok: true, items: [{ kind: 'all' }], canonical: 'all' }
  return { ok: true, items, canonical: items.map(formatItem).join(', ') }
}

function formatItem(item: ZoneSpecItem): string {
  switch (item.kind) {
    case 'all': return 'all'
    case 'range': return item.from === item.to ? String(item.from) : `${item.from}-${item.to}`
    case 'number': return String(item.n)
    case 'zone': return item.zone
  }
}

/** Does a zone spec (text or parsed) cover a zone? An unparseable spec covers nothing. */
const parsedSpecs = new Map<string, ZoneSpecItem[]>()
/** A spec's items, parsed once per distinct text (the checker asks for every rule on every check). */
function itemsOf(spec: string): ZoneSpecItem[] {
  let items = parsedSpecs.get(spec)
  if (!items) {
    const r = parseZoneSpec(spec)
    items = r.ok ? r.items : []
    if (parsedSpecs.size >= 1000) parsedSpecs.clear()
    parsedSpecs.set(spec, items)
  }
  return items
}

export function zoneMatches(spec: string | ZoneSpecItem[], zone: string): boolean {
  const items = typeof spec === 'string' ? itemsOf(spec) : spec
  if (!isClimateZone(zone)) return false
  const n = zoneNumber(zone)
  return items.some((item) => {
    switch (item.kind) {
      case 'all': return true
      case 'range': return n >= item.from && n <= item.to
      case 'number': return n === item.n
      case 'zone': return item.zone === zone
    }
  })
}
