/**
 * CSV for zone maps and limits tables: reading (papaparse) into records with their line numbers,
 * mapping columns to fields with per-row problems, and writing with cells neutralised against
 * formula injection (OWASP "CSV Injection": a cell beginning with = + - @ tab or carriage
 * return is prefixed with an apostrophe). The same code runs in the browser (preview) and on the
 * server (which validates again).
 */
import Papa from 'papaparse'
import { canonicalJson, simpleRule, asSimpleRule, type RuleLogic } from './logic'
import { fipsFromParts, isStateCode, normaliseFips, stateForFips, STATE_BY_FIPS } from './fips'
import { duplicateKeyProblems, normaliseRuleRow, nextRuleKey, ruleRowProblems, type RuleRow } from './table'
import { COMPARISONS, RULE_BUILDING_TYPES, RULE_KINDS, isRuleVariable, type Comparison, type RuleBuildingType, type RuleKind } from './variables'
import { normaliseZone, type ClimateZone } from './zones'

/** Import bodies above this size are refused with 413 (the message names it). */
export const IMPORT_MAX_BYTES = 5 * 1024 * 1024
export const IMPORT_MAX_LABEL = '5 MB'

/** A problem tied to a place in the file: line 1 is the header. column '(file)' or '(row)' when no one column is at fault. */
export interface ImportProblem { line: number, column: string, reason: string }

export interface CsvRecord { line: number, cells: string[] }
export interface CsvTable {
  header: string[]
  records: CsvRecord[]
  delimiter: string
  problems: ImportProblem[]
}

const DANGEROUS_START = /^[=+\-@\t\r]/

/** OWASP CSV injection guidance: prefix a cell that a spreadsheet would read as a formula. */
export function neutraliseCell(value: string): string {
  return DANGEROUS_START.test(value) ? `'${value}` : value
}

/** Undoes our own neutralising on import, so export → import is lossless. */
export function unneutraliseCell(value: string): string {
  return value.startsWith('\'') && DANGEROUS_START.test(value.slice(1)) ? value.slice(1) : value
}

/** Writes CSV: header first, CRLF line ends (RFC 4180), every cell neutralised, quoted when needed. */
export function writeCsv(header: readonly string[], rows: readonly (readonly string[])[]): string {
  return Papa.unparse({ fields: [...header], data: rows.map(r => r.map(neutraliseCell)) }, { newline: '\r\n', quotes: false, escapeFormulae: false }) + '\r\n'
}

/**
 * The delimiter of a file from its first non-blank line: comma, semicolon (spreadsheets in
 * decimal-comma locales) or tab, whichever occurs most outside quotes; comma when none does.
 */
export function detectDelimiter(text: string): ',' | ';' | '\t' {
  const firstLine = text.replace(/^\uFEFF/, '').split(/\r\n|\n|\r/).find(l => l.trim() !== '') ?? ''
  const counts: Record<',' | ';' | '\t', number> = { ',': 0, ';': 0, '\t': 0 }
  let quoted = false
  for (const ch of firstLine) {
    if (ch === '"') quoted = !quoted
    else if (!quoted && (ch === ',' || ch === ';' || ch === '\t')) counts[ch] += 1
  }
  if (counts[';'] > counts[','] && counts[';'] >= counts['\t']) return ';'
  if (counts['\t'] > counts[',']) return '\t'
  return ','
}

function isBlank(cells: readonly string[]): boolean {
  return cells.every(c => c.trim() === '')
}

function newlinesIn(cells: readonly string[]): number {
  let n = 0
  for (const cell of cells) {
    for (let i = cell.indexOf('\n'); i !== -1; i = cell.indexOf('\n', i + 1)) n += 1
  }
  return n
}

/**
 * Turns parsed rows into a table: the first non-blank row is the header (a byte-order mark is
 * dropped), blank rows are skipped, and every record keeps the line it started on in the file
 * (quoted cells may span lines). A record with more or fewer fields than the header is a problem.
 */
export function tableFromRows(rows: readonly string[][], delimiter = ','): CsvTable {
  const problems: ImportProblem[] = []
  const records: CsvRecord[] = []
  let header: string[] | undefined
  let line = 1
  for (const raw of rows) {
    const cells = raw.map(String)
    const startLine = line
    line += 1 + newlinesIn(cells)
    if (isBlank(cells)) continue
    if (!header) {
      if (cells[0]?.startsWith('\uFEFF')) cells[0] = cells[0].slice(1)
      header = cells.map(c => c.trim())
      header.forEach((name, i) => {
        if (!name) problems.push({ line: startLine, column: `column ${i + 1}`, reason: 'the header has an empty column name' })
        else if (header!.indexOf(name) !== i) problems.push({ line: startLine, column: name, reason: 'the header names this column twice' })
      })
      continue
    }
    if (cells.length !== header.length) {
      problems.push({
        line: startLine,
        column: '(row)',
        reason: `has ${cells.length} field${cells.length === 1 ? '' : 's'}; the header has ${header.length}${cells.length > header.length ? ' (an unquoted comma, or a decimal comma?)' : ''}`,
      })
      continue
    }
    records.push({ line: startLine, cells })
  }
  if (!header) problems.push({ line: 1, column: '(file)', reason: 'the file is empty; the first line must name the columns' })
  return { header: header ?? [], records, delimiter, problems }
}

/** Reads CSV text in one go (server side, and pasted text in the browser). */
export function readCsv(text: string): CsvTable {
  const body = text.replace(/^\uFEFF/, '')
  const delimiter = detectDelimiter(body)
  const parsed = Papa.parse<string[]>(body, { delimiter, skipEmptyLines: false })
  const table = tableFromRows(parsed.data, delimiter)
  for (const error of parsed.errors) {
    if (error.type === 'Quotes') table.problems.push({ line: lineOfRow(parsed.data, error.row ?? 0), column: '(row)', reason: `a quoted field is not closed (${error.message})` })
  }
  return table
}

function lineOfRow(rows: readonly string[][], index: number): number {
  let line = 1
  for (let i = 0; i < index && i < rows.length; i++) line += 1 + newlinesIn(rows[i]!)
  return line
}

/** Lower-case, non-alphanumerics to "_": "IECC Climate Zone" → "iecc_climate_zone". */
export function headerKey(name: string): string {
  return name.trim().toLowerCase().replace(/[^a-z0-9]+/g, '_').replace(/^_+|_+$/g, '')
}

// ─── Zone maps ────────────────────────────────────────────────────────────────────────────────

export const ZONE_MAP_HEADER = ['county_fips', 'zone', 'county_name', 'state'] as const

export const ZONE_FIELDS = ['fips', 'stateFips', 'countyFips', 'zone', 'moisture', 'countyName', 'state'] as const
export type ZoneField = (typeof ZONE_FIELDS)[number]
/** Which header column holds each field. */
export type ZoneColumns = Partial<Record<ZoneField, string>>

export const ZONE_FIELD_LABELS: Record<ZoneField, string> = {
  fips: 'County FIPS (5 digits)',
  stateFips: 'State FIPS (2 digits)',
  countyFips: 'County part of FIPS (3 digits)',
  zone: 'Climate zone',
  moisture: 'Moisture letter',
  countyName: 'County name',
  state: 'State (USPS code)',
}

const ZONE_ALIASES: Record<Exclude<ZoneField, 'countyFips'>, string[]> = {
  fips: ['county_fips', 'fips', 'fips_code', 'county_fips_code', 'geoid', 'county_geoid', 'countyfips'],
  stateFips: ['state_fips', 'statefp', 'state_fips_code'],
  zone: ['zone', 'climate_zone', 'iecc_zone', 'iecc_climate_zone', 'climatezone'],
  moisture: ['moisture', 'moisture_regime', 'iecc_moisture_regime', 'moisture_letter'],
  countyName: ['county_name', 'county', 'name', 'countyname'],
  state: ['state', 'state_code', 'st', 'usps', 'state_abbr', 'stusps'],
}

/**
 * Guesses which columns hold what from the header names. A file with separate "State FIPS" and
 * "County FIPS" columns is read as parts (the county column then holds 3 digits). Columns it
 * cannot place are returned as `ignored` (shown in the preview).
 */
export function detectZoneColumns(header: readonly string[]): { columns: ZoneColumns, ignored: string[] } {
  const byKey = new Map(header.map(h => [headerKey(h), h]))
  const find = (aliases: string[]) => aliases.map(a => byKey.get(a)).find(Boolean)
  const columns: ZoneColumns = {}
  const stateFips = find(ZONE_ALIASES.stateFips)
  if (stateFips) {
    columns.stateFips = stateFips
    const county = find(['county_fips', 'countyfp', 'county_fips_code', 'county_code'])
    if (county) columns.countyFips = county
    const full = find(['fips', 'fips_code', 'geoid', 'county_geoid'])
    if (full) { columns.fips = full; delete columns.stateFips; delete columns.countyFips }
  }
  else {
    const fips = find(ZONE_ALIASES.fips)
    if (fips) columns.fips = fips
  }
  for (const field of ['zone', 'moisture', 'countyName', 'state'] as const) {
    const found = find(ZONE_ALIASES[field])
    if (found) columns[field] = found
  }
  const used = new Set(Object.values(columns))
  return { columns, ignored: header.filter(h => !used.has(h)) }
}

/** Problems with a column mapping against a header (line 1). */
export function zoneColumnProblems(header: readonly string[], columns: ZoneColumns): ImportProblem[] {
  const problems: ImportProblem[] = []
  for (const [field, name] of Object.entries(columns)) {
    if (name !== undefined && !header.includes(name)) problems.push({ line: 1, column: name, reason: `no such column in the header (for ${ZONE_FIELD_LABELS[field as ZoneField]})` })
  }
  if (!columns.fips && !(columns.stateFips && columns.countyFips)) {
    problems.push({ line: 1, column: '(header)', reason: `no county FIPS column: name one "county_fips" (5 digits), or give "state_fips" and "county_fips" (2 + 3 digits); the header is: ${header.join(', ')}` })
  }
  if (!columns.zone) problems.push({ line: 1, column: '(header)', reason: `no climate-zone column: name one "zone" (or climate_zone, iecc_zone); the header is: ${header.join(', ')}` })
  return problems
}

export interface ZoneImportRow {
  line: number
  countyFips: string
  zone: ClimateZone
  /** undefined when the file has no county-name column (a merge keeps the stored name). */
  countyName?: string | null
  stateCode: string | null
}

export interface ZoneMapping {
  rows: ZoneImportRow[]
  problems: ImportProblem[]
  warnings: ImportProblem[]
}

/** Maps table records to zone rows; every bad cell is a problem with its line and column. */
export function mapZoneRecords(table: CsvTable, columns: ZoneColumns): ZoneMapping {
  const problems: ImportProblem[] = [...table.problems, ...zoneColumnProblems(table.header, columns)]
  const warnings: ImportProblem[] = []
  const rows: ZoneImportRow[] = []
  if (problems.some(p => p.line === 1 || p.column === '(file)')) return { rows, problems, warnings }
  const index = (name?: string) => (name === undefined ? -1 : table.header.indexOf(name))
  const at = { fips: index(columns.fips), stateFips: index(columns.stateFips), countyFips: index(columns.countyFips), zone: index(columns.zone), moisture: index(columns.moisture), countyName: index(columns.countyName), state: index(columns.state) }
  const seen = new Map<string, number>()
  for (const { line, cells } of table.records) {
    const cell = (i: number) => (i >= 0 ? cells[i]! : '')
    const fipsColumn = columns.fips ?? `${columns.stateFips}+${columns.countyFips}`
    const fips = at.fips >= 0 ? normaliseFips(cell(at.fips)) : fipsFromParts(cell(at.stateFips), cell(at.countyFips))
    let bad = false
    if (!fips.ok) { problems.push({ line, column: fipsColumn, reason: fips.reason }); bad = true }
    else if (fips.warning) warnings.push({ line, column: fipsColumn, reason: fips.warning })
    const zone = normaliseZone(cell(at.zone), at.moisture >= 0 ? cell(at.moisture) : undefined)
    if (!zone.ok) { problems.push({ line, column: columns.zone!, reason: zone.reason }); bad = true }
    let countyName: string | null | undefined
    if (at.countyName >= 0) {
      countyName = unneutraliseCell(cell(at.countyName).trim()) || null
      if (countyName && countyName.length > 100) { problems.push({ line, column: columns.countyName!, reason: 'is longer than 100 characters' }); bad = true }
    }
    let stateCode: string | null = fips.ok ? stateForFips(fips.fips) ?? null : null
    if (at.state >= 0) {
      const given = cell(at.state).trim().toUpperCase()
      if (given) {
        if (!isStateCode(given)) { problems.push({ line, column: columns.state!, reason: `"${cell(at.state).trim()}" is not a USPS state code (e.g. WA)` }); bad = true }
        else if (fips.ok && stateCode && given !== stateCode) { problems.push({ line, column: columns.state!, reason: `${given} does not match the FIPS state code ${fips.fips.slice(0, 2)} (${STATE_BY_FIPS[fips.fips.slice(0, 2)]})` }); bad = true }
        else stateCode = given
      }
    }
    if (fips.ok) {
      const first = seen.get(fips.fips)
      if (first !== undefined) { problems.push({ line, column: fipsColumn, reason: `county ${fips.fips} is already on line ${first}` }); bad = true }
      else seen.set(fips.fips, line)
    }
    if (bad || !fips.ok || !zone.ok) continue
    const row: ZoneImportRow = { line, countyFips: fips.fips, zone: zone.zone, stateCode }
    if (countyName !== undefined) row.countyName = countyName
    rows.push(row)
  }
  if (table.records.length === 0 && problems.length === 0) problems.push({ line: 2, column: '(file)', reason: 'the file has a header but no rows' })
  return { rows, problems, warnings }
}

export interface ZoneMapRow { countyFips: string, zone: string, countyName: string | null, stateCode: string | null }

export function zoneMapToCsv(rows: readonly ZoneMapRow[]): string {
  return writeCsv(ZONE_MAP_HEADER, rows.map(r => [r.countyFips, r.zone, r.countyName ?? '', r.stateCode ?? '']))
}

// ─── Limits tables ────────────────────────────────────────────────────────────────────────────

export const LIMITS_HEADER = ['key', 'zones', 'building_type', 'kind', 'metric', 'comparison', 'limit', 'logic', 'summary', 'citation_code', 'citation_edition', 'citation_section', 'notes'] as const
type LimitsColumn = (typeof LIMITS_HEADER)[number]
const REQUIRED_LIMITS_COLUMNS: LimitsColumn[] = ['zones', 'citation_code', 'citation_edition', 'citation_section']

const COMPARISON_ALIASES: Record<string, Comparison> = { '<': '<', '<=': '<=', '≤': '<=', '=<': '<=', '>': '>', '>=': '>=', '≥': '>=', '=>': '>=', '==': '==', '=': '==', '!=': '!=', '≠': '!=' }

/** "3", "0.28", "1e3"; refuses "0,28" (decimal comma) and "3 ACH". */
export function parseLimitNumber(raw: string): { ok: true, value: number } | { ok: false, reason: string } {
  const value = raw.trim()
  if (/^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/.test(value)) {
    const n = Number(value)
    if (Number.isFinite(n)) return { ok: true, value: n }
  }
  if (/^\d+,\d+$/.test(value)) return { ok: false, reason: `"${value}" is not a number: use a point for decimals (e.g. 0.28)` }
  return { ok: false, reason: value ? `"${value}" is not a number` : 'is empty; expected a number' }
}

export interface LimitsImportRow { line: number, rule: RuleRow }
export interface LimitsMapping { rows: LimitsImportRow[], problems: ImportProblem[], warnings: ImportProblem[] }

/** The CSV column each rule field comes from (for problems). */
const COLUMN_OF_FIELD: Record<string, LimitsColumn> = {
  key: 'key', zones: 'zones', buildingType: 'building_type', kind: 'kind', logic: 'logic', summary: 'summary',
  citationCode: 'citation_code', citationEdition: 'citation_edition', citationSection: 'citation_section', notes: 'notes',
}

/**
 * Maps a limits CSV (our own format, LIMITS_HEADER) to rule rows. A rule is given either as
 * `logic` (json-logic) or as metric + comparison + limit; when both are given they must agree.
 * Unknown columns are refused (nothing is silently dropped); empty keys get r1, r2, …
 */
export function mapLimitRecords(table: CsvTable): LimitsMapping {
  const problems: ImportProblem[] = [...table.problems]
  const warnings: ImportProblem[] = []
  const rows: LimitsImportRow[] = []
  if (problems.some(p => p.line === 1 || p.column === '(file)')) return { rows, problems, warnings }
  const keys = table.header.map(headerKey)
  keys.forEach((k, i) => {
    if (!(LIMITS_HEADER as readonly string[]).includes(k)) problems.push({ line: 1, column: table.header[i]!, reason: `is not a limits-table column; the columns are ${LIMITS_HEADER.join(', ')}` })
  })
  for (const required of REQUIRED_LIMITS_COLUMNS) {
    if (!keys.includes(required)) problems.push({ line: 1, column: required, reason: 'this column is missing' })
  }
  if (!keys.includes('logic') && !(keys.includes('metric') && keys.includes('comparison') && keys.includes('limit'))) {
    problems.push({ line: 1, column: 'logic', reason: 'give either a logic column or metric, comparison and limit columns' })
  }
  if (problems.length) return { rows, problems, warnings }
  const col = (name: LimitsColumn) => keys.indexOf(name)
  const pending: { line: number, rule: RuleRow, autoKey: boolean }[] = []
  for (const { line, cells } of table.records) {
    const get = (name: LimitsColumn) => {
      const i = col(name)
      return i >= 0 ? unneutraliseCell(cells[i]!.trim()) : ''
    }
    let bad = false
    const fail = (column: string, reason: string) => { problems.push({ line, column, reason }); bad = true }
    const buildingType = (get('building_type').toLowerCase() || 'any') as RuleBuildingType
    if (!(RULE_BUILDING_TYPES as readonly string[]).includes(buildingType)) fail('building_type', `"${get('building_type')}" must be any, detached or attached`)
    const kind = (get('kind').toLowerCase() || 'limit') as RuleKind
    if (!(RULE_KINDS as readonly string[]).includes(kind)) fail('kind', `"${get('kind')}" must be limit or advisory`)
    let logic: RuleLogic | undefined
    const logicText = get('logic')
    if (logicText) {
      try {
        const parsed: unknown = JSON.parse(logicText)
        if (typeof parsed !== 'object' || parsed === null || Array.isArray(parsed)) fail('logic', 'must be a json-logic object, e.g. {"<=": [{"var": "ach50"}, 3]}')
        else logic = parsed as RuleLogic
      }
      catch (error) {
        fail('logic', `is not valid JSON (${(error as Error).message})`)
      }
    }
    const metric = get('metric')
    const comparisonText = get('comparison')
    const limitText = get('limit')
    if (metric || comparisonText || limitText) {
      let simple: RuleLogic | undefined
      const comparison = COMPARISON_ALIASES[comparisonText]
      if (!isRuleVariable(metric)) fail('metric', metric ? `"${metric}" is not a rule variable` : 'is empty; give metric, comparison and limit together')
      if (!comparison) fail('comparison', comparisonText ? `"${comparisonText}" must be one of ${COMPARISONS.join(' ')}` : 'is empty; give metric, comparison and limit together')
      const limit = parseLimitNumber(limitText)
      if (!limit.ok) fail('limit', limit.reason)
      if (isRuleVariable(metric) && comparison && limit.ok) simple = simpleRule(metric, comparison, limit.value)
      if (simple && logic && canonicalJson(simple) !== canonicalJson(logic)) fail('logic', 'disagrees with metric, comparison and limit; leave one of them empty')
      logic ??= simple
    }
    if (!logic && !bad) fail('logic', 'is empty; give a logic rule or metric, comparison and limit')
    if (bad || !logic) continue
    const rule: RuleRow = {
      key: get('key'),
      zones: get('zones'),
      buildingType,
      kind,
      logic,
      summary: get('summary'),
      citationCode: get('citation_code'),
      citationEdition: get('citation_edition'),
      citationSection: get('citation_section'),
      notes: get('notes'),
    }
    pending.push({ line, rule, autoKey: rule.key === '' })
  }
  // Keys: fill the empty ones, then check every row.
  const keyed: RuleRow[] = []
  for (const item of pending) {
    if (item.autoKey) {
      item.rule.key = nextRuleKey([...keyed, ...pending.map(p => p.rule)].filter(r => r.key))
      warnings.push({ line: item.line, column: 'key', reason: `was empty; the rule is keyed ${item.rule.key}` })
    }
    keyed.push(item.rule)
  }
  for (const { index, reason } of duplicateKeyProblems(pending.map(p => p.rule))) {
    problems.push({ line: pending[index]!.line, column: 'key', reason })
  }
  const duplicate = new Set(duplicateKeyProblems(pending.map(p => p.rule)).map(d => d.index))
  pending.forEach((item, i) => {
    const found = ruleRowProblems(item.rule)
    for (const p of found) problems.push({ line: item.line, column: COLUMN_OF_FIELD[p.field.split('.')[0]!] ?? p.field, reason: p.field.startsWith('logic.') ? `${p.field.slice(6)}: ${p.reason}` : p.reason })
    if (!found.length && !duplicate.has(i)) rows.push({ line: item.line, rule: normaliseRuleRow(item.rule) })
  })
  if (table.records.length === 0 && problems.length === 0) problems.push({ line: 2, column: '(file)', reason: 'the file has a header but no rows' })
  return { rows, problems, warnings }
}

function formatLimit(n: number): string {
  return String(n)
}

export function limitsToCsv(rules: readonly RuleRow[]): string {
  return writeCsv(LIMITS_HEADER, rules.map((r) => {
    const simple = asSimpleRule(r.logic)
    return [
      r.key, r.zones, r.buildingType, r.kind,
      simple?.metric ?? '', simple?.comparison ?? '', simple ? formatLimit(simple.limit) : '',
      JSON.stringify(r.logic), r.summary, r.citationCode, r.citationEdition, r.citationSection, r.notes,
    ]
  }))
}

/** Templates offered for download: the header and one example row each. */
export const ZONE_MAP_TEMPLATE = writeCsv(ZONE_MAP_HEADER, [['53035', '5C', 'Kitsap', 'WA'], ['08031', '5B', 'Denver', 'CO']])
export const LIMITS_TEMPLATE = writeCsv(LIMITS_HEADER, [
  ['r1', '1-2', 'any', 'limit', 'ach50', '<=', '5', '', 'Not exceeding 5 air changes per hour at 50 Pa', 'IECC', '2015', 'R402.4.1.2', ''],
  ['r2', '3-8', 'any', 'limit', 'ach50', '<=', '3', '', 'Not exceeding 3 air changes per hour at 50 Pa', 'IECC', '2015', 'R402.4.1.2', ''],
])
