import { existsSync, mkdirSync } from 'node:fs'
import { join } from 'node:path'
import { chromium, type Browser, type Page } from 'playwright-core'
import { ROOT } from './server'

export const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium'
export const ARTIFACTS = join(ROOT, 'tests/.artifacts')

/** Debian's Chromium, headless, with the flags this sandbox needs (no downloads of its own). */
export async function launchBrowser(): Promise<Browser> {
  if (!existsSync(CHROMIUM)) throw new Error(`Chromium not found at ${CHROMIUM}: install Debian's chromium (apt-get install -y chromium) — .ci/run does this`)
  return chromium.launch({
    executablePath: CHROMIUM,
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  })
}

export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(ARTIFACTS, { recursive: true })
  const path = join(ARTIFACTS, `${name}.png`)
  await page.screenshot({ path, fullPage: true })
  return path
}

/**
 * Opens a page and waits until Vue has hydrated it (the app is mounted on #__nuxt): a field filled
 * before that has no listener yet, and its change is lost on a slow machine.
 */
export async function gotoReady(page: Page, url: string) {
  await page.goto(url)
  await page.waitForFunction(() => Boolean((document.querySelector('#__nuxt') as { __vue_app__?: unknown } | null)?.__vue_app__))
}

export async function signInThroughPage(page: Page, baseUrl: string, email: string, password = 'tightwell-demo') {
  await gotoReady(page, `${baseUrl}/sign-in`)
  await page.getByLabel('E-mail').fill(email)
  await page.getByLabel('Password').fill(password)
  await page.getByRole('button', { name: 'Sign in' }).click()
  await page.waitForURL(url => !url.pathname.startsWith('/sign-in'))
}
