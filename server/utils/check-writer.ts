import { checks } from '../database/schema'

type NewCheck = typeof checks.$inferInsert

interface Pending { row: NewCheck, resolve: (id: number) => void, reject: (error: unknown) => void }

let queue: Pending[] = []
let scheduled = false
const MAX_GROUP = 200

/**
 * Stores a check and resolves with its id once it is committed. Checks arriving together are
 * written in one multi-row INSERT (group commit): each still waits for its own durable commit,
 * but a burst costs one transaction instead of one each.
 */
export function recordCheck(row: NewCheck): Promise<number> {
  return new Promise((resolve, reject) => {
    queue.push({ row, resolve, reject })
    if (!scheduled) {
      scheduled = true
      setImmediate(flush)
    }
  })
}

async function flush() {
  const group = queue.slice(0, MAX_GROUP)
  queue = queue.slice(MAX_GROUP)
  scheduled = queue.length > 0
  if (scheduled) setImmediate(flush)
  try {
    const db = await useDb()
    const rows = await db.insert(checks).values(group.map(p => p.row)).returning({ id: checks.id })
    // One INSERT assigns increasing ids in VALUES order; RETURNING's own order is not promised.
    const ids = rows.map(r => r.id).sort((a, b) => a - b)
    group.forEach((p, i) => p.resolve(ids[i]!))
  }
  catch (error) {
    group.forEach(p => p.reject(error))
  }
}
