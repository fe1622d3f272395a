/**
 * A limits table: one row per rule, as stored in a draft and frozen in a published version.
 * One validator serves the table editor (marks invalid cells), the CSV import and the server.
 */
import { canonicalJson, validateRule, type RuleLogic } from './logic'
import { RULE_BUILDING_TYPES, RULE_KINDS, type RuleBuildingType, type RuleKind } from './variables'
import { parseZoneSpec } from './zones'

export interface RuleRow {
  /** Stable within a rule set: matches rules across versions (diffs) and in merge imports. */
  key: string
  /** Which climate zones: "all", "3-8", "4C, 5C" (see zones.ts). */
  zones: string
  buildingType: RuleBuildingType
  kind: RuleKind
  logic: RuleLogic
  /** The rule in the code's own words; may be empty (the app then reads the logic as words). */
  summary: string
  citationCode: string
  citationEdition: string
  citationSection: string
  notes: string
}

export const RULE_FIELDS = ['key', 'zones', 'buildingType', 'kind', 'logic', 'summary', 'citationCode', 'citationEdition', 'citationSection', 'notes'] as const
export type RuleField = (typeof RULE_FIELDS)[number]

export const RULE_TEXT_LIMITS = { key: 40, zones: 100, summary: 500, citationCode: 100, citationEdition: 40, citationSection: 200, notes: 2000 } as const

export const KEY_PATTERN = /^[A-Za-z0-9][A-Za-z0-9._-]*$/

export interface FieldProblem { field: string, reason: string }

/** Problems of one rule row, by field; an empty list means the row can be saved. */
export function ruleRowProblems(row: RuleRow): FieldProblem[] {
  const problems: FieldProblem[] = []
  if (!row.key) problems.push({ field: 'key', reason: 'is required' })
  else if (row.key.length > RULE_TEXT_LIMITS.key) problems.push({ field: 'key', reason: `must be at most ${RULE_TEXT_LIMITS.key} characters` })
  else if (!KEY_PATTERN.test(row.key)) problems.push({ field: 'key', reason: 'may hold letters, digits, ".", "_" and "-" only, starting with a letter or digit' })
  const zones = parseZoneSpec(row.zones)
  if (!zones.ok) problems.push({ field: 'zones', reason: zones.reason })
  else if (row.zones.length > RULE_TEXT_LIMITS.zones) problems.push({ field: 'zones', reason: `must be at most ${RULE_TEXT_LIMITS.zones} characters` })
  if (!(RULE_BUILDING_TYPES as readonly string[]).includes(row.buildingType)) problems.push({ field: 'buildingType', reason: 'must be any, detached or attached' })
  if (!(RULE_KINDS as readonly string[]).includes(row.kind)) problems.push({ field: 'kind', reason: 'must be limit or advisory' })
  const logic = validateRule(row.logic)
  for (const p of logic.problems) problems.push({ field: p.path ? `logic.${p.path}` : 'logic', reason: p.reason })
  for (const field of ['citationCode', 'citationEdition', 'citationSection'] as const) {
    if (!row[field].trim()) problems.push({ field, reason: 'is required: every rule cites code, edition and section' })
  }
  for (const field of ['summary', 'citationCode', 'citationEdition', 'citationSection', 'notes'] as const) {
    if (row[field].length > RULE_TEXT_LIMITS[field]) problems.push({ field, reason: `must be at most ${RULE_TEXT_LIMITS[field]} characters` })
  }
  return problems
}

/** The stored form of a row: the zone spec in canonical form, text trimmed. */
export function normaliseRuleRow(row: RuleRow): RuleRow {
  const zones = parseZoneSpec(row.zones)
  return {
    key: row.key.trim(),
    zones: zones.ok ? zones.canonical : row.zones.trim(),
    buildingType: row.buildingType,
    kind: row.kind,
    logic: row.logic,
    summary: row.summary.trim(),
    citationCode: row.citationCode.trim(),
    citationEdition: row.citationEdition.trim(),
    citationSection: row.citationSection.trim(),
    notes: row.notes.trim(),
  }
}

/** Problems across rows: duplicate keys, each named at its second use. */
export function duplicateKeyProblems(rows: readonly { key: string }[]): { index: number, reason: string }[] {
  const seen = new Map<string, number>()
  const out: { index: number, reason: string }[] = []
  rows.forEach((row, index) => {
    const first = seen.get(row.key)
    if (first !== undefined) out.push({ index, reason: `"${row.key}" is already the key of rule ${first + 1}` })
    else seen.set(row.key, index)
  })
  return out
}

/** A key not used by any row: r1, r2, … */
export function nextRuleKey(rows: readonly { key: string }[]): string {
  const used = new Set(rows.map(r => r.key))
  let n = rows.length + 1
  while (used.has(`r${n}`)) n += 1
  return `r${n}`
}

export interface RuleChange {
  key: string
  before: RuleRow
  after: RuleRow
  fields: RuleField[]
}
export interface RuleDiff {
  added: RuleRow[]
  removed: RuleRow[]
  changed: RuleChange[]
  unchanged: number
}

function sameField(a: RuleRow, b: RuleRow, field: RuleField): boolean {
  return field === 'logic' ? canonicalJson(a.logic) === canonicalJson(b.logic) : a[field] === b[field]
}

/** The difference between two lists of rules, matched by key. Order changes are ignored. */
export function diffRules(before: readonly RuleRow[], after: readonly RuleRow[]): RuleDiff {
  const old = new Map(before.map(r => [r.key, r]))
  const now = new Map(after.map(r => [r.key, r]))
  const diff: RuleDiff = { added: [], removed: [], changed: [], unchanged: 0 }
  for (const row of after) {
    const prev = old.get(row.key)
    if (!prev) { diff.added.push(row); continue }
    const fields = RULE_FIELDS.filter(f => !sameField(prev, row, f))
    if (fields.length) diff.changed.push({ key: row.key, before: prev, after: row, fields })
    else diff.unchanged += 1
  }
  for (const row of before) if (!now.has(row.key)) diff.removed.push(row)
  return diff
}

export function rulesEqual(a: readonly RuleRow[], b: readonly RuleRow[]): boolean {
  if (a.length !== b.length) return false
  const d = diffRules(a, b)
  return d.added.length === 0 && d.removed.length === 0 && d.changed.length === 0 && a.every((r, i) => r.key === b[i]!.key)
}
