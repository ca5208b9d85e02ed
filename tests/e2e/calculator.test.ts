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

  it('runs a Monte Carlo check with progress, and its verdict follows from the inputs', async () => {
    const { page } = browser
    // The probe's point: 8–14 µm, a source at 100 °C with ε_s = 0.95, surroundings at 23 °C, ε_i = 1.
    await page.locator('[data-band-mode="preset"]').click()
    await expect.poll(reading).toMatch(/^9\d\.\d\d/)
    const run = async (u: { ts: string, es: string, tw: string, td: string }) => {
      await page.locator('#mc-uts').fill(u.ts)
      await page.locator('#mc-ues').fill(u.es)
      await page.locator('#mc-utw').fill(u.tw)
      await page.locator('#mc-utd').fill(u.td)
      await page.locator('#mc-trials').selectOption('100000')
      const runs = page.locator('[data-testid="mc-result"]')
      const before = Number(await runs.getAttribute('data-run', { timeout: 500 }).catch(() => '0'))
      await page.getByTestId('mc-run').click()
      await expect.poll(() => runs.getAttribute('data-run', { timeout: 500 }).catch(() => null), { timeout: 30_000 }).toBe(String(before + 1))
      return page.getByTestId('mc-verdict')
    }
    // Nearly linear, dominated by a normal input (u(T_s) = 0.15 K, the rest negligible): the
    // output is normal and the GUM interval agrees with Monte Carlo (JCGM 101:2008 §8, §9.2 —
    // section numbers from memory). With u(y) ≈ 0.14 K, δ = 0.005 K; the interval ends of 10⁵
    // trials scatter by about 0.001 K, so the agreement is not luck.
    const linear = await run({ ts: '0.15', es: '0.0001', tw: '0.01', td: '0.01' })
    expect(await linear.getAttribute('data-validated')).toBe('true')
    expect(await linear.textContent()).toMatch(/GUM interval is validated/)
    await shot(page, 'calculator-monte-carlo')
    // Dominated by a rectangular input (reflected temperature ± 30 K): the output is near
    // rectangular, its 95 % interval about ±0.95a, while the GUM's k ≈ 2 normal interval is about
    // ±1.13a — the ends differ by far more than δ, so the GUM interval must not be validated
    // (JCGM 101:2008 §9.2, additive model with rectangular inputs; from memory).
    const rectangular = await run({ ts: '0.01', es: '0.0001', tw: '30', td: '0.01' })
    expect(await rectangular.getAttribute('data-validated')).toBe('false')
    expect(await rectangular.textContent()).toMatch(/GUM interval is not validated/)
    await shot(page, 'calculator-monte-carlo-rectangular')
  })
})
