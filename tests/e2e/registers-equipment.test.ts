import fs from 'node:fs'
import os from 'node:os'
import path from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { openBrowser, shot, signIn } from '../support/browser'
import { BASE_URL, DEMO_ACCOUNTS, unique } from '../support/http'

let browser: Awaited<ReturnType<typeof openBrowser>>
let tmp: string
beforeAll(async () => {
  browser = await openBrowser()
  tmp = fs.mkdtempSync(path.join(os.tmpdir(), 'bandlight-e2e-equipment-'))
  await signIn(browser.page, DEMO_ACCOUNTS.quality)
})
afterAll(async () => {
  await browser?.close()
  if (tmp) fs.rmSync(tmp, { recursive: true, force: true })
})

/** A minimal, well-formed one-page PDF: the server detects the type from these bytes. */
function tinyPdf(name: string): string {
  const body = [
    '%PDF-1.4',
    '1 0 obj <</Type /Catalog /Pages 2 0 R>> endobj',
    '2 0 obj <</Type /Pages /Kids [3 0 R] /Count 1>> endobj',
    '3 0 obj <</Type /Page /Parent 2 0 R /MediaBox [0 0 200 200]>> endobj',
    'trailer <</Root 1 0 R>>',
    '%%EOF',
    '',
  ].join('\n')
  const file = path.join(tmp, name)
  fs.writeFileSync(file, body, 'latin1')
  return file
}

const tag = unique('BB-T')

describe('blackbody sources (quality manages them)', () => {
  it('registers a source with a correction table, refusing set-points that do not increase', async () => {
    const { page } = browser
    await page.goto(`${BASE_URL}/sources`)
    await page.waitForSelector('[data-testid="row-total"]')
    expect(await page.getByTestId('new-source').count()).toBe(1)
    await shot(page, 'sources-list')

    await page.getByTestId('new-source').click()
    await page.waitForSelector('[data-testid="source-form"]')
    await page.locator('#assetTag').fill(tag)
    await page.locator('#kind').selectOption('flat-plate')
    await page.locator('#maker').fill('Tessellate Thermal')
    await page.locator('#model').fill('TP-200 plate')
    await page.locator('#serial').fill(`TT-${tag}`)
    await page.locator('#minTemperatureK').fill('20')
    await page.locator('#maxTemperatureK').fill('350')
    await page.locator('#emissivity').fill('0.96')
    await page.locator('#emissivityU').fill('0.004')
    await page.getByTestId('add-correction').click()
    await page.getByTestId('add-correction').click()
    await page.locator('[data-correction-setpoint="0"]').fill('100')
    await page.locator('[data-correction-value="0"]').fill('0.12')
    await page.locator('[data-correction-setpoint="1"]').fill('50')
    await page.locator('[data-correction-value="1"]').fill('-0.08')
    await page.getByTestId('save-source').click()
    await expect.poll(() => page.locator('[data-field-error="corrections"]').first().textContent()).toMatch(/increase/i)
    await shot(page, 'sources-new-errors')

    await page.locator('[data-correction-setpoint="1"]').fill('250')
    await page.getByTestId('save-source').click()
    await page.waitForURL(/\/sources\/\d+$/)
    await page.waitForSelector('[data-testid="correction-table"]')
    const rows = await page.locator('[data-testid="correction-table"] tbody tr').allTextContents()
    expect(rows).toHaveLength(2)
    expect(rows[0]).toContain('100.00')
    expect(rows[0]).toContain('+0.120')
    expect(rows[1]).toContain('250.00')
    expect(rows[1]).toContain('−0.080')
    expect(await page.getByTestId('no-calibration-notice').count()).toBe(1)
    // 350 °C: the hot-source caution shows, the bright-source one does not.
    expect(await page.getByTestId('hot-caution').count()).toBe(1)
    expect(await page.getByTestId('eye-caution').count()).toBe(0)
  })

  it('records a calibration with its certificate file, and shows the due date', async () => {
    const { page } = browser
    await page.getByTestId('add-calibration').click()
    await page.locator('#provider').fill('Hallbeck Thermal Standards Laboratory')
    await page.locator('#certificateNumber').fill(`HTS-${tag}`)
    await page.locator('#calibrationDate').fill('2026-11-20')
    await page.locator('#dueDate').fill('2026-11-01')
    await page.getByTestId('save-calibration').click()
    await expect.poll(() => page.locator('[data-field-error="dueDate"]').textContent()).toMatch(/after the calibration date/)

    await page.locator('#dueDate').fill('2027-11-20')
    await page.locator('#results').fill('Radiance temperature at two set-points; corrections as tabulated.')
    await page.locator('#certificateFile').setInputFiles(tinyPdf('certificate.pdf'))
    await page.getByTestId('save-calibration').click()
    await expect.poll(() => page.getByTestId('notice').textContent()).toMatch(/Calibration recorded/)
    await expect.poll(() => page.getByTestId('due-date').textContent()).toContain('2027-11-20')
    expect(await page.getByTestId('no-calibration-notice').count()).toBe(0)
    const row = page.locator(`[data-calibration="HTS-${tag}"]`)
    expect(await row.textContent()).toContain('2026-11-20')
    const href = await row.getByTestId('certificate-link').getAttribute('href')
    expect(href).toMatch(/^\/api\/uploads\/\d+$/)
    const file = await page.request.get(`${BASE_URL}${href}`)
    expect(file.status()).toBe(200)
    expect(file.headers()['content-type']).toBe('application/pdf')
    expect((await file.body()).subarray(0, 8).toString('latin1')).toBe('%PDF-1.4')
    await shot(page, 'source-detail')

    // The new source is in the list with its due date.
    await page.goto(`${BASE_URL}/sources`)
    await page.getByTestId('search').fill(tag)
    await expect.poll(() => page.getByTestId('row-total').textContent()).toMatch(/^1 records?$/)
    expect(await page.locator('tbody tr').first().textContent()).toContain('2027-11-20')
  })

  it('registers reference instruments in kelvin (entered in °C) and in %RH', async () => {
    const { page } = browser
    const prt = unique('REF-T')
    await page.goto(`${BASE_URL}/reference-instruments/new`)
    await page.waitForSelector('[data-testid="reference-form"]')
    await page.locator('#assetTag').fill(prt)
    await page.locator('#maker').fill('Vellmar Sensorik')
    await page.locator('#model').fill('PT100-S4 probe')
    await page.locator('#serial').fill(`VS-${prt}`)
    await page.locator('#rangeMin').fill('-40')
    await page.locator('#rangeMax').fill('-50')
    await page.getByTestId('save-reference').click()
    await expect.poll(() => page.locator('[data-field-error="rangeMax"]').textContent()).toMatch(/above the minimum/)
    await page.locator('#rangeMax').fill('420')
    await page.locator('#standardUncertainty').fill('0.02')
    await page.getByTestId('save-reference').click()
    await page.waitForURL(/\/reference-instruments\/\d+$/)
    expect(await page.getByTestId('reference-record').textContent()).toContain('-40.0 °C to 420.0 °C')
    await shot(page, 'reference-detail')

    const hyg = unique('REF-H')
    await page.goto(`${BASE_URL}/reference-instruments/new`)
    await page.waitForSelector('[data-testid="reference-form"]')
    await page.locator('#kind').selectOption('hygrometer')
    await expect.poll(() => page.locator('#rangeUnit').inputValue()).toBe('%RH')
    expect(await page.locator('#rangeUnit').isDisabled()).toBe(true)
    await page.locator('#assetTag').fill(hyg)
    await page.locator('#maker').fill('Brisk Meteor Devices')
    await page.locator('#model').fill('HM-30')
    await page.locator('#serial').fill(`BMD-${hyg}`)
    await page.locator('#rangeMin').fill('5')
    await page.locator('#rangeMax').fill('95')
    await page.locator('#standardUncertainty').fill('1.5')
    await page.getByTestId('save-reference').click()
    await page.waitForURL(/\/reference-instruments\/\d+$/)
    expect(await page.getByTestId('reference-record').textContent()).toContain('5 %RH to 95 %RH')

    await page.goto(`${BASE_URL}/reference-instruments`)
    await page.getByTestId('search').fill('REF-')
    await expect.poll(async () => Number.parseInt((await page.getByTestId('row-total').textContent()) ?? '0')).toBeGreaterThanOrEqual(7)
    await shot(page, 'reference-list')
  })
})

describe('blackbody sources (technicians read them)', () => {
  it('shows sources read-only, with the past-due flag and the bright-source caution', async () => {
    const { page } = browser
    await page.getByTestId('sign-out').click()
    await page.waitForURL(/\/login/)
    await signIn(page, DEMO_ACCOUNTS.technician)

    await page.goto(`${BASE_URL}/sources`)
    await page.waitForSelector('[data-testid="row-total"]')
    expect(await page.getByTestId('new-source').count()).toBe(0)
    expect(await page.getByTestId('import').count()).toBe(0)
    expect(await page.getByTestId('export').count()).toBe(1)
    // The demo's high-temperature cavity is overdue.
    await page.getByTestId('search').fill('BB-CV-03')
    await expect.poll(() => page.getByTestId('row-total').textContent()).toMatch(/^1 records?$/)
    expect(await page.locator('tbody tr').first().getByTestId('past-due').count()).toBe(1)
    await shot(page, 'sources-technician')

    await page.locator('tbody tr').first().click()
    await page.waitForURL(/\/sources\/\d+$/)
    await page.waitForSelector('[data-testid="source-record"]')
    expect(await page.getByTestId('past-due-notice').textContent()).toMatch(/past due/i)
    expect(await page.getByTestId('eye-caution').count()).toBe(1)
    for (const id of ['edit', 'archive', 'add-calibration']) expect(await page.getByTestId(id).count()).toBe(0)
    expect(await page.locator('[data-testid="calibration-history"] tbody tr').count()).toBeGreaterThanOrEqual(1)
    await shot(page, 'source-detail-technician')

    await page.goto(`${BASE_URL}/sources/new`)
    await expect.poll(() => page.textContent('body')).toMatch(/403|Quality and admin/)
  })
})
