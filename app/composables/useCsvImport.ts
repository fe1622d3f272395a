import Papa from 'papaparse'
import {
  IMPORT_MAX_BYTES, IMPORT_MAX_LABEL, detectDelimiter, detectZoneColumns, mapLimitRecords, mapZoneRecords, readCsv, tableFromRows,
  type CsvTable, type ImportProblem, type ZoneColumns,
} from '#shared/rules'

export type ImportKind = 'zone-map' | 'limits'

export interface ImportPreview {
  table: CsvTable
  columns: ZoneColumns
  ignored: string[]
  rowCount: number
  problems: ImportProblem[]
  warnings: ImportProblem[]
}

/**
 * Client side of a CSV import: read a file (papaparse, in chunks with progress) or pasted text,
 * map the columns with the same shared code the server uses, and show every problem before
 * anything is sent. The server parses and validates the same text again, all or nothing.
 */
export function useCsvImport(kind: ImportKind) {
  const text = ref('')
  const fileName = ref('')
  const progress = ref<number | null>(null)
  const preview = shallowRef<ImportPreview | null>(null)
  const columns = ref<ZoneColumns>({})
  const tooLarge = ref('')

  function analyse(table: CsvTable, chosen?: ZoneColumns) {
    if (kind === 'zone-map') {
      const detected = detectZoneColumns(table.header)
      const cols = chosen ?? detected.columns
      const used = new Set(Object.values(cols))
      const mapped = mapZoneRecords(table, cols)
      columns.value = cols
      preview.value = { table, columns: cols, ignored: table.header.filter(h => !used.has(h)), rowCount: table.records.length, problems: mapped.problems, warnings: mapped.warnings }
    }
    else {
      const mapped = mapLimitRecords(table)
      preview.value = { table, columns: {}, ignored: [], rowCount: table.records.length, problems: mapped.problems, warnings: mapped.warnings }
    }
  }

  function checkSize(bytes: number): boolean {
    tooLarge.value = bytes > IMPORT_MAX_BYTES ? `The file is ${(bytes / 1024 / 1024).toFixed(1)} MB; the limit is ${IMPORT_MAX_LABEL}. Split it and import the parts with "merge".` : ''
    return !tooLarge.value
  }

  /** Parses a chosen file in 512 KB chunks, reporting progress between chunks. */
  async function readFile(file: File) {
    preview.value = null
    fileName.value = file.name
    if (!checkSize(file.size)) return
    const head = await file.slice(0, 64 * 1024).text()
    const delimiter = detectDelimiter(head)
    const rows: string[][] = []
    progress.value = 0
    let read = 0
    await new Promise<void>((resolve, reject) => {
      Papa.parse<string[]>(file, {
        delimiter,
        skipEmptyLines: false,
        chunkSize: 512 * 1024,
        chunk: (results) => {
          for (const row of results.data) rows.push(row)
          read += 512 * 1024
          progress.value = Math.min(0.99, read / Math.max(file.size, 1))
        },
        complete: () => resolve(),
        error: (error: Error) => reject(error),
      })
    })
    text.value = await file.text()
    progress.value = 1
    analyse(tableFromRows(rows, delimiter))
  }

  function readText(value: string) {
    fileName.value = ''
    text.value = value
    if (!value.trim()) { preview.value = null; return }
    if (!checkSize(new TextEncoder().encode(value).byteLength)) return
    analyse(readCsv(value))
  }

  function setColumns(next: ZoneColumns) {
    if (preview.value) analyse(preview.value.table, next)
  }

  function reset() {
    text.value = ''
    fileName.value = ''
    progress.value = null
    preview.value = null
    tooLarge.value = ''
  }

  return { text, fileName, progress, preview, columns, tooLarge, readFile, readText, setColumns, reset }
}
