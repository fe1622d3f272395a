import type { User } from '#auth-utils'
import { and, asc, eq, sql } from 'drizzle-orm'
import { detectZoneColumns, mapZoneRecords, readCsv, type ImportProblem, type ZoneColumns, type ZoneImportRow } from '../../shared/rules/csv'
import { zoneMapCounties, zoneMaps } from '../database/schema'

export interface CountyZone { countyFips: string, zone: string, countyName: string | null, stateCode: string | null }

export async function loadZoneRows(zoneMapId: number): Promise<CountyZone[]> {
  const db = await useDb()
  return db.select({
    countyFips: zoneMapCounties.countyFips,
    zone: zoneMapCounties.zone,
    countyName: zoneMapCounties.countyName,
    stateCode: zoneMapCounties.stateCode,
  }).from(zoneMapCounties).where(eq(zoneMapCounties.zoneMapId, zoneMapId)).orderBy(asc(zoneMapCounties.countyFips))
}

/** The audit log keeps at most this many row changes per import, and the counts of all. */
const AUDIT_ROW_CAP = 1000

export interface ZoneImportResult {
  mode: 'replace' | 'merge'
  rowsInFile: number
  added: number
  changed: number
  removed: number
  unchanged: number
  rowCount: number
  revision: number
  columns: ZoneColumns
  ignoredColumns: string[]
  delimiter: string
  warnings: ImportProblem[]
  warningCount: number
}

/** Same county, same values? */
function same(a: CountyZone, b: CountyZone): boolean {
  return a.zone === b.zone && a.countyName === b.countyName && a.stateCode === b.stateCode
}

/**
 * Imports a zone-map CSV: parse → map columns → validate every row (all problems reported at
 * once, nothing written if any) → one transaction. `replace` makes the map exactly the file;
 * `merge` adds and updates the file's counties and keeps the others (and keeps stored county
 * names when the file has no name column).
 */
export async function importZoneMap(user: User, zoneMapId: number, mode: 'replace' | 'merge', csv: string, columnsIn?: ZoneColumns): Promise<ZoneImportResult> {
  const map = await findZoneMapOr404(zoneMapId)
  const table = readCsv(csv)
  const detected = detectZoneColumns(table.header)
  const columns = columnsIn && Object.keys(columnsIn).length ? columnsIn : detected.columns
  const used = new Set(Object.values(columns))
  const ignoredColumns = table.header.filter(h => !used.has(h))
  const mapped = mapZoneRecords(table, columns)
  if (mapped.problems.length) throw importRejected(mapped.problems)

  const existing = await loadZoneRows(zoneMapId)
  const before = new Map(existing.map(r => [r.countyFips, r]))
  const next = new Map<string, CountyZone>(mode === 'merge' ? before : [])
  const incoming: CountyZone[] = mapped.rows.map((r: ZoneImportRow) => ({
    countyFips: r.countyFips,
    zone: r.zone,
    countyName: r.countyName === undefined ? (mode === 'merge' ? before.get(r.countyFips)?.countyName ?? null : null) : r.countyName,
    stateCode: r.stateCode,
  }))
  for (const row of incoming) next.set(row.countyFips, row)

  const added: CountyZone[] = []
  const changed: { before: CountyZone, after: CountyZone }[] = []
  let unchanged = 0
  for (const row of incoming) {
    const old = before.get(row.countyFips)
    if (!old) added.push(row)
    else if (!same(old, row)) changed.push({ before: old, after: row })
    else unchanged += 1
  }
  const removed = mode === 'replace' ? existing.filter(r => !next.has(r.countyFips)) : []

  const db = await useDb()
  const statements: Statement[] = []
  if (mode === 'replace') {
    statements.push(db.delete(zoneMapCounties).where(eq(zoneMapCounties.zoneMapId, zoneMapId)))
    for (const part of chunks([...next.values()])) {
      statements.push(db.insert(zoneMapCounties).values(part.map(r => ({ ...r, zoneMapId }))))
    }
  }
  else {
    const writes = [...added, ...changed.map(c => c.after)]
    for (const part of chunks(writes)) {
      statements.push(db.insert(zoneMapCounties).values(part.map(r => ({ ...r, zoneMapId })))
        .onConflictDoUpdate({
          target: [zoneMapCounties.zoneMapId, zoneMapCounties.countyFips],
          set: { zone: sql`excluded.zone`, countyName: sql`excluded.county_name`, stateCode: sql`excluded.state_code` },
        }))
    }
  }
  const revision = map.revision + 1
  statements.push(db.update(zoneMaps).set({ revision: sql`${zoneMaps.revision} + 1`, updatedAt: new Date() }).where(eq(zoneMaps.id, zoneMapId)))
  statements.push(bumpGeneration(db))
  const summary = `Imported ${mapped.rows.length} rows (${mode}): ${added.length} added, ${changed.length} changed, ${removed.length} removed, ${unchanged} unchanged`
  const truncated = added.length + changed.length + removed.length > AUDIT_ROW_CAP
  statements.push(audit(db, user, 'zone-map.import', 'zone-map', zoneMapId, summary,
    { rowCount: existing.length, revision: map.revision, rows: [...changed.map(c => c.before), ...removed].slice(0, AUDIT_ROW_CAP), truncated },
    { rowCount: next.size, revision, mode, rows: [...changed.map(c => c.after), ...added].slice(0, AUDIT_ROW_CAP), removedFips: removed.slice(0, AUDIT_ROW_CAP).map(r => r.countyFips), truncated }))
  await runBatch(statements)
  return {
    mode,
    rowsInFile: mapped.rows.length,
    added: added.length,
    changed: changed.length,
    removed: removed.length,
    unchanged,
    rowCount: next.size,
    revision,
    columns,
    ignoredColumns,
    delimiter: table.delimiter,
    warnings: mapped.warnings.slice(0, 500),
    warningCount: mapped.warnings.length,
  }
}

/** Who uses a zone map (jurisdictions by default, editions by name): deleting it is refused while any do. */
export async function zoneMapUsers(zoneMapId: number): Promise<string[]> {
  const db = await useDb()
  const rows = await db.all<{ name: string }>(sql`
    select name from jurisdictions where zone_map_id = ${zoneMapId}
    union all
    select j.name || ' — ' || e.name from adopted_editions e join jurisdictions j on j.id = e.jurisdiction_id where e.zone_map_id = ${zoneMapId}`)
  return rows.map(r => r.name)
}

export async function countyRow(zoneMapId: number, fips: string): Promise<CountyZone | undefined> {
  const db = await useDb()
  const [row] = await db.select({
    countyFips: zoneMapCounties.countyFips,
    zone: zoneMapCounties.zone,
    countyName: zoneMapCounties.countyName,
    stateCode: zoneMapCounties.stateCode,
  }).from(zoneMapCounties).where(and(eq(zoneMapCounties.zoneMapId, zoneMapId), eq(zoneMapCounties.countyFips, fips)))
  return row
}
