// Every kind of instrument in a real browser (issue 16): a technician registers a ratio pyrometer
// through the instrument form (which asks for its second band and ratio setting, and for no
// emissivity setting), calibrates it on a cavity whose emissivity is known in both bands, and a
// thermal imager with five regions of interest at three points (one with a frame series for the NETD);
// the quality manager approves and signs both. Each PDF states what its kind needs (read back with
// pdftotext, kept under tests/.artifacts/certificates for a look with pdftoppm). The calculator's ratio
// and interpolation panels answer from the API. Screenshots at 1440 and 390 px of the pages changed.
import path from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { openBrowser, shot, shotBoth, signIn } from '../support/browser'
import { makeInstrument, makeProcedure, makeSource, GOOD_RECEIPT } from '../support/factories'
import { BASE_URL, DEMO_ACCOUNTS, signedIn, unique, type Client } from '../support/http'
import { hasPdftotext, pdfText } from '../support/pdf'

let browser: Awaited<ReturnType<typeof openBrowser>>
let tech: Client
let quality: Client
let procedureLabel = ''
let cavity: { id: number, assetTag: string }
let plate: { id: number, assetTag: string }

const ARTIFACTS = path.resolve(import.meta.dirname, '../.artifacts/certificates')

async function download(page: Page, url: string): Promise<Buffer> {
  const bytes = await page.evaluate(async (u) => {
    const r = await fetch(u)
    return Array.from(new Uint8Array(await r.arrayBuffer()))
  }, url)
  return Buffer.from(bytes)
}

async function signOut(page: Page) {
  await page.getByTestId('sign-out').click()
  await page.waitForURL(/\/login/)
}

/** The technician submits the run on its page; the quality manager approves it and signs; answers the certificate's PDF and number. */
async function submitApproveSign(page: Page, runId: number, name: string): Promise<{ text: string, number: string }> {
  await page.getByTestId('submit-run').click()
  await expect.poll(() => page.getByTestId('run-status').textContent()).toMatch(/submitted/i)
  await signOut(page)
  await signIn(page, DEMO_ACCOUNTS.quality)
  await page.goto(`${BASE_URL}/runs/${runId}`)
  await page.getByTestId('approve-run').click()
  await page.getByTestId('confirm-approve').click()
  await expect.poll(() => page.getByTestId('run-status').textContent()).toMatch(/approved/i)
  await page.getByTestId('issue-certificate').click()
  await page.locator('#sign-password').fill('bandlight-demo')
  await page.getByTestId('sign-submit').click()
  await page.waitForSelector('[data-testid="certificate-number"]')
  const id = Number((await page.getByTestId('certificate-number').getAttribute('href'))!.split('/').pop())
  const number = (await page.getByTestId('certificate-number').textContent())!.trim()
  const bytes = await download(page, `/api/certificates/${id}/pdf`)
  expect(bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-')
  // kept for a look: pdftoppm -png -r 80 tests/.artifacts/certificates/<name>.pdf
  const text = hasPdftotext ? pdfText(bytes, path.join(ARTIFACTS, `${name}-${number}.pdf`)) : ''
  await signOut(page)
  return { text, number }
}

beforeAll(async () => {
  browser = await openBrowser()
  ;[tech, quality] = await Promise.all([signedIn('technician'), signedIn('quality')])
  // A procedure for cavities and plates with the equipment's lines from the registers.
  const p = await makeProcedure(quality, { budgetFromEquipment: true, name: unique('Kinds procedure ') })
  procedureLabel = String(p.name)
  // invented: a cavity whose emissivity falls from 0.92 at 0.6 µm to 0.87 at 1.1 µm (0.8825 over 0.95–1.00 µm, 0.8775 over 1.00–1.05 µm)
  // asset tags that sort first, so the point grid's source list (first 200 by tag) holds them
  cavity = await makeSource(quality, {
    assetTag: unique('BB-A-'), kind: 'cavity', apertureMm: 25, minTemperatureK: 673.15, maxTemperatureK: 1773.15, uniformityK: 0.5, stabilityK: 0.1,
    corrections: [[1073.15, 0.4], [1273.15, 0.6]], certifiedExpandedUncertaintyK: 2, certifiedCoverageFactor: 2,
    emissivity: 0.9, emissivityU: 0.005, emissivityBandLambda1Um: 0.6, emissivityBandLambda2Um: 1.1, emissivityTable: [[0.6, 0.92, 0.004], [1.1, 0.87, 0.006]],
  })
  plate = await makeSource(quality, { assetTag: unique('BB-A-'), certifiedExpandedUncertaintyK: 0.3, certifiedCoverageFactor: 2 })
})
afterAll(async () => {
  await browser?.close()
})

describe('every kind of instrument, to a signed certificate', () => {
  it('a ratio pyrometer: registered through the form with two bands and its ratio setting, calibrated, signed', async () => {
    const { page } = browser
    await signIn(page, DEMO_ACCOUNTS.technician)
    await page.goto(`${BASE_URL}/instruments/new`)
    const serial = unique('CR').toUpperCase()
    await page.locator('#organizationId').selectOption({ label: 'Kestrelmoor Foundry Ltd' })
    await page.locator('#serial').fill(serial)
    await page.locator('#maker').fill('Testwick Optics')
    await page.locator('#model').fill('Two-colour 10')
    // a spot kind asks for one band and an emissivity setting …
    expect(await page.getByTestId('band-2').count()).toBe(0)
    expect(await page.locator('#defaultEmissivity').count()).toBe(1)
    await page.locator('#kind').selectOption('ratio-pyrometer')
    // … a ratio pyrometer for two bands and its ratio setting instead
    await expect.poll(() => page.getByTestId('band-2').count()).toBe(1)
    expect(await page.locator('#defaultEmissivity').count()).toBe(0)
    await page.locator('#bandLambda1Um').fill('0.95')
    await page.locator('#bandLambda2Um').fill('1.00')
    await page.locator('#band2Lambda1Um').fill('0.98')
    await page.locator('#band2Lambda2Um').fill('1.05')
    await page.locator('#emissivityRatioSetting').fill('1')
    await page.locator('#rangeMinK').fill('600')
    await page.locator('#rangeMaxK').fill('2000')
    await page.locator('#resolutionK').fill('0.1')
    await page.locator('#distanceToSpot').fill('150')
    await page.getByTestId('save-instrument').click()
    // band 2 starting inside band 1 is refused, under its field
    await expect.poll(() => page.locator('[data-field-error="band2Lambda1Um"]').textContent()).toMatch(/longer wavelengths than band 1/)
    await page.locator('#band2Lambda1Um').fill('1.00')
    await shotBoth(page, 'kinds-instrument-form-ratio')
    await page.getByTestId('save-instrument').click()
    await page.waitForURL(/\/instruments\/\d+$/)
    const instrumentId = Number(new URL(page.url()).pathname.split('/').pop())
    await expect.poll(() => page.getByTestId('band-2').textContent()).toContain('1–1.05 µm')
    await shotBoth(page, 'kinds-instrument-ratio')

    await page.goto(`${BASE_URL}/runs/new?instrumentId=${instrumentId}`)
    await expect.poll(() => page.getByTestId('chosen-instrument').textContent()).toContain(serial)
    // the run records the ratio setting; the two-colour model has no emissivity setting or instrument temperature
    expect(await page.locator('#emissivitySetting').count()).toBe(0)
    expect(await page.locator('#instrumentTemperatureK').count()).toBe(0)
    await page.locator('#procedureVersionId').selectOption((await page.locator('#procedureVersionId option', { hasText: procedureLabel }).getAttribute('value'))!)
    await page.locator('#ambientTemperatureK').fill('23')
    await page.locator('#relativeHumidityPct').fill('40')
    await page.locator('#distanceMm').fill('300')
    await page.locator('#reflectedTemperatureK').fill('23')
    await page.locator('#emissivityRatioSetting').fill('1')
    await page.getByTestId('save-run').click()
    await page.waitForURL(/\/runs\/\d+$/)
    const runId = Number(new URL(page.url()).pathname.split('/').pop())
    expect((await tech.post(`/api/runs/${runId}/receipt`, GOOD_RECEIPT)).status).toBe(200)
    await page.reload()
    await expect.poll(() => page.getByTestId('run-ratio-setting').textContent()).toBe('1')

    for (const [i, [c, readings]] of ([[800, '778.2 778.4 778.3'], [1000, '1013.7 1013.5 1013.6']] as const).entries()) {
      const row = page.locator(`[data-row="${i}"]`)
      await row.locator('[data-col="source"]').selectOption({ label: cavity.assetTag })
      await row.locator('[data-col="setPoint"]').fill(String(c))
      await row.locator('[data-col="indicated"]').fill(String(c))
      await row.locator('[data-col="readings"]').fill(readings)
      await row.locator('[data-col="readings"]').press('Enter')
      await expect.poll(() => page.locator('[data-testid="results-table"] tbody tr[data-point]').count()).toBe(i + 1)
    }
    // Printed by tests/reference/ratio_runs.py (scipy 1.17.1, quad + brentq): at the 1000 °C set-point (T_s = 1273.75 K),
    // ε₁ = 0.8825, ε₂ = 0.8775, T_w = 296.15 K, k = 1 → T_R = 1286.761706134 K (+13.01 K above T_s).
    const run = (await tech.get(`/api/runs/${runId}`)).body
    expect(Math.abs(run.points[1].result.expectedReadingK - 1286.761706134)).toBeLessThan(1e-3)
    expect(await page.locator('[data-testid="results-table"] tbody tr[data-point="1"]').textContent()).toContain('1013.61')
    await shotBoth(page, 'kinds-run-ratio')

    const { text } = await submitApproveSign(page, runId, 'ratio')
    if (hasPdftotext) {
      for (const s of ['Ratio pyrometer', 'Band 1 0.95–1 µm', 'Band 2 1–1.05 µm', 'Emissivity-ratio setting 1.000', 'ratio (two-colour) pyrometer',
        `${cavity.assetTag} ε1 = 0.8825 in band 1, ε2 = 0.8775 in band 2`, 'model is 0.8825 in band 1 and 0.8775 in band 2', '1013.61']) {
        expect(text, s).toContain(s)
      }
      expect(text).not.toMatch(/Emissivity setting \d/)
    }
  })

  it('a thermal imager: five regions of interest at three points, one frame series for the NETD, its settings; signed', async () => {
    const { page } = browser
    const instrument = await makeInstrument(tech, (await tech.get('/api/customers?pageSize=1')).body.rows[0].id, { kind: 'thermal-imager', model: 'Testwick IR camera 320', distanceToSpot: null, accuracy: { kind: 'greaterOf', a: 2, b: 2 } })
    await signIn(page, DEMO_ACCOUNTS.technician)
    await page.goto(`${BASE_URL}/runs/new?instrumentId=${instrument.id}`)
    await expect.poll(() => page.getByTestId('chosen-instrument').textContent()).toContain(String(instrument.serial))
    const value = await page.locator('#procedureVersionId option', { hasText: procedureLabel }).getAttribute('value')
    await page.locator('#procedureVersionId').selectOption(value!)
    for (const [id, v] of [['#ambientTemperatureK', '23'], ['#relativeHumidityPct', '40'], ['#distanceMm', '300'], ['#reflectedTemperatureK', '23'], ['#instrumentTemperatureK', '23'], ['#emissivitySetting', '0.95']] as const) await page.locator(id).fill(v)
    await page.getByTestId('save-run').click()
    await page.waitForURL(/\/runs\/\d+$/)
    const runId = Number(new URL(page.url()).pathname.split('/').pop())
    expect((await tech.post(`/api/runs/${runId}/receipt`, GOOD_RECEIPT)).status).toBe(200)
    await page.reload()

    // the imager's settings in the run header
    await page.getByTestId('edit-run-header').click()
    await page.locator('#imager-lens').fill('Standard 25 mm lens')
    await page.locator('#imager-fov').fill('24° × 18°')
    await page.locator('#imager-range').fill('−20 °C to 150 °C')
    await page.locator('#imager-nuc').check()
    await page.getByTestId('save-run-header').click()
    await expect.poll(() => page.getByTestId('run-imager-settings').textContent()).toMatch(/Standard 25 mm lens, field of view 24° × 18°, range −20 °C to 150 °C, NUC done/)

    // five ROIs: offsets from the centre on the uniform plate (invented) and a scatter of 0, +0.1, −0.1
    const ROIS: [string, number, number, number][] = [['centre', 150, 110, 0], ['top-left', 40, 30, -0.3], ['top-right', 260, 30, -0.2], ['bottom-left', 40, 190, -0.4], ['bottom-right', 260, 190, 0.1]]
    const readings = (base: number, off: number) => [0, 0.1, -0.1].map(s => (base + off + s).toFixed(1)).join(' ')
    for (const [i, c] of [0, 50, 100].entries()) {
      const row = page.locator(`[data-row="${i}"]`)
      await row.locator('[data-col="source"]').selectOption({ label: plate.assetTag })
      await row.locator('[data-col="setPoint"]').fill(String(c))
      await row.locator('[data-col="indicated"]').fill(String(c))
      const rois = page.locator(`[data-rois="${i}"]`)
      for (const [j, [name, x, y, off]] of ROIS.entries()) {
        if (i === 0 && j > 0) {
          await page.getByTestId(`add-roi-${i}`).click()
          await rois.locator(`[data-roi="${j}"] [data-roi-col="name"]`).fill(name)
        }
        const r = rois.locator(`[data-roi="${j}"]`)
        if (i === 0) {
          for (const [col, v] of [['x', x], ['y', y], ['w', 20], ['h', 20]] as const) await r.locator(`[data-roi-col="${col}"]`).fill(String(v))
        }
        else {
          // a new row takes the previous row's regions, names and positions
          expect(await r.locator('[data-roi-col="name"]').inputValue()).toBe(name)
          expect(await r.locator('[data-roi-col="x"]').inputValue()).toBe(String(x))
        }
        await r.locator('[data-roi-col="readings"]').fill(readings(c + 0.3, off))
        // the 50 °C point: a series of four frames per region on the uniform plate, for the NETD
        if (c === 50) await r.locator('[data-roi-col="frames"]').fill(j === 0 ? '50.32 50.28 50.31 50.29' : '50.34 50.26 50.32 50.28')
      }
      if (i === 0) await shotBoth(page, 'kinds-run-imager-entry')
      await rois.locator('[data-roi="0"] [data-roi-col="readings"]').press('Enter')
      await expect.poll(() => page.locator('[data-testid="results-table"] tbody tr[data-point]').count()).toBe(i + 1)
    }
    // Hand arithmetic: ROI means at offsets 0, −0.3, −0.2, −0.4, +0.1 from the centre → max − min = 0.50 K;
    // s of the means = √(0.172/4) = 0.207 K. NETD: (√(0.001/3) + 4·√(0.004/3))/5 = 0.0329 K.
    await expect.poll(() => page.locator('[data-imager-point="1"] [data-col="uniformity-range"]').textContent()).toBe('0.50')
    expect(await page.locator('[data-imager-point="1"] [data-col="uniformity-sd"]').textContent()).toBe('0.207')
    expect(await page.locator('[data-imager-point="2"] [data-col="netd"]').textContent()).toBe('0.033')
    await shotBoth(page, 'kinds-run-imager')

    const { text } = await submitApproveSign(page, runId, 'imager')
    if (hasPdftotext) {
      for (const s of ['Thermal imager', 'Lens Standard 25 mm lens', 'Field of view 24° × 18°', 'Range setting −20 °C to 150 °C', 'Non-uniformity correction done before measuring',
        'Thermal imager: centre region of interest and uniformity', 'Error at the centre ROI', '0.50', '0.21', 'centre (centre) 150 110 20 20', 'bottom-right 260 190 20 20',
        'NETD = 0.033 K (5 regions of interest, 4 frames)', 'common practice — no standard is named']) {
        expect(text, s).toContain(s)
      }
    }
  })

  it('the calculator offers the ratio model and the interpolation, every number from the API', async () => {
    const { page } = browser
    await signIn(page, DEMO_ACCOUNTS.technician)
    await page.goto(`${BASE_URL}/calculator`)
    // a grey source (ε₁ = ε₂ = 0.9) at 1000 °C read at k = 1 reads the source temperature
    await expect.poll(() => page.getByTestId('ratio-reading').textContent(), { timeout: 15_000 }).toMatch(/1000\.00/)
    await page.locator('#ratio-e2').fill('0.85')
    // non-grey: ε₁/ε₂ = 0.9/0.85 read at k = 1 → 1417.198504673 K = 1144.05 °C (tests/reference/ratio_pyrometer.py, scipy)
    await expect.poll(() => page.getByTestId('ratio-reading').textContent()).toMatch(/1144\.05/)
    await expect.poll(() => page.locator('[data-testid="interp-table"] tbody tr').count()).toBe(2)
    await shotBoth(page, 'kinds-calculator')
    await page.getByTestId('interp-temperatures').fill('700, 1500')
    await expect.poll(() => page.getByTestId('interp-problem').textContent()).toMatch(/Temperature 2: .*outside the calibrated range/)
    await shot(page, 'kinds-calculator-refused')
  })
})
