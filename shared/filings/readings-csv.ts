/**
 * A gauge's or spreadsheet's readings file → readings for a test. Pure (papaparse only), so the
 * page previews exactly what the server will accept: the user picks the pressure and flow
 * columns, sees every row with its problems, and the server runs the same mapping again.
 * All or nothing: one bad row means no reading is taken.
 */
import Papa from 'papaparse'
import { MAX_READINGS, checkTestReadings } from '../leakage/schema'
import type { Baseline, Reading, TestDirection } from '../leakage/types'

export interface CsvTable {
  /** Rows as read, each with its 1-based line in the file (blank lines are skipped but counted). */
  rows: { line: number, cells: string[] }[]
  delimiter: string
}

export interface ReadingsMapping {
  pressureColumn: number
  flowColumn: number
  /** The first non-blank row holds column names. */
  hasHeader: boolean
  /** The gauge writes depressurization pressures as positive magnitudes: negate them. */
  flipSign: boolean
}

export interface MappedReading extends Reading { line: number }
export interface CsvProblem { line: number, column: string, reason: string }

export interface MappedReadings {
  readings: MappedReading[]
  problems: CsvProblem[]
}

/** Most rows shown or mapped: far beyond any real test (50 readings) but bounded. */
export const MAX_CSV_ROWS = 1000

/** The delimiter of the first non-blank line: the most frequent of tab, semicolon and comma outside quotes (comma on a tie). */
export function detectDelimiter(text: string): string {
  const first = text.split(/\r?\n/).find(l => l.trim() !== '') ?? ''
  const unquoted = first.replace(/"[^"]*"/g, '')
  const count = (d: string) => unquoted.split(d).length - 1
  return [';', '\t'].reduce((best, d) => (count(d) > count(best) ? d : best), ',')
}

/** Splits CSV text (comma, semicolon or tab; quotes; BOM dropped) into rows with line numbers. */
export function readCsvTable(text: string): CsvTable {
  const clean = text.replace(/^\uFEFF/, '')
  const parsed = Papa.parse<string[]>(clean, { skipEmptyLines: false, delimiter: detectDelimiter(clean) })
  const rows: CsvTable['rows'] = []
  parsed.data.forEach((cells, i) => {
    if (cells.every(c => c.trim() === '')) return
    if (rows.length < MAX_CSV_ROWS) rows.push({ line: i + 1, cells: cells.map(c => c.trim()) })
  })
  return { rows, delimiter: parsed.meta.delimiter }
}

const NUMBER = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/

/** A cell as a number, or the reason it is not one. */
export function cellNumber(cell: string | undefined): number | string {
  const text = (cell ?? '').trim()
  if (text === '') return 'is empty'
  if (/^[+-]?\d+,\d+$/.test(text)) return `"${text}" uses a decimal comma; write it with a point (${text.replace(',', '.')})`
  if (!NUMBER.test(text)) return `"${text.slice(0, 40)}" is not a number`
  const n = Number(text)
  return Number.isFinite(n) ? n : `"${text.slice(0, 40)}" is not a finite number`
}

/** Whether the first row looks like column names (any non-blank cell that is not a number). */
export function looksLikeHeader(cells: readonly string[]): boolean {
  return cells.some(c => c !== '' && typeof cellNumber(c) === 'string')
}

/** A first guess at the mapping from the header (pressure: "Pa", "pressure", "dP"; flow: "cfm", "flow", "m3/h"). */
export function suggestMapping(table: CsvTable): ReadingsMapping {
  const first = table.rows[0]?.cells ?? []
  const hasHeader = looksLikeHeader(first)
  let pressureColumn = hasHeader ? first.findIndex(c => /press|\bpa\b|\(pa\)|d\s?p\b|Δp/i.test(c)) : -1
  let flowColumn = hasHeader ? first.findIndex((c, i) => i !== pressureColumn && /flow|cfm|m3|m³|\bq\b/i.test(c)) : -1
  if (pressureColumn < 0) pressureColumn = 0
  if (flowColumn < 0) flowColumn = pressureColumn === 1 ? 0 : 1
  return { pressureColumn, flowColumn, hasHeader, flipSign: false }
}

/** The name of a column for problems: its header or "column N". */
export function columnName(table: CsvTable, mapping: Pick<ReadingsMapping, 'hasHeader'>, index: number): string {
  const header = mapping.hasHeader ? table.rows[0]?.cells[index] : undefined
  return header ? `${header} (column ${index + 1})` : `column ${index + 1}`
}

/**
 * Maps the rows to readings and lists every problem with its line: non-numbers, decimal commas,
 * flows that are not positive, too many readings, then the test's own reading rules (sign for the
 * direction, 1–100 Pa after the baseline, no repeated pressure) for the direction given.
 */
export function mapReadings(table: CsvTable, mapping: ReadingsMapping, test: { direction: TestDirection, baseline?: Baseline | undefined }): MappedReadings {
  const problems: CsvProblem[] = []
  const readings: MappedReading[] = []
  const width = Math.max(0, ...table.rows.map(r => r.cells.length))
  for (const [field, index] of [['pressureColumn', mapping.pressureColumn], ['flowColumn', mapping.flowColumn]] as const) {
    if (!Number.isInteger(index) || index < 0 || index >= width) problems.push({ line: 0, column: field, reason: `column ${index + 1} does not exist (the file has ${width})` })
  }
  if (mapping.pressureColumn === mapping.flowColumn) problems.push({ line: 0, column: 'flowColumn', reason: 'pressure and flow must be different columns' })
  if (problems.length) return { readings, problems }

  const pName = columnName(table, mapping, mapping.pressureColumn)
  const fName = columnName(table, mapping, mapping.flowColumn)
  const data = mapping.hasHeader ? table.rows.slice(1) : table.rows
  if (data.length === 0) problems.push({ line: 0, column: '(file)', reason: 'has no readings' })
  for (const row of data) {
    const p = cellNumber(row.cells[mapping.pressureColumn])
    const f = cellNumber(row.cells[mapping.flowColumn])
    if (typeof p === 'string') problems.push({ line: row.line, column: pName, reason: p })
    if (typeof f === 'string') problems.push({ line: row.line, column: fName, reason: f })
    else if (f <= 0) problems.push({ line: row.line, column: fName, reason: 'flow must be greater than zero' })
    if (typeof p === 'number' && typeof f === 'number' && f > 0) readings.push({ line: row.line, pressure: mapping.flipSign ? -p : p, flow: f })
  }
  if (data.length > MAX_READINGS) problems.push({ line: data[MAX_READINGS]!.line, column: '(file)', reason: `at most ${MAX_READINGS} readings are accepted; the file has ${data.length}` })
  if (problems.length === 0) {
    checkTestReadings({ direction: test.direction, baseline: test.baseline, readings }, {
      addIssue(issue) {
        const index = typeof issue.path[1] === 'number' ? issue.path[1] : -1
        const reading = readings[index]
        problems.push({ line: reading?.line ?? 0, column: pName, reason: issue.message })
      },
    })
  }
  problems.sort((a, b) => a.line - b.line)
  return { readings: problems.length ? [] : readings, problems }
}
