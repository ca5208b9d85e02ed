// Machine-readable certificates in the browser: a certificate offers its DCC (XML) beside the PDF;
// a supplier's DCC is imported onto a reference instrument's calibration record — shown first,
// recorded only on confirmation, the file kept.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { makeReference } from '../support/factories'
import { openBrowser, shot, signIn } from '../support/browser'
import { BASE_URL, DEMO_ACCOUNTS, signedIn, type Client } from '../support/http'

let browser: Awaited<ReturnType<typeof openBrowser>>
let quality: Client
beforeAll(async () => {
  browser = await openBrowser()
  quality = await signedIn('quality')
})
afterAll(async () => {
  await browser?.close()
})

describe('digital calibration certificates', () => {
  it('a DCC exported from one certificate is imported as a reference instrument’s calibration, preview first', async () => {
    const certs = (await quality.get('/api/certificates?status=valid&pageSize=5')).body.rows as { id: number, number: string }[]
    expect(certs.length).toBeGreaterThan(0)
    const cert = certs[0]!
    const res = await fetch(`${BASE_URL}/api/certificates/${cert.id}/dcc`, { headers: { cookie: quality.cookieHeader() } })
    expect(res.status).toBe(200)
    expect(res.headers.get('content-type')).toContain('xml')
    const xml = Buffer.from(await res.arrayBuffer())
    const ref = await makeReference(quality, { calibration: null })

    const { page } = browser
    await signIn(page, DEMO_ACCOUNTS.quality)
    await page.goto(`${BASE_URL}/certificates/${cert.id}`)
    expect(await page.getByTestId('download-dcc').getAttribute('href')).toBe(`/api/certificates/${cert.id}/dcc`)

    await page.goto(`${BASE_URL}/reference-instruments/${ref.id}`)
    // A click before the page has hydrated does nothing (the button's handler is not attached yet): let its scripts load first.
    await page.waitForLoadState('networkidle')
    await page.getByTestId('import-dcc').click()
    // A file that is not a DCC is refused, naming the file.
    await page.getByTestId('dcc-file').setInputFiles({ name: 'notes.xml', mimeType: 'application/xml', buffer: Buffer.from('<?xml version="1.0"?><notes><n>1</n></notes>') })
    await page.getByTestId('dcc-check').click()
    await expect.poll(() => page.locator('[data-field-error="file"]').count()).toBe(1)
    await page.getByTestId('dcc-file').setInputFiles({ name: `${cert.number}.xml`, mimeType: 'application/xml', buffer: xml })
    await page.getByTestId('dcc-check').click()
    await expect.poll(() => page.getByTestId('dcc-preview').textContent()).toContain(cert.number)
    // Nothing is recorded by the preview.
    expect((await quality.get(`/api/reference-instruments/${ref.id}`)).body.calibrations).toHaveLength(0)
    await shot(page, 'dcc-import-preview')
    await page.locator('#dcc-due').fill('2028-01-31')
    await page.getByTestId('dcc-record').click()
    await expect.poll(() => page.locator(`[data-calibration="${cert.number}"]`).count()).toBe(1)
    const recorded = (await quality.get(`/api/reference-instruments/${ref.id}`)).body.calibrations[0]
    expect(recorded).toMatchObject({ certificateNumber: cert.number, dueDate: '2028-01-31' })
    expect(recorded.uploadId).toEqual(expect.any(Number))
  })
})
