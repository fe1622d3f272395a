import { existsSync, mkdirSync } from 'node:fs'
import { dirname, join, resolve } from 'node:path'
import { createClient, type Client } from '@libsql/client'
import Database from 'libsql'
import { drizzle, type LibSQLDatabase } from 'drizzle-orm/libsql'
import { migrate } from 'drizzle-orm/libsql/migrator'
import * as schema from '../database/schema'

export type Db = LibSQLDatabase<typeof schema>
export { schema }

/** The default database: a file under .data/ in the working directory. */
export const DEFAULT_DATABASE_URL = 'file:.data/tightwell.db'

export function databaseUrl(): string {
  return process.env.NUXT_DATABASE_URL || process.env.DATABASE_URL || DEFAULT_DATABASE_URL
}

/** Where the migrations are: beside the built server, or drizzle/ in the project during dev and tests. */
function migrationsFolder(): string {
  const candidates = [
    process.env.TIGHTWELL_MIGRATIONS_DIR,
    process.argv[1] ? join(dirname(resolve(process.argv[1])), 'drizzle') : undefined,
    resolve(process.cwd(), 'drizzle'),
    resolve(process.cwd(), '.output/server/drizzle'),
  ]
  const found = candidates.find(c => c && existsSync(join(c, 'meta', '_journal.json')))
  if (!found) throw new Error(`Tightwell: no drizzle migrations found (looked in ${candidates.filter(Boolean).join(', ')})`)
  return found
}

let client: Client | undefined
let ready: Promise<Db> | undefined
let writer: NativeDb | null | undefined

/** The file behind a `file:` URL (not an in-memory one), or null. */
function localPath(url: string): string | null {
  if (!url.startsWith('file:')) return null
  const path = url.slice('file:'.length).split('?')[0]!.replace(/^\/\/(?=\/)/, '')
  return path && path !== ':memory:' ? path : null
}

function synchronous(): 'FULL' | 'NORMAL' {
  return process.env.TIGHTWELL_SYNCHRONOUS === 'FULL' ? 'FULL' : 'NORMAL'
}

async function open(): Promise<Db> {
  const url = databaseUrl()
  const isFile = url.startsWith('file:')
  const path = localPath(url)
  if (path) mkdirSync(dirname(resolve(path)), { recursive: true })
  // `timeout` is SQLite's busy timeout for file databases (ms).
  // A file database gets ONE connection: libSQL's calls are synchronous on this thread, so more
  // connections add no parallelism, and per-connection settings (below) then hold for every query.
  // All multi-statement writes use db.batch (no interactive transactions that would hold it).
  client = createClient({ url, authToken: process.env.NUXT_DATABASE_AUTH_TOKEN || undefined, timeout: 5000, ...(isFile ? { concurrency: 1 } : {}) })
  if (isFile) {
    // WAL lets readers work while one writer commits; it is a property of the file, set once.
    await client.execute('PRAGMA journal_mode = WAL')
    await client.execute('PRAGMA foreign_keys = ON')
    // In WAL mode NORMAL never corrupts the file; it fsyncs at checkpoints rather than at every
    // commit, so a power cut (not a process crash) may lose the last moments of commits.
    // TIGHTWELL_SYNCHRONOUS=FULL restores an fsync per commit.
    await client.execute(`PRAGMA synchronous = ${synchronous()}`)
  }
  const db = drizzle(client, { schema, casing: 'snake_case' })
  await migrate(db, { migrationsFolder: migrationsFolder() })
  await seedIfEmpty(db)
  return db
}

/**
 * The database, once migrations (and the demo seed, when on) have been applied.
 * Every handler awaits this: Nitro does not wait for async plugins before serving.
 */
export function useDb(): Promise<Db> {
  ready ??= open().catch((error) => {
    ready = undefined
    throw error
  })
  return ready
}

/** The raw libSQL client, for the few hot-path reads that skip the query builder. */
export async function useClient(): Promise<Client> {
  await useDb()
  return client!
}

export type NativeDb = InstanceType<typeof Database>

/**
 * For a file database: a second connection straight on libSQL's native engine (the one
 * @libsql/client itself drives for `file:` URLs), for the one hot write that needs a prepared
 * statement kept across calls — the stored check (see check-writer.ts). The client prepares
 * every statement anew and converts every argument, which cost more than the insert itself.
 * Null for a remote database (sqld): there the client is the only way in.
 * Both connections run on this thread, one call at a time, so they never wait for each other;
 * another process waits up to the same busy timeout.
 */
export async function useNativeWriter(): Promise<NativeDb | null> {
  await useDb()
  if (writer === undefined) {
    const path = localPath(databaseUrl())
    if (!path) {
      writer = null
    }
    else {
      const db = new Database(path, { timeout: 5000 })
      db.exec('PRAGMA foreign_keys = ON')
      db.exec(`PRAGMA synchronous = ${synchronous()}`)
      writer = db
    }
  }
  return writer
}

/** For tests and shutdown. */
export function closeDb(): void {
  writer?.close()
  writer = undefined
  client?.close()
  client = undefined
  ready = undefined
}
