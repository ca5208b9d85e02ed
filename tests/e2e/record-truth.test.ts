// A record that tells the truth, start to end in a real browser: a customer asks with a
// specification; the lab reviews and offers terms; the customer agrees in the portal; the lab
// records the item's receipt with a defect; the technician enters the measured conditions and the
// points; the reviewer returns the run, the technician fixes it, the reviewer approves; the quality
// manager signs. The PDF states the defect, the agreed rule, the place and n per point and no
// internal note. The lab reopens the certificate, a reading is corrected with a reason, and the
// amendment -R1 states the change; the customer's contacts get both mails (local SMTP) and the
// earlier certificate shows as superseded. A withdrawal shows on the instrument and on /verify.
import path from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import type { Page as ListPage } from '../../shared/types'
import type { InstrumentDTO } from '../../shared/types/registers'
import { openBrowser, shot, signIn } from '../support/browser'
import { BASE_URL, DEMO_ACCOUNTS, signedIn, type Client } from '../support/http'
import { hasPdftotext, pdfText } from '../support/pdf'

let browser: Awaited<ReturnType<typeof openBrowser>>
let admin: Client
let instrument: InstrumentDTO
let requestId = 0
let runId = 0
let original = { id: 0, number: '' }
let amended = { id: 0, number: '', code: '' }

const ARTIFACTS = path.resolve(import.meta.dirname, '../.artifacts/certificates')

/** The bytes of a file the signed-in page can download (its session cookie goes along). */
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

/** Subjects the local mail server received, waited for (the outbox sends every half second in tests). */
async function mailArrived(subject: RegExp): Promise<string[]> {
  let found: string[] = []
  await expect.poll(async () => {
    const rows = (await admin.get('/api/admin/mail/received?pageSize=100')).body.rows as { subject: string, to: string[] }[]
    const hit = rows.find(r => subject.test(r.subject))
    found = hit?.to ?? []
    return !!hit
  }, { timeout: 20_000, interval: 500 }).toBe(true)
  return found
}

beforeAll(async () => {
  browser = await openBrowser()
  admin = await signedIn('admin')
  const customer = await signedIn('customer')
  // One of the customer's own 8–14 µm handhelds that has no open request.
  const list = (await customer.get<ListPage<InstrumentDTO>>('/api/instruments?pageSize=200&status=active')).body.rows
  instrument = list.find(i => i.bandLambda1Um === 8 && i.bandLambda2Um === 14 && /Handheld/.test(i.model) && i.assetTag !== 'KF-IR-013' && i.assetTag !== 'KF-IR-016')!
  expect(instrument).toBeTruthy()
})
afterAll(async () => {
  await browser?.close()
})

describe('a record that tells the truth', () => {
  it('the customer asks, naming a specification; the lab reviews with its capability check; the customer agrees in the portal', async () => {
    const { page } = browser
    await signIn(page, DEMO_ACCOUNTS.customer)
    await page.goto(`${BASE_URL}/requests`)
    await page.locator(`[data-instrument="${instrument.serial}"]`).check()
    await page.locator('#requirements').fill('At 0, 50 and 100 °C, at 300 mm, emissivity setting 0.95')
    await page.locator('#specKind').selectOption('greaterOf')
    await page.locator('#specA').fill('1')
    await page.locator('#specB').fill('1')
    await page.getByTestId('send-request').click()
    await expect.poll(() => page.getByTestId('notice').textContent()).toMatch(/Request sent/)
    const card = page.locator('[data-request]', { hasText: instrument.serial }).first()
    requestId = Number(await card.getAttribute('data-request'))
    expect(requestId).toBeGreaterThan(0)
    await shot(page, 'truth-request-customer')
    await signOut(page)

    await signIn(page, DEMO_ACCOUNTS.technician)
    await page.goto(`${BASE_URL}/requests/${requestId}`)
    await page.getByTestId(`review-${requestId}`).click()
    const procedures = (await (await signedIn('technician')).get('/api/procedures')).body as { name: string, currentVersion: { id: number } }[]
    const plate = procedures.find(p => /flat plate/i.test(p.name))!
    await page.locator('#terms-procedure').selectOption(String(plate.currentVersion.id))
    // A point beyond the procedure's range is refused, with the reason.
    await page.locator('#terms-points').fill('0, 50, 400')
    await page.locator('#terms-distance').fill('300')
    await page.locator('#terms-emissivity').fill('0.95')
    // The specification comes over from the request.
    expect(await page.locator('#terms-specKind').inputValue()).toBe('greaterOf')
    await page.getByTestId('offer-terms').click()
    await expect.poll(() => page.locator('[data-field-error="terms-points"]').textContent()).toMatch(/400 °C is outside the procedure's range/)
    await page.locator('#terms-points').fill('0, 50, 100')
    await page.getByTestId('offer-terms').click()
    await expect.poll(() => page.getByTestId('terms-pending').count()).toBe(1)
    expect(await page.getByTestId('request-terms').textContent()).toMatch(/0\.00 °C, 50\.00 °C, 100\.00 °C[\s\S]*Simple acceptance/)
    await shot(page, 'truth-request-reviewed')
    // Nothing goes into work before the customer agrees.
    expect(await page.getByTestId(`accept-${requestId}`).count()).toBe(0)
    await signOut(page)

    await signIn(page, DEMO_ACCOUNTS.customer)
    await page.goto(`${BASE_URL}/requests/${requestId}`)
    await page.getByTestId(`agree-${requestId}`).click()
    await expect.poll(() => page.getByTestId('terms-agreed').count()).toBe(1)
    await shot(page, 'truth-request-agreed')
    await signOut(page)
  })

  it('the lab accepts it; receipt with a defect, measured conditions (none assumed) and points; review returns it; the fix is approved', async () => {
    const { page } = browser
    await signIn(page, DEMO_ACCOUNTS.technician)
    await page.goto(`${BASE_URL}/requests/${requestId}`)
    await page.getByTestId(`accept-${requestId}`).click()
    await page.getByTestId(`confirm-accept-${requestId}`).click()
    await expect.poll(() => page.getByTestId('notice').textContent()).toMatch(/1 draft run/)
    await page.locator('[data-request] a[href^="/runs/"]').first().click()
    await page.waitForURL(/\/runs\/\d+$/)
    runId = Number(new URL(page.url()).pathname.split('/').pop())

    // Nothing measured is filled in; the receipt is not recorded yet.
    await page.waitForSelector('[data-testid="missing-conditions"]')
    expect(await page.getByTestId('missing-conditions').textContent()).toMatch(/ambient temperature, relative humidity, measuring distance/)
    expect(await page.getByTestId('run-agreement').textContent()).toMatch(/±1 % of reading or ±1 °C[\s\S]*Simple acceptance/)
    expect(await page.getByTestId('no-receipt').count()).toBe(1)

    await page.getByTestId('edit-receipt').click()
    await page.locator('#receivedOn').fill('2026-11-30')
    await page.locator('#packaging').fill('Maker’s case, intact')
    await page.locator('#condition').fill('Lens scratched near its edge; housing and display undamaged')
    await page.locator('#deviations').fill('Lens scratched near its edge')
    await page.getByTestId('save-receipt').click()
    // A deviation goes to the customer first (ISO/IEC 17025 7.4.3).
    await expect.poll(() => page.locator('[data-testid="receipt-form"] [role="alert"]').count()).toBeGreaterThan(0)
    await page.locator('#customerConsulted').check()
    await page.locator('#customerDecision').fill('Calibrate as received; the lens will be replaced at the next service')
    await page.getByTestId('save-receipt').click()
    await expect.poll(() => page.getByTestId('receipt').textContent()).toMatch(/Lens scratched near its edge/)

    await page.getByTestId('edit-run-header').click()
    await page.locator('#ambientTemperatureK').fill('23.1')
    await page.locator('#relativeHumidityPct').fill('41')
    await page.locator('#distanceMm').fill('300')
    await page.locator('#reflectedTemperatureK').fill('23.0')
    await page.locator('#instrumentTemperatureK').fill('23.6')
    await page.locator('#certificateRemarks').fill('Readings taken with the instrument’s emissivity setting at 0.95, as agreed.')
    await page.locator('#internalNotes').fill('Customer rang twice about the turnaround — lab only')
    await page.getByTestId('save-run-header').click()
    await expect.poll(() => page.getByTestId('missing-conditions').count()).toBe(0)
    expect(await page.getByTestId('run-header').textContent()).toMatch(/41 %RH/)

    const plateTag = 'BB-FP-01'
    for (const [i, c] of [0, 50, 100].entries()) {
      const row = page.locator(`[data-row="${i}"]`)
      await row.locator('[data-col="source"]').selectOption({ label: plateTag })
      await row.locator('[data-col="setPoint"]').fill(String(c))
      await row.locator('[data-col="indicated"]').fill(String(c))
      await row.locator('[data-col="readings"]').fill(`${(c - 1.3).toFixed(1)} ${(c - 1.2).toFixed(1)} ${(c - 1.4).toFixed(1)}`)
      await row.locator('[data-col="readings"]').press('Enter')
      await expect.poll(() => page.locator('[data-testid="results-table"] tbody tr[data-point]').count()).toBe(i + 1)
    }
    await shot(page, 'truth-run-entered')
    await page.getByTestId('submit-run').click()
    await expect.poll(() => page.getByTestId('run-status').textContent()).toMatch(/submitted/i)
    // Under review the run is frozen: nothing to edit.
    expect(await page.getByTestId('frozen-note').count()).toBe(1)
    expect(await page.getByTestId('edit-run-header').count()).toBe(0)
    await signOut(page)

    await signIn(page, DEMO_ACCOUNTS.quality)
    await page.goto(`${BASE_URL}/runs/${runId}`)
    await page.locator('#return-comments').fill('Repeat the 100 °C point: the plate had not settled')
    await page.getByTestId('return-run').click()
    await expect.poll(() => page.getByTestId('run-status').textContent()).toMatch(/returned/i)
    await signOut(page)

    await signIn(page, DEMO_ACCOUNTS.technician)
    // Work that waits on the technician is on the overview, with the reviewer's comment.
    await page.goto(`${BASE_URL}/`)
    await expect.poll(() => page.getByTestId('returned-runs').textContent()).toMatch(/the plate had not settled/)
    await shot(page, 'truth-overview-returned')
    await page.goto(`${BASE_URL}/runs/${runId}`)
    expect(await page.getByTestId('returned-note').textContent()).toMatch(/the plate had not settled/)
    await page.getByTestId('change-reason').fill('100 °C point repeated after the plate settled')
    const third = page.locator('[data-row="2"]')
    await third.locator('[data-col="readings"]').fill('99.1 99.0 99.2')
    await third.locator('[data-col="readings"]').press('Enter')
    await expect.poll(async () => (await (await signedIn('technician')).get(`/api/runs/${runId}`)).body.points[2].readingsK[0]).toBeCloseTo(372.25, 6)
    await page.reload()
    await page.getByTestId('submit-run').click()
    await expect.poll(() => page.getByTestId('run-status').textContent()).toMatch(/submitted/i)
    await signOut(page)

    await signIn(page, DEMO_ACCOUNTS.quality)
    await page.goto(`${BASE_URL}/runs/${runId}`)
    await expect.poll(() => page.getByTestId('changes-since-review').textContent()).toMatch(/Point 3[\s\S]*repeated after the plate settled/)
    expect(await page.getByTestId('review-summary').textContent()).toMatch(/3 points/)
    await shot(page, 'truth-review-summary')
    await page.getByTestId('approve-run').click()
    await page.getByTestId('confirm-approve').click()
    await expect.poll(() => page.getByTestId('run-status').textContent()).toMatch(/approved/i)
  })

  it('the quality manager signs; the PDF states the defect, the agreed rule, the place and n per point, and no internal note', async () => {
    const { page } = browser
    await page.getByTestId('issue-certificate').click()
    await page.locator('#sign-password').fill('bandlight-demo')
    await page.getByTestId('sign-submit').click()
    await page.waitForSelector('[data-testid="certificate-number"]')
    original = { id: Number((await page.getByTestId('certificate-number').getAttribute('href'))!.split('/').pop()), number: (await page.getByTestId('certificate-number').textContent())!.trim() }
    const bytes = await download(page, `/api/certificates/${original.id}/pdf`)
    expect(bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-')
    if (hasPdftotext) {
      const text = pdfText(bytes, path.join(ARTIFACTS, `${original.number}.pdf`))
      for (const s of ['Lens scratched near its edge', 'Calibrate as received', 'Specification and decision rule agreed with the customer', 'accepted by the customer in the portal',
        'Simple acceptance, w = 0', 'In the laboratory', 'n is the number of readings averaged', 'Readings taken with the instrument’s emissivity setting at 0.95']) {
        expect(text, s).toContain(s)
      }
      expect(text).not.toContain('rang twice')
    }
    await shot(page, 'truth-certificate-issued')
    expect((await mailArrived(new RegExp(`certificate ${original.number} issued`))).length).toBeGreaterThan(0)
  })

  it('the lab reopens it, a reading is corrected with a reason, and -R1 states the change and supersedes it; the customer is told', async () => {
    const { page } = browser
    await page.goto(`${BASE_URL}/certificates/${original.id}`)
    await page.getByTestId('reopen').click()
    await page.locator('#reopen-reason').fill('The second 50 °C reading was typed from the wrong line of the worksheet')
    await page.getByTestId('confirm-reopen').click()
    await page.waitForURL(/\/runs\/\d+$/)
    const revisionId = Number(new URL(page.url()).pathname.split('/').pop())
    expect(revisionId).not.toBe(runId)
    expect(await page.getByTestId('revision-banner').textContent()).toContain(original.number)
    await signOut(page)

    await signIn(page, DEMO_ACCOUNTS.technician)
    await page.goto(`${BASE_URL}/runs/${revisionId}`)
    await page.getByTestId('change-reason').fill('Reading 2 at 50 °C re-entered from the worksheet')
    const second = page.locator('[data-row="1"]')
    await second.locator('[data-col="readings"]').fill('48.7 48.9 48.6')
    await second.locator('[data-col="readings"]').press('Enter')
    await expect.poll(async () => (await (await signedIn('technician')).get(`/api/runs/${revisionId}`)).body.points[1].readingsK[1]).toBeCloseTo(322.05, 6)
    await page.reload()
    await page.getByTestId('submit-run').click()
    await expect.poll(() => page.getByTestId('run-status').textContent()).toMatch(/submitted/i)
    await signOut(page)

    await signIn(page, DEMO_ACCOUNTS.quality)
    await page.goto(`${BASE_URL}/runs/${revisionId}`)
    await page.getByTestId('approve-run').click()
    await page.getByTestId('confirm-approve').click()
    await expect.poll(() => page.getByTestId('run-status').textContent()).toMatch(/approved/i)
    await page.getByTestId('issue-certificate').click()
    await page.locator('#sign-password').fill('bandlight-demo')
    await page.getByTestId('sign-submit').click()
    await page.waitForSelector('[data-testid="certificate-number"]')
    const link = page.getByTestId('certificate-number')
    amended = { id: Number((await link.getAttribute('href'))!.split('/').pop()), number: (await link.textContent())!.trim(), code: '' }
    expect(amended.number).toBe(`${original.number}-R1`)
    await page.goto(`${BASE_URL}/certificates/${amended.id}`)
    expect(await page.getByTestId('amendment-changes').textContent()).toMatch(/point 2: reading 2 48\.80 °C → 48\.90 °C/)
    amended.code = (await page.locator('dd.font-mono').first().textContent())!.trim()
    const bytes = await download(page, `/api/certificates/${amended.id}/pdf`)
    if (hasPdftotext) {
      const text = pdfText(bytes, path.join(ARTIFACTS, `${amended.number}.pdf`))
      expect(text).toContain(`replaces certificate ${original.number}`)
      expect(text).toContain('What changed: point 2: reading 2 48.80 °C → 48.90 °C')
      expect(text).toContain('typed from the wrong line of the worksheet')
    }
    await shot(page, 'truth-certificate-amended')
    await signOut(page)

    const to = await mailArrived(new RegExp(`${original.number} replaced by ${amended.number}`))
    expect(to.some(a => /kestrelmoor\.example$/.test(a))).toBe(true)

    await signIn(page, DEMO_ACCOUNTS.customer)
    await page.goto(`${BASE_URL}/certificates/${original.id}`)
    await expect.poll(() => page.getByTestId('not-valid').textContent()).toMatch(new RegExp(`Superseded[\\s\\S]*not valid[\\s\\S]*Replaced by ${amended.number}`))
    await shot(page, 'truth-certificate-superseded-customer')
    await signOut(page)
  })

  it('a withdrawal shows on the instrument, in the portal and on /verify with the date and the reason', async () => {
    const { page } = browser
    await signIn(page, DEMO_ACCOUNTS.quality)
    await page.goto(`${BASE_URL}/certificates/${amended.id}`)
    await page.getByTestId('withdraw').click()
    await page.locator('#sign-reason').fill('Issued against the wrong purchase order')
    await page.locator('#sign-password').fill('bandlight-demo')
    await page.getByTestId('sign-submit').click()
    await expect.poll(() => page.getByTestId('not-valid').textContent()).toMatch(/withdrawn on[\s\S]*not valid[\s\S]*wrong purchase order/)
    await signOut(page)
    await mailArrived(new RegExp(`${amended.number} withdrawn`))

    await signIn(page, DEMO_ACCOUNTS.customer)
    await page.goto(`${BASE_URL}/instruments/${instrument.id}`)
    await expect.poll(() => page.getByTestId('withdrawn-notice').textContent()).toMatch(new RegExp(`${amended.number} withdrawn on \\d{4}-\\d{2}-\\d{2} — not valid[\\s\\S]*wrong purchase order`))
    await shot(page, 'truth-instrument-withdrawn-customer')
    await signOut(page)

    await page.goto(`${BASE_URL}/verify?number=${encodeURIComponent(amended.number)}&code=${encodeURIComponent(amended.code)}`)
    await expect.poll(() => page.getByTestId('verify-result').textContent()).toMatch(/Withdrawn/)
    expect(await page.getByTestId('withdrawn-on').textContent()).toMatch(/^\d{4}-\d{2}-\d{2}$/)
    expect(await page.getByTestId('withdrawal-reason').textContent()).toBe('Issued against the wrong purchase order')
    await shot(page, 'truth-verify-withdrawn')
  })
})
