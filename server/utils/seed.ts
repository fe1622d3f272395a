import { sql } from 'drizzle-orm'
import type { Db } from './db'
import {
  adoptedEditions, draftRules, jurisdictionCounties, jurisdictions, rulebookState, ruleSets, ruleSetVersions, users,
  zoneMapCounties, zoneMaps,
} from '../database/schema'
import { DEMO_PASSWORD, demoMode } from './demo'
import { loadModelTables } from './model-tables'

/**
 * The invented demo scenario: two jurisdictions, five people, two tiny zone maps and the model
 * limit tables from rules/ published as version 1. Every name of a person or department is made
 * up; the counties are real geography (Kitsap County WA, Denver CO) with their zones entered by
 * hand [from memory; confirmed by the county files in ../shared/reference, which the tests read].
 * Runs only on an empty database with demo mode on.
 */
export async function seedIfEmpty(db: Db): Promise<void> {
  if (!demoMode()) return
  const [row] = await db.select({ count: sql<number>`count(*)` }).from(users)
  if (row && row.count > 0) return

  const passwordHash = await hashPassword(DEMO_PASSWORD)
  const models = await loadModelTables()

  const [map2021, mapOld] = await db.insert(zoneMaps).values([
    { name: 'IECC 2021 county climate zones (demo excerpt)', edition: 'IECC 2021', source: 'Entered by hand for the demo: only the demo jurisdictions\' counties. Import the full map from your own data set.' },
    { name: 'IECC 2006–2018 county climate zones (demo excerpt)', edition: 'IECC 2006–2018', source: 'Entered by hand for the demo: only the demo jurisdictions\' counties. Import the full map from your own data set.' },
  ]).returning()
  await db.insert(zoneMapCounties).values([
    // Kitsap moved from 4C to 5C with the 2021 map; Denver is 5B on both.
    { zoneMapId: map2021!.id, countyFips: '53035', zone: '5C', countyName: 'Kitsap', stateCode: 'WA' },
    { zoneMapId: map2021!.id, countyFips: '08031', zone: '5B', countyName: 'Denver', stateCode: 'CO' },
    { zoneMapId: mapOld!.id, countyFips: '53035', zone: '4C', countyName: 'Kitsap', stateCode: 'WA' },
    { zoneMapId: mapOld!.id, countyFips: '08031', zone: '5B', countyName: 'Denver', stateCode: 'CO' },
  ])

  const [alder, juniper] = await db.insert(jurisdictions).values([
    { name: 'Alder Valley Building Department', kind: 'county', stateCode: 'WA', contactEmail: 'permits@aldervalley.test', zoneMapId: map2021!.id, notes: 'Demo: keeps the 2021 map as its default for the next edition; its adopted editions use the older map.' },
    { name: 'City of Juniper Flats', kind: 'city', stateCode: 'CO', contactEmail: 'energy@juniperflats.test', zoneMapId: mapOld!.id, notes: '' },
  ]).returning()
  await db.insert(jurisdictionCounties).values([
    { jurisdictionId: alder!.id, countyFips: '53035' },
    { jurisdictionId: juniper!.id, countyFips: '08031' },
  ])

  const [admin] = await db.insert(users).values([
    { email: 'admin@tightwell.test', name: 'Imogen Castellanos', role: 'admin', passwordHash },
    { email: 'rater@tightwell.test', name: 'Tobias Wren', role: 'rater', passwordHash },
    { email: 'rater2@tightwell.test', name: 'Priya Halvorsen', role: 'rater', passwordHash },
    { email: 'reviewer@tightwell.test', name: 'Marguerite Okafor', role: 'reviewer', passwordHash, jurisdictionId: alder!.id },
    { email: 'reviewer2@tightwell.test', name: 'Desmond Achterberg', role: 'reviewer', passwordHash, jurisdictionId: juniper!.id },
  ]).onConflictDoNothing().returning()

  const setIds = new Map<string, number>()
  for (const model of models) {
    const [set] = await db.insert(ruleSets).values({ name: model.name, code: model.code, edition: model.edition, description: model.description, draftRevision: 1 }).returning()
    setIds.set(model.file, set!.id)
    await db.insert(draftRules).values(model.rules.map((r, position) => ({ ...r, ruleSetId: set!.id, position, logic: JSON.stringify(r.logic) })))
    await db.insert(ruleSetVersions).values({
      ruleSetId: set!.id,
      number: 1,
      note: `Model table shipped with Tightwell (rules/${model.file})`,
      rules: JSON.stringify(model.rules),
      publishedById: admin?.id ?? null,
      publishedByName: admin?.name ?? 'Tightwell',
    })
  }
  const set = (file: string) => {
    const id = setIds.get(file)
    if (!id) throw new Error(`demo seed: rules/${file} is not in rules/index.json`)
    return id
  }
  // Invented adoption dates.
  await db.insert(adoptedEditions).values([
    { jurisdictionId: alder!.id, name: 'IECC 2012', ruleSetId: set('iecc-2012.csv'), zoneMapId: mapOld!.id, effectiveFrom: '2013-07-01', effectiveUntil: '2016-06-30' },
    { jurisdictionId: alder!.id, name: 'IECC 2015', ruleSetId: set('iecc-2015.csv'), zoneMapId: mapOld!.id, effectiveFrom: '2016-07-01', effectiveUntil: null },
    { jurisdictionId: juniper!.id, name: 'IECC 2009', ruleSetId: set('iecc-2009.csv'), effectiveFrom: '2011-01-01', effectiveUntil: '2013-12-31' },
    { jurisdictionId: juniper!.id, name: 'IECC 2012', ruleSetId: set('iecc-2012.csv'), effectiveFrom: '2014-01-01', effectiveUntil: '2016-12-31' },
    { jurisdictionId: juniper!.id, name: 'IECC 2015', ruleSetId: set('iecc-2015.csv'), effectiveFrom: '2017-01-01', effectiveUntil: null },
  ])
  await db.insert(rulebookState).values({ id: 1, generation: 1 })
    .onConflictDoUpdate({ target: rulebookState.id, set: { generation: sql`${rulebookState.generation} + 1` } })
}
