import { cpSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { createClient, type Client } from '@libsql/client'
import { drizzle } from 'drizzle-orm/libsql'
import { migrate } from 'drizzle-orm/libsql/migrator'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'

// drizzle/0004_filing-search.sql is hand-written (drizzle-kit does not model FTS5 tables): check
// that it indexes the filings a database already holds, and that its triggers follow later writes.
const MIGRATIONS = resolve(import.meta.dirname, '../../../drizzle')
let dir: string
let client: Client

const FILING_COLUMNS = `test_id, project_id, rater_id, jurisdiction_id, status, version, change_token, revision, first_submitted_at, submitted_at,
  address_line, city, permit_number, permit_date, rater_name, stage, tested_on, zone, verdict, cfm50, ach50, created_at, updated_at`
function filing(id: number, address: string, permit: string) {
  return { sql: `insert into filings (id, ${FILING_COLUMNS}) values (?, ${Array(23).fill('?').join(', ')})`, args: [id, id, 1, 1, 1, 'filed', 1, `t-${id}`, 1, 0, 0, address, 'Juniper Flats', permit, '2024-04-01', 'Tobias Wren', 'final', '2024-05-01', '5B', 'complies', 800, 2.7, 0, 0] }
}
const found = async (q: string) => (await client.execute({ sql: 'select rowid from filings_search where filings_search match ? order by rowid', args: [`"${q}"`] })).rows.map(r => Number(r.rowid))

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'tightwell-fts-'))
  // The migrations up to 0003, as a database made before the search index existed.
  const before = join(dir, 'before')
  cpSync(MIGRATIONS, before, { recursive: true })
  const journalPath = join(before, 'meta/_journal.json')
  const journal = JSON.parse(readFileSync(journalPath, 'utf8')) as { entries: { tag: string }[] }
  journal.entries = journal.entries.filter(e => e.tag < '0004')
  writeFileSync(journalPath, JSON.stringify(journal))
  rmSync(join(before, '0004_filing-search.sql'))
  client = createClient({ url: `file:${join(dir, 'db.sqlite')}`, concurrency: 1 })
  await migrate(drizzle(client), { migrationsFolder: before })
  // Only the filings table matters here: its parents (test, project, rater, jurisdiction) are left out.
  await client.execute('PRAGMA foreign_keys = OFF')
  await client.execute(filing(1, '410 Larkspur Court', 'JF-2024-0001'))
  await client.execute(filing(2, '27 Cedar Loop Road', 'JF-2024-0002'))
  await migrate(drizzle(client), { migrationsFolder: MIGRATIONS })
  await client.execute('PRAGMA foreign_keys = OFF')
})
afterAll(() => {
  client?.close()
  if (dir) rmSync(dir, { recursive: true, force: true })
})

describe('the review-queue search index (FTS5 trigram)', () => {
  it('indexes the filings that were there before the migration', async () => {
    expect(await found('arkspu')).toEqual([1])
    expect(await found('jf-2024-000')).toEqual([1, 2])
  })

  it('follows inserts, updates of the searched columns and deletes', async () => {
    await client.execute(filing(3, '9 Yarrow Bend', 'JF-2025-0003'))
    expect(await found('yarrow')).toEqual([3])
    await client.execute({ sql: 'update filings set address_line = ? where id = ?', args: ['9 Mallow Bend', 3] })
    expect(await found('yarrow')).toEqual([])
    expect(await found('mallow')).toEqual([3])
    await client.execute({ sql: 'update filings set status = ? where id = ?', args: ['accepted', 3] })
    expect(await found('mallow')).toEqual([3])
    await client.execute('delete from filings where id = 3')
    expect(await found('mallow')).toEqual([])
    expect(await found('cedar')).toEqual([2])
  })
})
