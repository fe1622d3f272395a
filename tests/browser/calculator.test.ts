import { existsSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { launchBrowser, screenshot, signInThroughPage } from '../support/browser'
import { ROOT } from '../support/server'

const baseUrl = inject('baseUrl')
const EXAMPLE = join(ROOT, '../shared/reference/example-multipoint-8pt.csv')
const hasExample = existsSync(EXAMPLE)
if (!hasExample) console.warn(`[skip] calculator §2 browser test: ${EXAMPLE} is absent (../shared not beside this clone)`)

let browser: Browser
beforeAll(async () => { browser = await launchBrowser() })
afterAll(async () => { await browser?.close() })

async function openCalculator(email = 'rater@tightwell.test'): Promise<Page> {
  const page = await browser.newPage({ viewport: { width: 1280, height: 1400 } })
  await signInThroughPage(page, baseUrl, email)
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Calculator' }).click()
  await page.waitForURL(/\/calculator/)
  await page.getByRole('button', { name: 'IP (ft, cfm)' }).click()
  return page
}

async function fillBuilding(page: Page) {
  // House of CHECKS.md §3 (SYNTHETIC).
  await page.getByLabel('Conditioned volume').fill('18000')
  await page.getByLabel('Conditioned floor area').fill('2000')
  await page.getByLabel('Enclosure area').fill('4340')
  await page.getByLabel('Height above grade').fill('18')
}

const text = (page: Page, test: string) => page.locator(`[data-test=${test}]`).textContent()

describe('the calculator in a real browser', () => {
  it.skipIf(!hasExample)('typing the CHECKS.md §2 readings shows n, C, r², CFM50 to 4 significant figures and draws the plot', async () => {
    const page = await openCalculator()
    await fillBuilding(page)
    // The 8 readings of example-multipoint-8pt.csv (SYNTHETIC; baseline already removed), typed as a pressurization test.
    const rows = readFileSync(EXAMPLE, 'utf8').trim().split(/\r?\n/).slice(1).map(l => l.split(','))
    await page.getByLabel('Pressurization (house above outdoors, readings positive)').check()
    for (let i = 0; i < rows.length; i++) {
      if (i > 0) await page.locator('[data-test=add-reading]').click()
      await page.locator(`[data-test=pressure-${i}]`).fill(rows[i]![0]!)
      await page.locator(`[data-test=flow-${i}]`).fill(rows[i]![1]!)
    }
    // CHECKS.md §2 [COMPUTED]: n 0.6432, C 112.6, r² 0.9991, CFM50 1394.0 (1371.7 – 1416.7); §3: ACH50 4.647.
    await expect.poll(() => text(page, 'exponent')).toBe('0.6432')
    expect(await text(page, 'coefficient')).toContain('112.6')
    expect(await text(page, 'r2')).toBe('0.9991')
    expect(await text(page, 'cfm50')).toBe('1,394')
    expect(await text(page, 'cfm50-ci')).toContain('1,372 – 1,417')
    expect(await text(page, 'ach50')).toBe('4.647')
    expect(await text(page, 'method')).toContain('Multi-point')
    // The plot is drawn: a canvas with pixels in it.
    const canvas = page.locator('[data-test=plot] canvas')
    await expect.poll(() => canvas.count()).toBe(1)
    const painted = await canvas.evaluate((c: HTMLCanvasElement) => {
      const ctx = c.getContext('2d')!
      const { data } = ctx.getImageData(0, 0, c.width, c.height)
      let n = 0
      for (let i = 3; i < data.length; i += 4) if (data[i]! > 0) n++
      return n
    })
    expect(painted).toBeGreaterThan(1000)
    // The target sentence: 3.0 ACH50 on 18 000 ft³ → 900 CFM50 (CHECKS.md §7), reduction (1394 − 900)/1394 = 35.4 %.
    expect(await text(page, 'target-sentence')).toContain('at most 900 CFM50')
    expect(await text(page, 'target-sentence')).toContain('35.4 % reduction')
    await screenshot(page, 'calculator-multipoint')
    await page.close()
  })

  it('a one-point test with a baseline reproduces CHECKS.md §5 (5557 CFM50) and warns about the extrapolation', async () => {
    const page = await openCalculator('reviewer@tightwell.test')
    await fillBuilding(page)
    await page.getByLabel('Depressurization (house below outdoors, readings negative)').check()
    await page.locator('[data-test=pressure-0]').fill('-34.0')
    await page.locator('[data-test=flow-0]').fill('4200')
    await page.getByLabel('Baseline pressure before').fill('-1.8')
    await page.getByLabel('Baseline pressure after').fill('-1.2')
    // CHECKS.md §5 [COMPUTED]: 4200·(50/32.5)^0.65 = 5557 cfm.
    await expect.poll(() => text(page, 'cfm50')).toBe('5,557')
    expect(await text(page, 'r2')).toContain('n/a')
    expect(await page.locator('[data-test=warnings] li[data-code=extrapolated]').textContent()).toContain('32.5 Pa')
    // Changing the assumed exponent to 0.60 gives 5439 (CHECKS.md §5).
    await page.getByLabel('Assumed flow exponent (one-point test)').fill('0.60')
    await expect.poll(() => text(page, 'cfm50')).toBe('5,439')
    await page.close()
  })

  it('marks a reading whose sign contradicts the direction and shows no result', async () => {
    const page = await openCalculator()
    await page.getByLabel('Conditioned volume').fill('18000')
    await page.getByLabel('Depressurization (house below outdoors, readings negative)').check()
    await page.locator('[data-test=pressure-0]').fill('50')
    await page.locator('[data-test=flow-0]').fill('900')
    await expect.poll(() => page.locator('[data-test=pressure-0]').getAttribute('aria-invalid')).toBe('true')
    expect(await page.locator('[data-test=results]').count()).toBe(0)
    await page.close()
  })

  it('remembers the unit system across visits', async () => {
    const page = await openCalculator()
    await page.getByRole('button', { name: 'SI (m, m³/h)' }).click()
    await page.reload()
    await expect.poll(() => page.getByRole('button', { name: 'SI (m, m³/h)' }).getAttribute('aria-pressed')).toBe('true')
    expect(await page.getByText('Fan flow (m³/h)').count()).toBe(1)
    await page.close()
  })
})
