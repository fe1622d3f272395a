import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { gotoReady, launchBrowser, screenshot, signInThroughPage } from '../support/browser'

const baseUrl = inject('baseUrl')
let browser: Browser

beforeAll(async () => { browser = await launchBrowser() })
afterAll(async () => { await browser?.close() })

describe('the app shell in a real browser', () => {
  it('a rater signs in, lands on the dashboard, and signs out', async () => {
    const page = await browser.newPage()
    await gotoReady(page, `${baseUrl}/`)
    await page.waitForURL(/\/sign-in/)
    await page.getByLabel('E-mail').fill('rater@tightwell.test')
    await page.getByLabel('Password').fill('wrong-password')
    await page.getByRole('button', { name: 'Sign in' }).click()
    await expect.poll(() => page.getByRole('alert').textContent()).toContain('do not match an active account')

    await page.getByLabel('Password').fill('tightwell-demo')
    await page.getByRole('button', { name: 'Sign in' }).click()
    await page.waitForURL(`${baseUrl}/`)
    await expect.poll(() => page.locator('[data-test=dashboard-title]').textContent()).toContain('Welcome, Tobias')
    await expect.poll(() => page.getByRole('navigation', { name: 'Main' }).getByRole('link').allTextContents()).toEqual(['Dashboard', 'Projects', 'Filings', 'Self-check', 'My checks', 'Calculator', 'Rule tables', 'Account'])
    await screenshot(page, 'rater-dashboard')

    await page.getByRole('button', { name: 'Sign out' }).click()
    await page.waitForURL(/\/sign-in/)
    // Signed out: the dashboard sends us back to sign-in.
    await gotoReady(page, `${baseUrl}/`)
    await page.waitForURL(/\/sign-in/)
    await page.close()
  })

  it('each role sees its own navigation; a rater sent to /admin/people lands on the dashboard', async () => {
    const expected: Record<string, string[]> = {
      'admin@tightwell.test': ['Dashboard', 'Projects', 'Filings', 'Self-check', 'My checks', 'Calculator', 'Rule tables', 'People', 'Outbox', 'Account'],
      'reviewer@tightwell.test': ['Dashboard', 'Review queue', 'Self-check', 'My checks', 'Calculator', 'Rule tables', 'Account'],
    }
    for (const [email, links] of Object.entries(expected)) {
      const page = await browser.newPage()
      await signInThroughPage(page, baseUrl, email)
      await expect.poll(() => page.getByRole('navigation', { name: 'Main' }).getByRole('link').allTextContents()).toEqual(links)
      await page.close()
    }
    const page = await browser.newPage()
    await signInThroughPage(page, baseUrl, 'rater2@tightwell.test')
    await gotoReady(page, `${baseUrl}/admin/people`)
    await page.waitForURL(`${baseUrl}/`)
    await page.close()
  })

  it('an admin adds a reviewer on the People page; the reviewer signs in; deactivation ends their session', async () => {
    const adminPage = await browser.newPage()
    await signInThroughPage(adminPage, baseUrl, 'admin@tightwell.test')
    await adminPage.getByRole('link', { name: 'People' }).first().click()
    await adminPage.waitForURL(/\/admin\/people/)
    const form = adminPage.locator('[data-test=person-create]')
    await form.getByLabel('Name').fill('Hollis Tranter')
    await form.getByLabel('E-mail').fill('hollis@tightwell.test')
    await form.getByLabel('Role').selectOption('reviewer')
    await form.getByLabel('Jurisdiction').selectOption({ label: 'City of Juniper Flats' })
    await form.getByLabel('First password').fill('hollis-first-password')
    await form.getByRole('button', { name: 'Add person' }).click()
    await expect.poll(() => adminPage.getByRole('status').first().textContent()).toContain('Added hollis@tightwell.test')
    await expect.poll(() => adminPage.locator('tr[data-email="hollis@tightwell.test"]').count()).toBe(1)

    // The filter narrows the table.
    await adminPage.getByLabel('Search').fill('hollis')
    await expect.poll(() => adminPage.locator('[data-test=people-table] tbody tr').count()).toBe(1)
    await screenshot(adminPage, 'admin-people')

    const reviewerPage = await browser.newPage()
    await signInThroughPage(reviewerPage, baseUrl, 'hollis@tightwell.test', 'hollis-first-password')
    await expect.poll(() => reviewerPage.locator('[data-test=reviewer-jurisdiction]').textContent()).toContain('City of Juniper Flats')

    await adminPage.locator('[data-test="toggle-hollis@tightwell.test"]').click()
    await expect.poll(() => adminPage.locator('tr[data-email="hollis@tightwell.test"]').textContent()).toContain('Deactivated')

    // Next navigation of the deactivated reviewer ends on the sign-in page.
    await gotoReady(reviewerPage, `${baseUrl}/account`)
    await reviewerPage.waitForURL(/\/sign-in/)
    await adminPage.close()
    await reviewerPage.close()
  })

  it('works at phone width with a menu button', async () => {
    const page = await browser.newPage({ viewport: { width: 375, height: 740 } })
    await signInThroughPage(page, baseUrl, 'reviewer2@tightwell.test')
    await page.getByRole('button', { name: 'Menu' }).click()
    await expect.poll(() => page.getByRole('navigation', { name: 'Main (mobile)' }).isVisible()).toBe(true)
    await screenshot(page, 'phone-menu')
    await page.close()
  })
})
