// The technician's and the reviewer's flow through one calibration run, in a real browser.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { openBrowser, shot, signIn } from '../support/browser'
import { BASE_URL, DEMO_ACCOUNTS, signedIn, type Client } from '../support/http'

let browser: Awaited<ReturnType<typeof openBrowser>>
let tech: Client
let runId: number
const SET_POINTS_C = [0, 25, 50, 100, 150]

beforeAll(async () => {
  browser = await openBrowser()
  tech = await signedIn('technician')
  const procedures = (await tech.get('/api/procedures')).body
  const list = Array.isArray(procedures) ? procedures : procedures.rows
  const plate = list.find((p: { name: string }) => /flat plate/i.test(p.name))
  const instrument = (await tech.get('/api/instruments?q=NV814-KF01555')).body.rows[0]
  const created = await tech.post('/api/runs', {
    instrumentId: instrument.id,
    procedureVersionId: plate.currentVersion.id,
    calibrationDate: '2026-11-24',
    ambientTemperatureK: 296.15,
    relativeHumidityPct: 40,
    distanceMm: 300,
    emissivitySetting: 0.95,
    reflectedTemperatureK: 296.15,
    instrumentTemperatureK: 296.65,
    adjusted: false,
  })
  expect(created.status).toBe(201)
  runId = created.body.id
  // Goods-in recorded the item's receipt (the certificate states it).
  const received = await tech.post(`/api/runs/${runId}/receipt`, { receivedOn: '2026-11-20', packaging: 'Maker’s case, intact', condition: 'No visible damage' })
  expect(received.status).toBe(200)
})
afterAll(async () => {
  await browser?.close()
})

describe('a calibration run, end to end', () => {
  it('the technician enters five points with three readings each from the keyboard and submits', async () => {
    const { page } = browser
    await signIn(page, DEMO_ACCOUNTS.technician)
    await page.goto(`${BASE_URL}/runs/${runId}`)
    await page.waitForSelector('[data-testid="point-grid"]')
    await page.getByTestId('edit-run-header').click()
    await page.locator('#relativeHumidityPct').fill('38')
    await page.getByTestId('save-run-header').click()
    await expect.poll(() => page.getByTestId('run-header').textContent()).toContain('38 %RH')
    for (const [i, c] of SET_POINTS_C.entries()) {
      const row = page.locator(`[data-row="${i}"]`)
      await row.locator('[data-col="source"]').selectOption({ label: 'BB-FP-01' })
      await row.locator('[data-col="setPoint"]').fill(String(c))
      await row.locator('[data-col="indicated"]').fill(String(c))
      const r = (x: number) => (c - 0.4 + x).toFixed(1)
      await row.locator('[data-col="readings"]').fill(`${r(0)} ${r(0.1)} ${r(-0.1)}`)
      await row.locator('[data-col="readings"]').press('Enter')
      await expect.poll(() => page.locator('[data-testid="results-table"] tbody tr[data-point]').count()).toBe(i + 1)
    }
    await shot(page, 'run-entry')
    await page.getByTestId('submit-run').click()
    await expect.poll(() => page.getByTestId('run-status').textContent()).toMatch(/submitted/i)
    await page.getByTestId('sign-out').click()
    await page.waitForURL(/\/login/)
  })

  it('stores results that agree with the calculation API for the same inputs', async () => {
    const run = (await tech.get(`/api/runs/${runId}`)).body
    expect(run.points).toHaveLength(5)
    for (const p of run.points) {
      expect(p.result.n).toBe(3)
      // The plate's certified value is a radiance temperature: the engine found the plate's surface
      // temperature from it (sourceTemperatureK); the calculation from that surface temperature agrees.
      const er = await tech.post('/api/calculations/expected-reading', {
        band: run.instrument.band,
        sourceTemperatureK: p.result.sourceTemperatureK ?? p.result.referenceTemperatureK,
        sourceEmissivity: p.result.inputs.sourceEmissivity,
        reflectedTemperatureK: run.reflectedTemperatureK,
        instrumentTemperatureK: run.instrumentTemperatureK,
        emissivitySetting: run.emissivitySetting,
      })
      expect(Math.abs(er.body.expectedReadingK - p.result.expectedReadingK)).toBeLessThan(1e-9)
      expect(p.result.referenceBasis).toBe('radiance-temperature')
      const budget = await tech.post('/api/calculations/budget', {
        components: p.result.budget.components.map((c: { name: string, standardUncertainty: number, sensitivity: number, dof: number | null }) => ({ name: c.name, standardUncertainty: c.standardUncertainty, sensitivity: c.sensitivity, dof: c.dof })),
      })
      expect(Math.abs(budget.body.combinedStandardUncertainty - p.result.budget.combinedStandardUncertaintyK)).toBeLessThan(1e-12)
      expect(Math.abs(budget.body.expandedUncertainty - p.result.budget.expandedUncertaintyK)).toBeLessThan(1e-9)
      // E = mean − expected (VIM 2.16 error of indication)
      expect(Math.abs(p.result.errorK - (p.result.meanReadingK - p.result.expectedReadingK))).toBeLessThan(1e-12)
    }
  })

  it('the quality manager reviews the budget and the chart, and approves; the run is then locked', async () => {
    const { page } = browser
    await signIn(page, DEMO_ACCOUNTS.quality)
    await page.goto(`${BASE_URL}/runs/${runId}`)
    await page.locator('[data-point="2"]').click()
    await page.waitForSelector('[data-testid="point-budget"]')
    await page.waitForSelector('[data-testid="error-chart"] canvas')
    await shot(page, 'run-review')
    // The reviewer sees what is approved and confirms.
    expect(await page.getByTestId('review-summary').textContent()).toMatch(/5 points:[\s\S]*pass[\s\S]*Largest \|error\| \/ tolerance/)
    await page.getByTestId('approve-run').click()
    await page.getByTestId('confirm-approve').click()
    await expect.poll(() => page.getByTestId('run-status').textContent()).toMatch(/approved/i)
    expect(await page.getByTestId('approved-note').textContent()).toContain('locked')
    expect(await page.locator('[data-row="0"] [data-col="readings"]').isDisabled()).toBe(true)
    expect(await page.locator('[data-testid^="save-point-"]').count()).toBe(0)
  })

  it('the quality manager signs the certificate; the customer downloads it; anyone can verify it', async () => {
    const { page } = browser
    await page.getByTestId('issue-certificate').click()
    await page.locator('#sign-password').fill('not-my-password')
    await page.getByTestId('sign-submit').click()
    await expect.poll(() => page.locator('[data-field-error="sign-password"]').count()).toBe(1)
    await page.locator('#sign-password').fill('bandlight-demo')
    await page.getByTestId('sign-submit').click()
    await page.waitForSelector('[data-testid="certificate-number"]')
    const number = (await page.getByTestId('certificate-number').textContent())!.trim()
    expect(number).toMatch(/^[A-Z]+-\d{4}-\d+$/)
    await shot(page, 'run-certificate')
    await page.getByTestId('sign-out').click()
    await page.waitForURL(/\/login/)

    await signIn(page, DEMO_ACCOUNTS.customer)
    await page.goto(`${BASE_URL}/certificates`)
    await page.locator('tbody tr', { hasText: number }).click()
    await page.waitForURL(/\/certificates\/\d+$/)
    const href = await page.getByTestId('download-pdf').getAttribute('href')
    const pdf = await page.evaluate(async (url) => {
      const r = await fetch(url!)
      const b = new Uint8Array(await r.arrayBuffer())
      return { type: r.headers.get('content-type'), head: String.fromCharCode(...b.slice(0, 5)) }
    }, href)
    expect(pdf.type).toContain('application/pdf')
    expect(pdf.head).toBe('%PDF-')
    const code = (await page.locator('dd.font-mono').first().textContent())!.trim()
    await shot(page, 'certificate-customer')
    const mine = (await (await signedIn('customer')).get(`/api/certificates?q=${encodeURIComponent(number)}`)).body.rows[0]
    await page.goto(`${BASE_URL}/instruments/${mine.instrumentId}`)
    await page.waitForSelector('[data-testid="history-chart"] canvas')
    expect(await page.getByTestId('instrument-history').textContent()).toContain(number)
    await shot(page, 'instrument-history-customer')
    await page.getByTestId('sign-out').click()
    await page.waitForURL(/\/login/)

    await page.goto(`${BASE_URL}/verify?number=${encodeURIComponent(number)}&code=${encodeURIComponent(code)}`)
    await expect.poll(() => page.getByTestId('verify-result').textContent()).toMatch(/Valid/)
    expect(await page.getByTestId('verify-result').textContent()).toContain('NV814-KF01555')
    await shot(page, 'verify')
  })
})
