import { existsSync, mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { gotoReady, launchBrowser, screenshot, signInThroughPage } from '../support/browser'
import { ROOT } from '../support/server'

const baseUrl = inject('baseUrl')
let browser: Browser

// The pre-2021 county file (open data: US DOE Building America county lists, via
// joesimeone/climate_regions) exercises the column mapping; without ../shared a small file stands in.
const REFERENCE = resolve(ROOT, '../shared/reference/county-zones-pre2021.csv')
const hasReference = existsSync(REFERENCE)
if (!hasReference) console.warn(`[rule-tables browser] ${REFERENCE} is absent: importing a 3-row stand-in instead.`)
function mapFile(): { path: string, rows: number, washington: number } {
  if (hasReference) return { path: REFERENCE, rows: 3237, washington: 39 } // 39 WA counties in the file
  const dir = mkdtempSync(join(tmpdir(), 'tightwell-map-'))
  const path = join(dir, 'map.csv')
  writeFileSync(path, 'State,State FIPS,County FIPS,IECC Climate Zone,IECC Moisture Regime,County Name\r\nWA,53,035,4,C,Kitsap\r\nWA,53,033,4,C,King\r\nCO,08,031,5,B,Denver\r\n')
  return { path, rows: 3, washington: 2 }
}

beforeAll(async () => { browser = await launchBrowser() })
afterAll(async () => { await browser?.close() })

describe('rule tables in a real browser', () => {
  it('the admin imports a zone map, edits a zone inline, and sees both in the table', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } })
    await signInThroughPage(page, baseUrl, 'admin@tightwell.test')
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Rule tables' }).click()
    await page.waitForURL(/\/jurisdictions$/)
    await page.getByRole('navigation', { name: 'Rule tables' }).getByRole('link', { name: 'Zone maps' }).click()
    await page.waitForURL(/\/zone-maps$/)
    expect(await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Rule tables' }).getAttribute('aria-current')).toBe('page')
    const create = page.locator('[data-test=zone-map-create]')
    await create.getByLabel('Name').fill('Browser import map')
    await create.getByLabel('Edition of the map').fill('IECC 2006–2018')
    await create.getByRole('button', { name: 'Create zone map' }).click()
    await page.waitForURL(/\/zone-maps\/\d+$/)
    await expect.poll(() => page.locator('[data-test=zone-map-title]').textContent()).toBe('Browser import map')

    const file = mapFile()
    const panel = page.locator('[data-test=csv-import]')
    await panel.getByLabel('CSV file').setInputFiles(file.path)
    await expect.poll(() => panel.locator('[data-test=import-preview]').textContent(), { timeout: 20_000 }).toContain(`${file.rows.toLocaleString('en-US')} rows`)
    // The separate State FIPS / County FIPS columns were recognised.
    expect(await panel.getByLabel('State FIPS (2 digits)').inputValue()).toBe('State FIPS')
    expect(await panel.getByLabel('Moisture letter').inputValue()).toBe('IECC Moisture Regime')
    await screenshot(page, 'zone-map-import-preview')
    await panel.getByRole('button', { name: `Import ${file.rows.toLocaleString('en-US')} rows (merge)` }).click()
    await expect.poll(() => panel.locator('[data-test=import-outcome]').textContent(), { timeout: 30_000 }).toContain(`Imported ${file.rows.toLocaleString('en-US')} rows`)
    await expect.poll(() => page.locator('[data-test=zone-count]').textContent()).toBe(`${file.rows.toLocaleString('en-US')} of ${file.rows.toLocaleString('en-US')} counties`)

    await page.getByLabel('State', { exact: true }).selectOption('WA')
    await expect.poll(() => page.locator('[data-test=zone-count]').textContent()).toBe(`${file.washington} of ${file.rows.toLocaleString('en-US')} counties`)
    await page.getByLabel('Search').fill('53035')
    const zone = page.getByLabel('Climate zone of 53035')
    // Kitsap WA is 4C on the pre-2021 map [../shared/reference/README.md].
    expect(await zone.inputValue()).toBe('4C')
    await zone.fill('3D')
    await expect.poll(() => zone.getAttribute('aria-invalid')).toBe('true')
    await expect.poll(() => page.locator('#zone-err-53035').textContent()).toContain('zone 3 takes A, B, C')
    await zone.fill('5C')
    await zone.press('Enter')
    await expect.poll(() => page.getByRole('status').first().textContent()).toContain('zone 4C → 5C')
    await expect.poll(() => page.locator('[data-test=csv-import]').count()).toBe(1)
    await screenshot(page, 'zone-map-table')
    await page.close()
  })

  it('the admin edits a limit inline, publishes, and sees the new version in the history', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } })
    await signInThroughPage(page, baseUrl, 'admin@tightwell.test')
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Rule tables' }).click()
    await page.getByRole('navigation', { name: 'Rule tables' }).getByRole('link', { name: 'Limit tables' }).click()
    await page.waitForURL(/\/rule-sets$/)
    const create = page.locator('[data-test=rule-set-create]')
    await create.getByLabel('Start from').selectOption({ label: 'IECC 2015 air leakage (model) (3 rules)' })
    await create.getByLabel('Name (optional)').fill('Browser limits')
    await create.getByRole('button', { name: 'Create limit table' }).click()
    await page.waitForURL(/\/rule-sets\/\d+$/)
    await expect.poll(() => page.locator('[data-test=rule-set-title]').textContent()).toBe('Browser limits')

    // Version 1 as shipped.
    await page.getByLabel('Note for version 1').fill('As shipped')
    await page.locator('[data-test=publish]').click()
    await expect.poll(() => page.locator('[data-test=version-history] [data-version="1"]').textContent()).toContain('As shipped')

    // Inline edit: the 3-8 limit (IECC 2015 R402.4.1.2: 3 ACH50) — a decimal comma is marked before saving.
    const limit = page.getByLabel('Limit of rule r2')
    expect(await limit.inputValue()).toBe('3')
    await limit.fill('2,5')
    await expect.poll(() => limit.getAttribute('aria-invalid')).toBe('true')
    await expect.poll(() => page.locator('[data-test="problems-r2"]').textContent()).toContain('use a point for decimals')
    expect(await page.locator('[data-test=save-draft]').isDisabled()).toBe(true)
    await limit.fill('2.5')
    await expect.poll(() => limit.getAttribute('aria-invalid')).toBe('false')
    await page.locator('[data-test=save-draft]').click()
    await expect.poll(() => page.getByRole('status').first().textContent()).toContain('Draft saved')

    await page.getByLabel('Note for version 2').fill('Zones 3-8 tightened to 2.5 ACH50')
    await page.locator('[data-test=publish]').click()
    await expect.poll(() => page.locator('[data-test=version-history] [data-version="2"]').textContent()).toContain('Zones 3-8 tightened to 2.5 ACH50')
    await expect.poll(() => page.locator('[data-test=rule-set-status]').textContent()).toContain('Published: version 2.')
    expect(await page.locator('[data-test=version-history] li').count()).toBe(2)

    await page.getByLabel('Compare').selectOption('1')
    await page.getByLabel('with', { exact: true }).selectOption('2')
    await page.getByRole('button', { name: 'Show the difference' }).click()
    await expect.poll(() => page.locator('[data-test=version-diff]').textContent()).toContain('Changed r2')
    expect(await page.locator('[data-test=version-diff]').textContent()).toContain('ACH50 ≤ 3 → ACH50 ≤ 2.5')
    await screenshot(page, 'limits-published')
    const url = page.url()
    await page.close()

    // A rater reads the same table, without editing controls.
    const rater = await browser.newPage()
    await signInThroughPage(rater, baseUrl, 'rater@tightwell.test')
    await gotoReady(rater, url)
    await expect.poll(() => rater.locator('[data-test=limits-table]').textContent()).toContain('ACH50 ≤ 2.5')
    expect(await rater.locator('[data-test=save-draft]').count()).toBe(0)
    expect(await rater.locator('[data-test=csv-import]').count()).toBe(0)
    await rater.close()
  })

  it('the advanced editor validates JSON live and previews the verdict in words', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } })
    await signInThroughPage(page, baseUrl, 'admin@tightwell.test')
    await gotoReady(page, `${baseUrl}/rule-sets`)
    await page.getByRole('link', { name: 'Browser limits' }).click()
    await page.waitForURL(/\/rule-sets\/\d+$/)
    await page.locator('tr[data-key="r1"]').getByRole('button', { name: 'More' }).click()
    const editor = page.locator('[data-test=logic-editor]').first()
    const json = editor.getByLabel('Rule r1 — json-logic')
    await json.fill('{"method": [{"var": "ach50"}, "toString"]}')
    await expect.poll(() => editor.textContent()).toContain('operator "method" is not allowed')
    await json.fill('{"or": [{"<=": [{"var": "ach50"}, 5]}, {"<=": [{"var": "cfm50PerEnclosureArea"}, 0.28]}]}')
    await expect.poll(() => editor.textContent()).toContain('✓ Valid: ACH50 ≤ 5 or CFM50 per ft² of enclosure ≤ 0.28')
    await editor.getByLabel('ACH50 (1/h)').fill('5.2')
    await editor.getByLabel('CFM50 per ft² of enclosure (cfm/ft²)').fill('0.3')
    await expect.poll(() => editor.locator('[data-test=logic-preview]').textContent()).toBe('with ACH50 = 5.2, CFM50 per ft² of enclosure = 0.3 this rule says: does not meet')
    await editor.getByLabel('CFM50 per ft² of enclosure (cfm/ft²)').fill('0.28')
    await expect.poll(() => editor.locator('[data-test=logic-preview]').textContent()).toBe('with ACH50 = 5.2, CFM50 per ft² of enclosure = 0.28 this rule says: meets')
    // The compound rule replaces the simple cells of the row.
    await expect.poll(() => page.locator('tr[data-key="r1"]').textContent()).toContain('Compound:')
    await screenshot(page, 'limits-advanced-editor')
    await page.close()
  })

  it('a plan reviewer reads a jurisdiction: editions with dates, the zone map each uses, coverage', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } })
    await signInThroughPage(page, baseUrl, 'reviewer@tightwell.test')
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Rule tables' }).click()
    await page.waitForURL(/\/jurisdictions$/)
    await page.getByRole('link', { name: 'Alder Valley Building Department' }).click()
    await page.waitForURL(/\/jurisdictions\/\d+$/)
    // The demo scenario (server/utils/seed.ts): invented adoption dates; Kitsap County WA 53035.
    const editions = page.locator('[data-test=editions] tbody tr')
    await expect.poll(() => editions.count()).toBe(2)
    expect(await editions.nth(0).textContent()).toContain('2013-07-01 – 2016-06-30')
    expect(await editions.nth(0).textContent()).toContain('IECC 2006–2018 county climate zones (demo excerpt)')
    expect(await editions.nth(1).textContent()).toContain('2016-07-01 – open')
    expect(await page.locator('[data-test=coverage]').textContent()).toContain('53035 Kitsap · zone 5C on the default map')
    expect(await page.locator('[data-test=edition-add]').count()).toBe(0)
    await screenshot(page, 'jurisdiction-detail')
    await editions.nth(1).getByRole('link', { name: 'IECC 2015 air leakage (model)' }).click()
    await page.waitForURL(/\/rule-sets\/\d+$/)
    await page.locator('[data-test=version-history] [data-version="1"]').getByRole('button', { name: 'View' }).click()
    await expect.poll(() => page.locator('[data-test=version-rules-1]').textContent()).toContain('zones 3-8 · any · limit: ACH50 ≤ 3 — IECC 2015 R402.4.1.2')
    await page.close()
  })
})
