/**
 * The pure half of "which rules apply": the edition in force on a permit date, and the rules of
 * a published version that apply to a zone and building type. server/utils/rulebook.ts adds the
 * database and the cache.
 */
import type { RuleRow } from './table'
import type { BuildingType } from './variables'
import { zoneMatches } from './zones'

/** Dates are ISO calendar dates, "YYYY-MM-DD"; they compare correctly as text. */
export const ISO_DATE = /^\d{4}-(0[1-9]|1[0-2])-(0[1-9]|[12]\d|3[01])$/

export function isIsoDate(value: string): boolean {
  if (!ISO_DATE.test(value)) return false
  // The pattern settled the shape and ranges; only the length of the month is left.
  const year = Number(value.slice(0, 4))
  const month = Number(value.slice(5, 7))
  const day = Number(value.slice(8, 10))
  return day <= daysInMonth(year, month)
}

function daysInMonth(year: number, month: number): number {
  if (month === 2) return (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0 ? 29 : 28
  return month === 4 || month === 6 || month === 9 || month === 11 ? 30 : 31
}

export interface EditionSpan { effectiveFrom: string, effectiveUntil: string | null }

/** In force on `date`: from ≤ date ≤ until (both inclusive; no until = still in force). */
export function inForce(edition: EditionSpan, date: string): boolean {
  return edition.effectiveFrom <= date && (edition.effectiveUntil === null || date <= edition.effectiveUntil)
}

/** The edition in force on a date; the latest start wins if an admin let two overlap (the API refuses overlaps). */
export function editionInForce<E extends EditionSpan>(editions: readonly E[], date: string): E | undefined {
  return editions.filter(e => inForce(e, date)).sort((a, b) => (a.effectiveFrom < b.effectiveFrom ? 1 : -1))[0]
}

/** Two spans overlap when each starts before the other ends. */
export function spansOverlap(a: EditionSpan, b: EditionSpan): boolean {
  const aEnd = a.effectiveUntil ?? '9999-12-31'
  const bEnd = b.effectiveUntil ?? '9999-12-31'
  return a.effectiveFrom <= bEnd && b.effectiveFrom <= aEnd
}

/** The rules of a version that apply to a zone and a building type, in table order. */
export function applicableRules<R extends Pick<RuleRow, 'zones' | 'buildingType'>>(rules: readonly R[], zone: string, buildingType: BuildingType): R[] {
  return rules.filter(r => (r.buildingType === 'any' || r.buildingType === buildingType) && zoneMatches(r.zones, zone))
}

/** Why no rule could be found, for the checker to say in words. */
export const NO_RULE_REASONS = ['no-jurisdiction', 'ambiguous-jurisdiction', 'county-not-covered', 'no-edition', 'no-zone-map', 'no-zone', 'no-published-version', 'no-matching-rule'] as const
export type NoRuleReason = (typeof NO_RULE_REASONS)[number]
