import type { User } from '#auth-utils'
import { ROLES, type Role } from '../../shared/types/roles'

/**
 * What the hot path (every signed-in request, every check) needs from the database without a
 * query each time: the active user rows and the rulebook generation.
 *
 * - Changes made by THIS process apply at once (the writers call userChanged / rulebookChanged).
 * - Changes made by ANOTHER process sharing the database are noticed by a poll of one tiny
 *   "stamp" query every TIGHTWELL_FRESHNESS_MS (default 250 ms): a deactivation or a publish
 *   there takes effect here within that interval.
 * - TIGHTWELL_FRESHNESS_MS=0 turns the cache off: the user row and the generation are read on
 *   every request (strict, slower).
 */
export interface CachedUser { user: User, generation: number }

function freshnessMs(): number {
  const raw = process.env.TIGHTWELL_FRESHNESS_MS
  const n = raw === undefined || raw === '' ? 250 : Number(raw)
  return Number.isFinite(n) && n >= 0 ? n : 250
}

const users = new Map<number, User>()
let generation: number | null = null
let usersStamp: string | null = null
let timer: ReturnType<typeof setInterval> | undefined

const STAMP = `select (select generation from rulebook_state where id = 1) as generation,
  (select coalesce(max(updated_at), 0) || ':' || count(*) from users) as users`

const USER_AND_GENERATION = `select u.id, u.email, u.name, u.role, u.jurisdiction_id, u.active,
  (select generation from rulebook_state where id = 1) as generation
  from users u where u.id = ?`

async function poll(): Promise<void> {
  try {
    const client = await useClient()
    const { rows } = await client.execute(STAMP)
    const row = rows[0]
    const nextUsers = String(row?.users ?? '')
    if (usersStamp !== null && nextUsers !== usersStamp) users.clear()
    usersStamp = nextUsers
    generation = row?.generation === null || row?.generation === undefined ? 0 : Number(row.generation)
  }
  catch {
    // The database is unreachable: drop what we know so requests read it (and fail) themselves.
    users.clear()
    generation = null
  }
}

function ensurePolling(): boolean {
  const ms = freshnessMs()
  if (ms === 0) return false
  if (!timer) {
    timer = setInterval(() => { void poll() }, ms)
    timer.unref()
  }
  return true
}

/** The active user with this id and the rulebook generation, or null when gone or deactivated. */
export async function freshUser(id: number): Promise<CachedUser | null> {
  const caching = ensurePolling()
  if (caching && usersStamp !== null && generation !== null) {
    const hit = users.get(id)
    if (hit) return { user: hit, generation }
  }
  const client = await useClient()
  const { rows } = await client.execute({ sql: USER_AND_GENERATION, args: [id] })
  const row = rows[0]
  const gen = row?.generation === null || row?.generation === undefined ? 0 : Number(row.generation)
  if (!row || !Number(row.active)) return null
  const role = String(row.role) as Role
  const user: User = {
    id: Number(row.id),
    email: String(row.email),
    name: String(row.name),
    role: ROLES.includes(role) ? role : 'rater',
    jurisdictionId: row.jurisdiction_id === null ? null : Number(row.jurisdiction_id),
  }
  if (caching) {
    if (usersStamp === null) await poll()
    users.set(id, user)
  }
  return { user, generation: gen }
}

/** A user row changed in this process (role, activation, password, name). */
export function userChanged(id: number): void {
  users.delete(id)
}

/** The rulebook generation as last seen, or null when it must be read. */
export function knownGeneration(): number | null {
  return freshnessMs() === 0 ? null : generation
}

/** A rule-table change is being written in this process: read the generation afresh. */
export function rulebookChanged(): void {
  generation = null
  void poll()
}
