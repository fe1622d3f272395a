import { eq, sql } from 'drizzle-orm'
import type { Db } from './db'
import {
  adoptedEditions, draftRules, filingRevisions, filings, filingTransitions, jurisdictionCounties, jurisdictions, mailOutbox, projects,
  rulebookState, ruleSets, ruleSetVersions, testRecords, users, zoneMapCounties, zoneMaps,
} from '../database/schema'
import { CheckRequest } from '../../shared/checks'
import { checkRequestOf, type FilingSnapshot } from '../../shared/filings/snapshot'
import { ruleTerms } from '../../shared/rules/logic'
import { applicableRules } from '../../shared/rules/resolve'
import type { RuleRow } from '../../shared/rules/table'
import { buildCheckResponse } from './checker'
import { outboxValues, publicBaseUrl } from './mail'
import { projectSnapshotOf, testValues } from './projects'
import type { ResolvedRules } from './rulebook'
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
  const editions = await db.insert(adoptedEditions).values([
    { jurisdictionId: alder!.id, name: 'IECC 2012', ruleSetId: set('iecc-2012.csv'), zoneMapId: mapOld!.id, effectiveFrom: '2013-07-01', effectiveUntil: '2016-06-30' },
    { jurisdictionId: alder!.id, name: 'IECC 2015', ruleSetId: set('iecc-2015.csv'), zoneMapId: mapOld!.id, effectiveFrom: '2016-07-01', effectiveUntil: null },
    { jurisdictionId: juniper!.id, name: 'IECC 2009', ruleSetId: set('iecc-2009.csv'), effectiveFrom: '2011-01-01', effectiveUntil: '2013-12-31' },
    { jurisdictionId: juniper!.id, name: 'IECC 2012', ruleSetId: set('iecc-2012.csv'), effectiveFrom: '2014-01-01', effectiveUntil: '2016-12-31' },
    { jurisdictionId: juniper!.id, name: 'IECC 2015', ruleSetId: set('iecc-2015.csv'), effectiveFrom: '2017-01-01', effectiveUntil: null },
  ]).returning()
  await db.insert(rulebookState).values({ id: 1, generation: 1 })
    .onConflictDoUpdate({ target: rulebookState.id, set: { generation: sql`${rulebookState.generation} + 1` } })

  const iecc2015 = models.find(m => m.file === 'iecc-2015.csv')
  const juniperEdition = editions.find(e => e.jurisdictionId === juniper!.id && e.name === 'IECC 2015')
  const [version] = await db.select().from(ruleSetVersions).where(eq(ruleSetVersions.ruleSetId, set('iecc-2015.csv')))
  const rater = await db.query.users.findFirst({ where: eq(users.email, 'rater@tightwell.test') })
  const reviewer = await db.query.users.findFirst({ where: eq(users.email, 'reviewer2@tightwell.test') })
  if (!iecc2015 || !juniperEdition || !version || !rater || !reviewer) return
  await seedDemoProjects(db, {
    rater,
    reviewerEmail: reviewer.email,
    jurisdiction: { id: juniper!.id, name: juniper!.name, kind: juniper!.kind, stateCode: juniper!.stateCode, contactEmail: juniper!.contactEmail },
    edition: { id: juniperEdition.id, name: juniperEdition.name, effectiveFrom: juniperEdition.effectiveFrom, effectiveUntil: juniperEdition.effectiveUntil },
    zoneMap: { id: mapOld!.id, name: mapOld!.name, edition: mapOld!.edition, revision: mapOld!.revision },
    ruleSet: { id: version.ruleSetId, name: iecc2015.name, code: iecc2015.code, edition: iecc2015.edition },
    version: { id: version.id, number: version.number, publishedAt: version.publishedAt.toISOString() },
    rules: iecc2015.rules,
  })
}

interface DemoContext {
  rater: { id: number, name: string }
  reviewerEmail: string
  jurisdiction: ResolvedRules['jurisdiction']
  edition: ResolvedRules['edition']
  zoneMap: ResolvedRules['zoneMap']
  ruleSet: ResolvedRules['ruleSet']
  version: ResolvedRules['ruleSetVersion']
  rules: RuleRow[]
}

/** Readings on a power law Q = C·ΔP^0.65 through the given CFM50, with a little invented scatter. */
function demoReadings(cfm50: number): { pressure: number, flow: number }[] {
  const scatter = [1.006, 0.995, 1.003, 1, 0.997]
  return [60, 50, 40, 30, 20].map((p, i) => ({ pressure: -p, flow: Math.round(cfm50 * (p / 50) ** 0.65 * scatter[i]!) }))
}

/**
 * Two invented projects of the demo rater in the City of Juniper Flats (Denver County, zone 5B,
 * IECC 2015 in force): one with a rough-in and a final test whose final is filed and waiting in
 * the demo reviewer's queue, one with a rough-in only. The rulebook cannot be read while the
 * database is still opening, so the rules in force are assembled here from what was just seeded;
 * the check itself is the checker's (buildCheckResponse).
 */
async function seedDemoProjects(db: Db, ctx: DemoContext): Promise<void> {
  const withTerms = ctx.rules.map(r => ({ ...r, terms: ruleTerms(r.logic) }))
  const resolvedFor = (buildingType: 'detached' | 'attached'): ResolvedRules => {
    const rules = applicableRules(withTerms, '5B', buildingType)
    return {
      ok: true, generation: 1, jurisdiction: ctx.jurisdiction, edition: ctx.edition, zoneMap: ctx.zoneMap, countyFips: '08031', zone: '5B',
      ruleSet: ctx.ruleSet, ruleSetVersion: ctx.version, rules, limits: rules.filter(r => r.kind === 'limit'), advisories: rules.filter(r => r.kind === 'advisory'),
    }
  }
  const county = { fips: '08031', name: 'Denver' }
  const [quillback, sagebrush] = await db.insert(projects).values([
    {
      ownerId: ctx.rater.id, addressLine: '1187 Quillback Lane', city: 'Juniper Flats', stateCode: 'CO', postalCode: '80202', countyFips: '08031',
      permitNumber: 'JF-2025-04417', permitDate: '2025-03-10', builderCompany: 'Bristlecone Homebuilders', builderContact: 'Renata Voss, site lead',
      buildingType: 'detached', units: 'ip', volume: 21600, floorArea: 2400, enclosureArea: 5120, height: 19,
      notes: 'Two-storey detached house over a conditioned basement.',
    },
    {
      ownerId: ctx.rater.id, addressLine: '52 Sagebrush Row', city: 'Juniper Flats', stateCode: 'CO', postalCode: '80202', countyFips: '08031',
      permitNumber: 'JF-2025-05102', permitDate: '2025-05-20', builderCompany: 'Tamarack & Pell Builders', builderContact: 'Osric Pell',
      buildingType: 'attached', units: 'ip', volume: 14400, floorArea: 1600, enclosureArea: 3650, height: 20,
      notes: 'End unit of a row of four.',
    },
  ]).returning()
  const base = {
    tester: ctx.rater.name, wind: 'calm' as const, direction: 'depressurization' as const, baselineBefore: -1.1, baselineAfter: -0.9,
    assumedExponent: null, safety: ['combustion', 'fire', 'dust', 'people', 'openings'], notes: '',
    equipment: 'Calibrated blower fan with flow rings; two-channel digital manometer, calibrated 2025-01-14',
  }
  const tests = [
    { project: quillback!, test: { ...base, testedOn: '2025-06-18', stage: 'rough-in' as const, insideTemperature: 71, outsideTemperature: 84, readings: demoReadings(1380), statedCfm50: 1380, statedAch50: 3.83, notes: 'Top plates and rim joists not yet sealed.' } },
    { project: quillback!, test: { ...base, testedOn: '2025-09-02', stage: 'final' as const, insideTemperature: 70, outsideTemperature: 66, readings: demoReadings(936), statedCfm50: 936, statedAch50: 2.6, notes: 'After sealing the rim joists and the attic hatch.' } },
    { project: sagebrush!, test: { ...base, testedOn: '2025-08-12', stage: 'rough-in' as const, wind: 'light' as const, insideTemperature: 72, outsideTemperature: 79, readings: demoReadings(790), statedCfm50: null, statedAch50: null } },
  ]
  const stored = []
  for (const { project, test } of tests) {
    const projectSnap = projectSnapshotOf(project)
    const request = CheckRequest.parse(checkRequestOf(projectSnap, test))
    const response = buildCheckResponse(ctx.rater, request, county, resolvedFor(project.buildingType), new Date(`${test.testedOn}T18:00:00Z`))
    const [row] = await db.insert(testRecords).values({
      ...testValues(test), projectId: project.id,
      verdict: response.verdict, cfm50: response.metrics.cfm50, ach50: response.metrics.ach50, ruleSetVersionId: ctx.version.id,
      checkedAt: new Date(response.checkedAt), check: JSON.stringify(response), checkProblem: null,
    }).returning()
    stored.push({ project, test, row: row!, response, projectSnap })
  }

  // The final of Quillback Lane, filed and waiting for the reviewer.
  const final = stored[1]!
  const filedAt = new Date('2025-09-03T15:20:00Z')
  const token = 'demo-seed'
  const [filing] = await db.insert(filings).values({
    testId: final.row.id, projectId: final.project.id, raterId: ctx.rater.id, jurisdictionId: ctx.jurisdiction.id,
    status: 'filed', version: 2, changeToken: token, revision: 1, firstSubmittedAt: filedAt, submittedAt: filedAt,
    addressLine: final.project.addressLine, city: final.project.city, permitNumber: final.project.permitNumber, permitDate: final.project.permitDate,
    raterName: ctx.rater.name, stage: 'final', testedOn: final.test.testedOn, zone: '5B', verdict: final.response.verdict,
    cfm50: final.response.metrics.cfm50, ach50: final.response.metrics.ach50,
  }).returning()
  const note = 'Final test after air sealing; the rough-in is on the project for comparison.'
  const snapshot: FilingSnapshot = { project: final.projectSnap, test: final.test, files: [], note }
  await db.insert(filingRevisions).values({
    filingId: filing!.id, number: 1, snapshot: JSON.stringify(snapshot), check: JSON.stringify(final.response), verdict: final.response.verdict,
    ruleSetVersionId: ctx.version.id, submittedById: ctx.rater.id, submittedByName: ctx.rater.name, submittedAt: filedAt,
  })
  await db.insert(filingTransitions).values({ filingId: filing!.id, action: 'submit', fromState: 'draft', toState: 'filed', userId: ctx.rater.id, userName: ctx.rater.name, note, revision: 1, at: filedAt })
  await db.insert(mailOutbox).values(outboxValues({
    kind: 'filing-submitted', to: ctx.reviewerEmail, filingId: filing!.id,
    subject: `Filed for review: ${final.project.addressLine}, ${final.project.city} CO (permit ${final.project.permitNumber})`,
    body: `${ctx.rater.name} filed the final air-leakage test of ${final.project.addressLine}, ${final.project.city} CO, permit ${final.project.permitNumber}, with ${ctx.jurisdiction.name}.\n\nOpen the filing: ${publicBaseUrl()}/filings/${filing!.id}`,
  }, filedAt))
}
