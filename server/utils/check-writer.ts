import type { checks } from '../database/schema'

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
 * burst costs one statement and one transaction instead of one each. The statement is plain SQL
 * on the libSQL client (cached per group size) — the query builder costs more than the insert.
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
    const client = await useClient()
    const args: (string | number | null)[] = []
    for (const { row } of group) {
      for (const column of COLUMNS) args.push(row[column] ?? null)
    }
    const result = await client.execute({ sql: insertStatement(group.length), args })
    if (result.rowsAffected !== group.length || result.lastInsertRowid === undefined) {
      throw new Error(`stored ${result.rowsAffected} of ${group.length} checks`)
    }
    // One INSERT of n rows into an AUTOINCREMENT table takes n consecutive ids in VALUES order,
    // the last of which is lastInsertRowid.
    const first = Number(result.lastInsertRowid) - group.length + 1
    group.forEach((p, i) => p.resolve(first + i))
  }
  catch (error) {
    group.forEach(p => p.reject(error))
  }
}
