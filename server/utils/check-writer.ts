import type { checks } from '../database/schema'
import type { NativeDb } from './db'

/** A check as stored: the `checks` row without its id, the time as epoch milliseconds. */
export type CheckRecord = Omit<typeof checks.$inferInsert, 'id' | 'createdAt'> & { createdAt: number }

interface Pending { row: CheckRecord, resolve: (id: number) => void, reject: (error: unknown) => void }

let queue: Pending[] = []
let scheduled = false
const MAX_GROUP = 200

// The columns of `checks` (server/database/schema.ts) in insert order; SQL names are snake_case
// as the schema's `casing` makes them. An e2e test stores and re-opens checks through this path.
const COLUMNS = [
  'userId', 'createdAt', 'verdict', 'jurisdictionId', 'ruleSetVersionId', 'zone', 'countyFips',
  'addressLine', 'city', 'stateCode', 'postalCode', 'permitDate', 'buildingType', 'cfm50', 'ach50',
  'request', 'response',
] as const satisfies readonly (keyof CheckRecord)[]
const COLUMN_LIST = COLUMNS.map(c => `"${c.replace(/[A-Z]/g, m => `_${m.toLowerCase()}`)}"`).join(', ')
const ROW_PLACEHOLDERS = `(${COLUMNS.map(() => '?').join(', ')})`
const statements = new Map<number, string>()

function insertStatement(rows: number): string {
  let sql = statements.get(rows)
  if (!sql) {
    sql = `INSERT INTO "checks" (${COLUMN_LIST}) VALUES ${Array.from({ length: rows }, () => ROW_PLACEHOLDERS).join(', ')}`
    statements.set(rows, sql)
  }
  return sql
}

/**
 * Stores a check and resolves with its id once it is committed. Checks arriving together are
 * written in one multi-row INSERT (group commit): each still waits for its own commit, but a
 * burst costs one statement and one transaction instead of one each. The statement is plain SQL,
 * prepared once per group size on the native connection (useNativeWriter) — the query builder,
 * and even the client's per-call preparation, cost more than the insert itself.
 */
export function recordCheck(row: CheckRecord): Promise<number> {
  return new Promise((resolve, reject) => {
    queue.push({ row, resolve, reject })
    if (!scheduled) {
      scheduled = true
      setImmediate(flush)
    }
  })
}

async function flush() {
  const group = queue.length <= MAX_GROUP ? queue : queue.slice(0, MAX_GROUP)
  queue = queue.length <= MAX_GROUP ? [] : queue.slice(MAX_GROUP)
  scheduled = queue.length > 0
  if (scheduled) setImmediate(flush)
  try {
    const args: (string | number | null)[] = []
    for (const { row } of group) {
      for (const column of COLUMNS) args.push(row[column] ?? null)
    }
    const { changes, lastId } = await insert(group.length, args)
    if (changes !== group.length) throw new Error(`stored ${changes} of ${group.length} checks`)
    // One INSERT of n rows into an AUTOINCREMENT table takes n consecutive ids in VALUES order,
    // the last of which is the last insert rowid.
    const first = lastId - group.length + 1
    group.forEach((p, i) => p.resolve(first + i))
  }
  catch (error) {
    group.forEach(p => p.reject(error))
  }
}

/** Prepared group inserts on the native connection, one per group size, kept while it is open. */
const prepared = new WeakMap<NativeDb, Map<number, ReturnType<NativeDb['prepare']>>>()

/** The group insert: prepared once on the native connection (file databases), else through the client (sqld). */
async function insert(rows: number, args: (string | number | null)[]): Promise<{ changes: number, lastId: number }> {
  const native = await useNativeWriter()
  if (native) {
    let statements = prepared.get(native)
    if (!statements) prepared.set(native, statements = new Map())
    const statement = statements.get(rows) ?? native.prepare(insertStatement(rows))
    statements.set(rows, statement)
    const info = statement.run(args)
    return { changes: info.changes, lastId: Number(info.lastInsertRowid) }
  }
  const client = await useClient()
  const result = await client.execute({ sql: insertStatement(rows), args })
  if (result.lastInsertRowid === undefined) throw new Error('the database gave no id for the stored checks')
  return { changes: result.rowsAffected, lastId: Number(result.lastInsertRowid) }
}
