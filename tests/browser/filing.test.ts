import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { gotoReady, launchBrowser, screenshot, signInThroughPage } from '../support/browser'

// The whole filing flow in Chromium, as the demo rater and the demo reviewer of the City of Juniper
// Flats (Denver County CO, zone 5B, IECC 2015: ≤ 3 ACH50 — server/utils/seed.ts). SYNTHETIC readings.
const baseUrl = inject('baseUrl')
let browser: Browser
beforeAll(async () => { browser = await launchBrowser() })
afterAll(async () => { await browser?.close() })

const FIRST_CSV = 'Time,Building pressure (Pa),Fan flow (cfm)\n10:01,-60,1149\n10:02,-50,1020\n10:03,-40,882\n10:04,-30,731\n10:05,-20,562\n'
const RETEST_CSV = 'Building pressure (Pa),Fan flow (cfm)\n-60,991\n-50,880\n-40,761\n-30,631\n-20,485\n'
const PNG = Buffer.from('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNkYPhfDwAChwGA60e6kgAAAABJRU5ErkJggg==', 'base64')

async function importReadings(page: Page, csv: string, name: string) {
  await page.locator('#readings-file').setInputFiles({ name, mimeType: 'text/csv', buffer: Buffer.from(csv) })
  await expect.poll(() => page.locator('[data-test=import-preview] tbody tr').count()).toBe(5)
  await page.locator('[data-test=accept-readings]').click()
  await expect.poll(() => page.locator('[data-test=readings-import] [data-test=import-preview]').count()).toBe(0)
}

describe('filing and review in a real browser', () => {
  it('rater files, reviewer returns, rater revises, reviewer accepts, anyone verifies', async () => {
    const raterContext = await browser.newContext({ viewport: { width: 1280, height: 1400 } })
    const rater = await raterContext.newPage()
    await signInThroughPage(rater, baseUrl, 'rater@tightwell.test')

    // A new project.
    await rater.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Projects' }).click()
    await rater.waitForURL(/\/projects$/)
    await rater.locator('[data-test=new-project]').click()
    const form = rater.locator('[data-test=project-form]')
    await form.getByLabel('Street address').fill('733 Pinyon Bluff Road')
    await form.getByLabel('Postal code').fill('80202')
    await form.getByLabel('Postal code').press('Tab')
    // The first postal-code lookup loads the ZIP data set (~16 MB) into the server: allow for it.
    await expect.poll(() => form.getByLabel('County FIPS').inputValue(), { timeout: 30_000 }).toBe('08031')
    await form.getByLabel('City').fill('Juniper Flats')
    await form.getByLabel('Permit date').fill('2024-04-01')
    await form.getByLabel('Permit number').fill('JF-BROWSER-733')
    await form.getByLabel('Builder (company)').fill('Cottonwood Ridge Homes')
    await form.getByLabel('Builder contact').fill('Mireille Okonjo')
    await form.getByRole('button', { name: 'IP' }).click()
    await form.getByLabel('Conditioned volume').fill('18000')
    await form.getByLabel('Enclosure area').fill('4340')
    await form.locator('[data-test=save-project]').click()
    await rater.waitForURL(/\/projects\/\d+$/)
    await expect.poll(() => rater.locator('[data-test=project-page] h1').textContent()).toContain('733 Pinyon Bluff Road')

    // A final test, its readings from a gauge file, a photo, the checklist.
    await rater.locator('#nt-stage').selectOption('final')
    await rater.locator('#nt-equipment').fill('Blower fan ring B; manometer calibrated 2024-02-01')
    await rater.locator('[data-test=create-test]').click()
    await rater.waitForURL(/\/tests\/\d+$/)
    await importReadings(rater, FIRST_CSV, 'gauge export.csv')
    await expect.poll(() => rater.locator('[data-test=check-result] [data-verdict]').getAttribute('data-verdict')).toBe('does-not-comply')
    await rater.locator('#test-file').setInputFiles({ name: 'fan in front door.png', mimeType: 'image/png', buffer: PNG })
    await expect.poll(() => rater.locator('[data-test=test-files] li').count()).toBe(2)
    for (const box of await rater.locator('[data-test=safety-checklist] input[type=checkbox]').all()) await box.check()
    await rater.getByLabel('Stated CFM50 (your report)').fill('1020')
    await rater.locator('[data-test=save-test]').click()
    await expect.poll(() => rater.getByRole('status').filter({ hasText: 'Saved and checked.' }).count()).toBe(1)
    await screenshot(rater, 'filing-test-record')

    // File it.
    await rater.getByLabel('Note for the reviewer').fill('Final test, photo of the fan set-up attached.')
    await rater.locator('[data-test=file-test]').click()
    await rater.waitForURL(/\/filings\/\d+$/)
    const filingUrl = rater.url()
    await expect.poll(() => rater.locator('[data-test=filing-page] [data-status]').first().getAttribute('data-status')).toBe('filed')

    // The reviewer finds it in the queue and returns it with a reason.
    const reviewerContext = await browser.newContext({ viewport: { width: 1280, height: 1400 } })
    const reviewer = await reviewerContext.newPage()
    await signInThroughPage(reviewer, baseUrl, 'reviewer2@tightwell.test')
    await expect.poll(() => reviewer.locator('[data-test=reviewer-waiting]').textContent()).not.toBe('0')
    await reviewer.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Review queue' }).click()
    await reviewer.waitForURL(/\/filings$/)
    await expect.poll(() => reviewer.locator('[data-test=queue-table]').textContent()).toContain('733 Pinyon Bluff Road')
    expect(await reviewer.locator('[data-test=queue-table]').textContent()).toContain('1187 Quillback Lane') // the demo filing
    await reviewer.getByLabel('Search').fill('Pinyon')
    await expect.poll(() => reviewer.locator('[data-test=queue-table] tbody tr').count()).toBe(1)
    await screenshot(reviewer, 'filing-review-queue')
    await reviewer.getByRole('link', { name: /733 Pinyon Bluff Road/ }).click()
    await reviewer.waitForURL(/\/filings\/\d+$/)
    await expect.poll(() => reviewer.locator('[data-test=comparison]').count()).toBe(1)
    expect(await reviewer.locator('[data-test=comparison]').textContent()).toContain('IECC 2015')
    await reviewer.locator('[data-test=take-up]').click()
    await expect.poll(() => reviewer.locator('[data-test=decision-form]').count()).toBe(1)
    await reviewer.getByLabel('Return to the rater').check()
    await reviewer.getByLabel(/Reason \(required\)/).fill('3.4 ACH50 is over the 3.0 limit of IECC 2015 R402.4.1.2; seal and retest.')
    await reviewer.locator('[data-test=decide]').click()
    await expect.poll(() => reviewer.locator('[data-test=return-reason]').textContent()).toContain('over the 3.0 limit')
    await screenshot(reviewer, 'filing-returned')

    // The rater sees the reason, retests, files again.
    await gotoReady(rater, filingUrl)
    await expect.poll(() => rater.locator('[data-test=return-reason]').textContent()).toContain('seal and retest')
    await rater.getByRole('link', { name: 'Revise the test and file it again' }).click()
    await rater.waitForURL(/\/tests\/\d+$/)
    await importReadings(rater, RETEST_CSV, 'retest.csv')
    await expect.poll(() => rater.locator('[data-test=check-result] [data-verdict]').getAttribute('data-verdict')).toBe('complies')
    await rater.getByLabel('Stated CFM50 (your report)').fill('880')
    await rater.locator('[data-test=save-test]').click()
    await expect.poll(() => rater.getByRole('status').filter({ hasText: 'Saved and checked.' }).count()).toBe(1)
    await rater.locator('[data-test=file-test]').click()
    await rater.waitForURL(/\/filings\/\d+$/)
    await expect.poll(() => rater.locator('[data-test=filing-page] [data-status]').first().getAttribute('data-status')).toBe('refiled')

    // The reviewer sees what changed and accepts.
    await gotoReady(reviewer, filingUrl)
    await expect.poll(() => reviewer.locator('[data-test=revisions]').textContent()).toContain('Readings')
    expect(await reviewer.locator('[data-test=revisions] [data-field="test.statedCfm50"]').textContent()).toContain('880')
    await reviewer.locator('[data-test=take-up]').click()
    await expect.poll(() => reviewer.locator('[data-test=decision-form]').count()).toBe(1)
    await reviewer.getByLabel('Accept').check()
    await reviewer.locator('[data-test=decide]').click()
    await expect.poll(() => reviewer.locator('[data-test=certificate-code]').count()).toBe(1)
    const code = (await reviewer.locator('[data-test=certificate-code]').textContent())!.replace(/-/g, '')
    expect(code).toMatch(/^[A-Z2-7]{16}$/)
    await screenshot(reviewer, 'filing-accepted')

    // The printable certificate.
    await gotoReady(rater, `${filingUrl}/certificate`)
    await expect.poll(() => rater.locator('[data-test=certificate]').count()).toBe(1)
    expect(await rater.locator('[data-test=cert-citation]').first().textContent()).toContain('IECC 2015 R402.4.1.2')
    expect(await rater.locator('[data-test=cert-verify-url]').textContent()).toBe(`${baseUrl}/verify/${code}`)
    await rater.emulateMedia({ media: 'print' })
    expect(await rater.locator('header.no-print').first().isVisible()).toBe(false)
    await screenshot(rater, 'filing-certificate')
    await rater.emulateMedia({ media: 'screen' })

    // Anyone verifies it without signing in.
    const anonymous = await (await browser.newContext()).newPage()
    await gotoReady(anonymous, `${baseUrl}/verify/${code}`)
    await expect.poll(() => anonymous.locator('[data-test=verify-status]').textContent()).toContain('Accepted')
    expect(await anonymous.locator('[data-test=verify-address]').textContent()).toBe('733 Pinyon Bluff Road, Juniper Flats CO 80202')
    expect(anonymous.url()).toBe(`${baseUrl}/verify/${code}`)
    await screenshot(anonymous, 'filing-verify')
    await gotoReady(anonymous, `${baseUrl}/verify/AAAABBBBCCCCDDDD`)
    await expect.poll(() => anonymous.locator('[data-test=verify-unknown]').count()).toBe(1)

    // The admin reads the captured mail on the Outbox page.
    const adminPage = await (await browser.newContext({ viewport: { width: 1280, height: 1200 } })).newPage()
    await signInThroughPage(adminPage, baseUrl, 'admin@tightwell.test')
    await adminPage.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Outbox' }).click()
    await adminPage.waitForURL(/\/admin\/outbox$/)
    await expect.poll(() => adminPage.locator('[data-test=outbox-table]').textContent()).toContain('Accepted: 733 Pinyon Bluff Road')
    await adminPage.getByRole('button', { name: /Accepted: 733 Pinyon Bluff Road/ }).click()
    expect(await adminPage.locator('[data-test=mail-body]').textContent()).toContain(`/verify/${code}`)
    await screenshot(adminPage, 'filing-outbox')

    // The project shows its tests over time against the limit.
    await gotoReady(rater, `${baseUrl}/projects`)
    await rater.getByRole('link', { name: /1187 Quillback Lane/ }).click()
    await expect.poll(() => rater.locator('[data-test=tests-table] tbody tr').count()).toBe(2)
    expect(await rater.locator('[data-test=tests-plot] figcaption').textContent()).toContain('limit 3')
    await screenshot(rater, 'filing-project-plot')
  })
})
