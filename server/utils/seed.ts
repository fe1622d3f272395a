import { sql } from 'drizzle-orm'
import type { Db } from './db'
import { jurisdictions, users } from '../database/schema'
import { DEMO_PASSWORD, demoMode } from './demo'

/**
 * The invented demo scenario: two jurisdictions and five people. Every name here is made up.
 * Runs only on an empty database with demo mode on.
 */
export async function seedIfEmpty(db: Db): Promise<void> {
  if (!demoMode()) return
  const [row] = await db.select({ count: sql<number>`count(*)` }).from(users)
  if (row && row.count > 0) return

  const passwordHash = await hashPassword(DEMO_PASSWORD)
  const [alder, juniper] = await db.insert(jurisdictions).values([
    { name: 'Alder Valley Building Department', kind: 'county', stateCode: 'WA', contactEmail: 'permits@aldervalley.test' },
    { name: 'City of Juniper Flats', kind: 'city', stateCode: 'CO', contactEmail: 'energy@juniperflats.test' },
  ]).returning()

  await db.insert(users).values([
    { email: 'admin@tightwell.test', name: 'Imogen Castellanos', role: 'admin', passwordHash },
    { email: 'rater@tightwell.test', name: 'Tobias Wren', role: 'rater', passwordHash },
    { email: 'rater2@tightwell.test', name: 'Priya Halvorsen', role: 'rater', passwordHash },
    { email: 'reviewer@tightwell.test', name: 'Marguerite Okafor', role: 'reviewer', passwordHash, jurisdictionId: alder!.id },
    { email: 'reviewer2@tightwell.test', name: 'Desmond Achterberg', role: 'reviewer', passwordHash, jurisdictionId: juniper!.id },
  ]).onConflictDoNothing()
}
