import path from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { openBrowser, shot, signIn } from '../support/browser'
import { BASE_URL, DEMO_ACCOUNTS, signedIn } from '../support/http'

let browser: Awaited<ReturnType<typeof openBrowser>>
beforeAll(async () => {
  browser = await openBrowser()
  await signIn(browser.page, DEMO_ACCOUNTS.technician)
})
afterAll(async () => {
  await browser?.close()
})

const reading = () => browser.page.getByTestId('expected-reading').textContent()

describe('reading calculator', () => {
  it('shows the same expected reading as the calculation API, in the chosen unit', async () => {
    const { page } = browser
    await page.goto(`${BASE_URL}/calculator`)
    await expect.poll(reading).toMatch(/°C/)
    const api = await (await signedIn('technician')).post('/api/calculations/expected-reading', {
      band: { kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 },
      sourceTemperatureK: 373.15, sourceEmissivity: 0.95, reflectedTemperatureK: 296.15, instrumentTemperatureK: 296.15, emissivitySetting: 1,
    })
    expect(api.status).toBe(200)
    const shownC = Number.parseFloat((await reading())!)
    expect(Math.abs(shownC - (api.body.expectedReadingK - 273.15))).toBeLessThan(0.006)
    // A 0.95 plate read at ε_i = 1 reads low (domain primer §5, common practice).
    expect(await page.getByTestId('deviation').textContent()).toMatch(/^−/)
    await page.locator('[data-unit="K"]').click()
    await expect.poll(reading).toMatch(/K$/)
    expect(Math.abs(Number.parseFloat((await reading())!) - api.body.expectedReadingK)).toBeLessThan(0.006)
    await page.waitForSelector('[data-testid="spectrum-chart"] canvas')
    await shot(page, 'calculator')
    await page.locator('[data-unit="C"]').click()
  })

  it('shows the field at fault for an impossible band, and the caution for a hot bright source', async () => {
    const { page } = browser
    await page.locator('[data-band-mode="custom"]').click()
    await page.locator('#lambda1').fill('14')
    await page.locator('#lambda2').fill('8')
    await expect.poll(() => page.locator('[data-field-error="lambda2"]').textContent()).toMatch(/greater/)
    await page.locator('#lambda1').fill('0.64')
    await page.locator('#lambda2').fill('0.66')
    await page.locator('#ts').fill('1100')
    await page.locator('#es').fill('0.999')
    await expect.poll(() => page.getByTestId('eye-caution').count()).toBe(1)
    await expect.poll(reading).toMatch(/^10\d\d\.\d\d/)
    await shot(page, 'calculator-hot')
  })

  it('reads a responsivity table from CSV', async () => {
    const { page } = browser
    await page.locator('#ts').fill('100')
    await page.locator('#es').fill('0.95')
    await page.locator('[data-band-mode="table"]').click()
    await page.locator('#band-file').setInputFiles(path.resolve(import.meta.dirname, '../fixtures/responsivity-8-14.csv'))
    await expect.poll(() => page.getByTestId('band-table-name').textContent()).toMatch(/9 points/)
    await expect.poll(reading).toMatch(/^9\d\.\d\d/)
  })

  it('runs a Monte Carlo check with progress and compares it with GUM', async () => {
    const { page } = browser
    await page.locator('#mc-trials').selectOption('100000')
    await page.getByTestId('mc-run').click()
    await page.waitForSelector('[data-testid="mc-result"]', { timeout: 30_000 })
    expect(await page.getByTestId('mc-verdict').textContent()).toMatch(/GUM interval is (not )?validated/)
    await shot(page, 'calculator-monte-carlo')
  })
})
