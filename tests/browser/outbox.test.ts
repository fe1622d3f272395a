import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { gotoReady, launchBrowser, screenshot, signInThroughPage } from '../support/browser'
import { filedTest, oneReading } from '../support/filing'
import { Client, freshAddress } from '../support/http'
import { startBuiltServer, type RunningServer } from '../support/server'

// Its own server, whose capture SMTP server refuses the first 2 messages and tries each once:
// the demo notice and the next one fail for good.
let server: RunningServer
let browser: Browser
beforeAll(async () => {
  server = await startBuiltServer({ TIGHTWELL_MAIL_CAPTURE_REJECT: '2', TIGHTWELL_MAIL_MAX_ATTEMPTS: '1', TIGHTWELL_MAIL_POLL_MS: '100' })
  browser = await launchBrowser()
})
afterAll(async () => {
  await browser?.close()
  await server?.stop()
})

describe('the outbox in a real browser', () => {
  it('an admin opens a failed notice, corrects the address and sends it again', async () => {
    const rater = new Client(server.url, freshAddress())
    await rater.signIn('rater@tightwell.test')
    await filedTest(rater, oneReading(870))

    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } })
    await signInThroughPage(page, server.url, 'admin@tightwell.test')
    await gotoReady(page, `${server.url}/admin/outbox`)
    // Newest first: the notice of the filing just made.
    const submitted = page.locator('tr[data-mail=filing-submitted]').first()
    await expect.poll(async () => {
      await page.getByRole('button', { name: 'Refresh' }).click()
      return submitted.locator('td').nth(3).textContent()
    }, { timeout: 20_000 }).toContain('Failed')

    await submitted.getByRole('button').first().click()
    const form = page.locator('[data-test=resend-form]')
    await form.getByLabel('Send to').fill('permits-desk@juniperflats.test')
    await screenshot(page, 'outbox-resend')
    await form.getByRole('button', { name: 'Send again to this address' }).click()
    await expect.poll(async () => {
      await page.getByRole('button', { name: 'Refresh' }).click()
      return submitted.textContent()
    }, { timeout: 20_000 }).toMatch(/permits-desk@juniperflats\.test.*Sent/)
    await page.close()
  })
})
