// From request to payment in a real browser (issue 18), against the local payment service the test
// runner starts (scripts/lib/paymentFake.ts): the customer asks; the lab reviews and quotes from the
// price list; the customer accepts with a purchase-order number (the order); the lab accepts the
// request into work and records the receipt (the customer follows the order); the run is measured,
// reviewed and certified; the invoice follows the certificate and its mail reaches the local SMTP
// server; the instrument goes back with a tracking reference; the customer's card is declined on
// the hosted page (still unpaid), then paid (paid for both sides); the provider's event delivered
// again changes nothing. The readings and the run's review go through the API (the run pages have
// their own browser tests, record-truth.test.ts).
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import type { InvoiceDTO, OrderDTO } from '../../shared/types/billing'
import type { ReceivedMessageDTO } from '../../shared/types/mail'
import { openBrowser, pageOverflow, PHONE, shot, shotBoth, signIn } from '../support/browser'
import { equipmentId, makeInstrument, organizationOf, pointOn, type Made } from '../support/factories'
import { BASE_URL, DEMO_ACCOUNTS, signedIn, unique, type Client } from '../support/http'

const PAYMENT_URL = process.env.BANDLIGHT_TEST_PAYMENT_URL ?? ''

let browser: Awaited<ReturnType<typeof openBrowser>>
let admin: Client
let tech: Client
let quality: Client
let customer: Client
let instrument: Made & { serial?: unknown }
let today = ''
let requestId = 0
let quoteId = 0
let orderId = 0
let runId = 0
let invoiceId = 0
const purchaseOrder = unique('PO-E2E-')

async function signOut(page: Page) {
  await page.getByTestId('sign-out').click()
  await page.waitForURL(/\/login/)
}

/** A message the local mail server received whose subject matches, waited for. */
async function mailArrived(subject: RegExp): Promise<ReceivedMessageDTO> {
  let found: ReceivedMessageDTO | undefined
  await expect.poll(async () => {
    const rows = (await admin.get('/api/admin/mail/received?pageSize=100')).body.rows as ReceivedMessageDTO[]
    found = rows.find(r => subject.test(r.subject))
    return !!found
  }, { timeout: 20_000, interval: 500 }).toBe(true)
  return found!
}

beforeAll(async () => {
  expect(PAYMENT_URL, 'the test runner starts the local payment service').toBeTruthy()
  browser = await openBrowser()
  admin = await signedIn('admin')
  tech = await signedIn('technician')
  quality = await signedIn('quality')
  customer = await signedIn('customer')
  today = (await customer.get('/api/settings/today')).body.today
  // An instrument of the customer's own, with nothing asked for it yet.
  instrument = await makeInstrument(tech, await organizationOf(customer))
})
afterAll(async () => {
  await browser?.close()
})

describe('from request to payment', () => {
  it('the customer asks; the lab reviews and sends a quote from the price list; the customer accepts it with a purchase order', async () => {
    const { page } = browser
    await signIn(page, DEMO_ACCOUNTS.customer)
    await page.goto(`${BASE_URL}/requests`)
    await page.locator(`[data-instrument="${String(instrument.serial)}"]`).check()
    await page.locator('#requirements').fill('At 0, 50 and 100 °C, at 300 mm, emissivity setting 0.95')
    await page.getByTestId('send-request').click()
    await expect.poll(() => page.getByTestId('notice').textContent()).toMatch(/Request sent/)
    requestId = Number(await page.locator('[data-request]', { hasText: String(instrument.serial) }).first().getAttribute('data-request'))
    expect(requestId).toBeGreaterThan(0)
    await signOut(page)

    await signIn(page, DEMO_ACCOUNTS.technician)
    await page.goto(`${BASE_URL}/requests/${requestId}`)
    await page.getByTestId(`review-${requestId}`).click()
    const procedures = (await tech.get('/api/procedures')).body as { name: string, currentVersion: { id: number } }[]
    const plate = procedures.find(p => /flat plate/i.test(p.name))!
    await page.locator('#terms-procedure').selectOption(String(plate.currentVersion.id))
    await page.locator('#terms-points').fill('0, 50, 100')
    await page.locator('#terms-distance').fill('300')
    await page.locator('#terms-emissivity').fill('0.95')
    await page.getByTestId('offer-terms').click()
    await expect.poll(() => page.getByTestId('terms-pending').count()).toBe(1)
    // Technicians do not price: no quote to prepare here.
    expect(await page.getByTestId('prepare-quote').count()).toBe(0)
    await signOut(page)

    // The administrator prepares the quote from the request's page: the demo's price for the flat
    // plate (180.00 including 3 points) and an express line (90.00) added by hand.
    await signIn(page, DEMO_ACCOUNTS.admin)
    await page.goto(`${BASE_URL}/requests/${requestId}`)
    await page.getByTestId('prepare-quote').click()
    await page.waitForURL(/\/quotes\/\d+$/)
    quoteId = Number(new URL(page.url()).pathname.split('/').pop())
    expect(await page.getByTestId('billing-lines').textContent()).toMatch(/Calibration of Ormsby Radiometrics Spot 8[\s\S]*up to 3 points[\s\S]*£180\.00/)
    await page.getByTestId('edit-quote').click()
    await page.getByTestId('add-express').click()
    await expect.poll(() => page.getByTestId('editor-total').textContent()).toMatch(/Net £270\.00 · total with tax £324\.00/)
    await page.locator('#message').fill('Express turnaround: back within five working days of receipt.')
    await page.getByTestId('save-quote').click()
    await expect.poll(() => page.getByTestId('notice').textContent()).toMatch(/Draft saved/)
    expect(await page.getByTestId('billing-total').textContent()).toBe('£324.00')
    await shot(page, 'billing-quote-draft')
    await page.getByTestId('send-quote').click()
    await expect.poll(() => page.getByTestId('notice').textContent()).toMatch(/Sent/)
    await signOut(page)
    await mailArrived(new RegExp(`^Quote Q-\\d{4}-\\d{5} for calibration request ${requestId}$`))

    // The customer finds it on the overview, reads it and accepts it with a purchase-order number.
    await signIn(page, DEMO_ACCOUNTS.customer)
    await page.goto(`${BASE_URL}/`)
    await expect.poll(async () => Number(await page.locator('[data-tile="quotes-sent"] p').first().textContent())).toBeGreaterThan(0)
    await page.locator('[data-tile="quotes-sent"]').click()
    await page.waitForURL(/\/quotes\?status=sent/)
    await page.locator(`[data-testid="quote-list"] a[href="/quotes/${quoteId}"]`).click()
    await page.waitForURL(new RegExp(`/quotes/${quoteId}$`))
    expect(await page.getByTestId('billing-total').textContent()).toBe('£324.00')
    await page.getByTestId('accept-quote').click()
    await page.getByTestId('confirm-quote-accept').click()
    // The purchase order is required.
    await expect.poll(() => page.locator('[data-testid="quote-accept-form"]').textContent()).toMatch(/purchase-order number is required/i)
    await page.locator('#purchaseOrder').fill(purchaseOrder)
    await page.getByTestId('confirm-quote-accept').click()
    await expect.poll(() => page.getByTestId('notice').textContent()).toMatch(/your order is placed/)
    expect(await page.getByTestId('quote-po').textContent()).toBe(purchaseOrder)
    await shot(page, 'billing-quote-accepted-customer')
    await page.getByTestId('order-link').click()
    await page.waitForURL(/\/orders\/\d+$/)
    orderId = Number(new URL(page.url()).pathname.split('/').pop())
    expect(await page.locator('[data-step="received"]').getAttribute('data-reached')).toBe('no')
    expect(await page.getByTestId('billing-status').first().textContent()).toBe('Awaiting the instrument')
    await signOut(page)
  })

  it('the lab accepts the request into work and records the receipt; the customer follows the order and is told', async () => {
    const { page } = browser
    await signIn(page, DEMO_ACCOUNTS.technician)
    await page.goto(`${BASE_URL}/requests/${requestId}`)
    // Accepting the quote agreed the terms: the request goes into work.
    await page.getByTestId(`accept-${requestId}`).click()
    await page.getByTestId(`confirm-accept-${requestId}`).click()
    await expect.poll(() => page.getByTestId('notice').textContent()).toMatch(/1 draft run/)
    await page.locator('[data-request] a[href^="/runs/"]').first().click()
    await page.waitForURL(/\/runs\/\d+$/)
    runId = Number(new URL(page.url()).pathname.split('/').pop())
    await page.getByTestId('edit-receipt').click()
    await page.locator('#receivedOn').fill(today)
    await page.locator('#packaging').fill('Maker’s case, intact')
    await page.locator('#condition').fill('No visible damage')
    await page.getByTestId('save-receipt').click()
    await expect.poll(() => page.getByTestId('receipt').textContent()).toMatch(/No visible damage/)
    await signOut(page)

    const order = (await customer.get<OrderDTO>(`/api/orders/${orderId}`)).body
    await mailArrived(new RegExp(`^Order ${order.number}: instrument ${String(instrument.serial)} received$`))
    await signIn(page, DEMO_ACCOUNTS.customer)
    await page.goto(`${BASE_URL}/orders/${orderId}`)
    expect(await page.locator('[data-step="received"]').getAttribute('data-reached')).toBe('yes')
    expect(await page.locator('[data-step-date="received"]').textContent()).toBe(today)
    expect(await page.getByTestId('order-items').textContent()).toContain(today)
    // The customer never sees the laboratory's run.
    expect(await page.locator('[data-testid="order-items"] a[href^="/runs/"]').count()).toBe(0)
    await shot(page, 'billing-order-received-customer')
    await signOut(page)
  })

  it('measured, reviewed and certified; the invoice follows the certificate and its mail arrives with the PDF; the instrument goes back', async () => {
    const { page } = browser
    const run = (await tech.get(`/api/runs/${runId}`)).body
    const header = await tech.patch(`/api/runs/${runId}`, { version: run.version, ambientTemperatureK: 296.15, relativeHumidityPct: 40, distanceMm: 300, reflectedTemperatureK: 296.15, instrumentTemperatureK: 296.45 })
    expect(header.status, JSON.stringify(header.body)).toBe(200)
    const plate = await equipmentId(tech, 'BB-FP-01')
    for (const k of [273.15, 323.15, 373.15]) {
      const p = await tech.post(`/api/runs/${runId}/points`, pointOn(plate, k))
      expect(p.status, JSON.stringify(p.body)).toBe(201)
    }
    const submitted = await tech.post(`/api/runs/${runId}/submit`, { version: (await tech.get(`/api/runs/${runId}`)).body.version })
    expect(submitted.status, JSON.stringify(submitted.body)).toBe(200)
    const approved = await quality.post(`/api/runs/${runId}/approve`, { version: submitted.body.version })
    expect(approved.status, JSON.stringify(approved.body)).toBe(200)
    // In review, then approved: the customer's order says where it stands.
    expect((await customer.get<OrderDTO>(`/api/orders/${orderId}`)).body.stage).toBe('in-review')

    await signIn(page, DEMO_ACCOUNTS.quality)
    await page.goto(`${BASE_URL}/runs/${runId}`)
    await page.getByTestId('issue-certificate').click()
    await page.locator('#sign-password').fill('bandlight-demo')
    await page.getByTestId('sign-submit').click()
    await page.waitForSelector('[data-testid="certificate-number"]')
    await signOut(page)
    expect((await customer.get<OrderDTO>(`/api/orders/${orderId}`)).body.stage).toBe('certified')

    // The instrument goes back with the carrier's tracking reference.
    const tracking = unique('RC-')
    await signIn(page, DEMO_ACCOUNTS.technician)
    await page.goto(`${BASE_URL}/orders/${orderId}`)
    await page.getByTestId('record-return').click()
    await page.locator('#carrier').fill('Ridgeway Couriers')
    await page.locator('#trackingReference').fill(tracking)
    await page.getByTestId('confirm-return').click()
    await expect.poll(() => page.getByTestId('tracking-reference').textContent()).toBe(tracking)
    expect(await page.getByTestId('return-note').textContent()).toMatch(new RegExp(`Sent back on ${today} with Ridgeway Couriers`))
    await signOut(page)

    const order = (await admin.get<OrderDTO>(`/api/orders/${orderId}`)).body
    expect(order).toMatchObject({ stage: 'returned', trackingReference: tracking })
    await mailArrived(new RegExp(`^Order ${order.number}: your instruments are on their way back$`))
    expect(order.invoice).toMatchObject({ status: 'open' })
    invoiceId = order.invoice!.id
    const mail = await mailArrived(new RegExp(`^Invoice ${order.invoice!.number} for order ${order.number}$`))
    expect(mail.to).toContain(DEMO_ACCOUNTS.customer)
    expect(mail.text).toContain('£324.00')
    expect(mail.text).toContain(`/invoices/${invoiceId}`)
    expect(mail.attachments?.map(a => [a.filename, a.contentType])).toEqual([[`${order.invoice!.number}.pdf`, 'application/pdf']])
  })

  it('a declined card leaves the invoice unpaid; the paid one shows paid to the customer and the lab; the event again changes nothing', async () => {
    const { page } = browser
    await signIn(page, DEMO_ACCOUNTS.customer)
    await page.goto(`${BASE_URL}/invoices`)
    await page.locator(`[data-testid="invoice-list"] a[href="/invoices/${invoiceId}"]`).click()
    await page.waitForURL(new RegExp(`/invoices/${invoiceId}$`))
    await page.getByTestId('invoice-balance').waitFor()
    expect(await page.getByTestId('billing-status').textContent()).toBe('Unpaid')
    expect(await page.getByTestId('invoice-balance').textContent()).toBe('£324.00')
    await shot(page, 'billing-invoice-customer')

    // Declined on the payment service's page: back to the invoice, nothing paid.
    await page.getByTestId('pay-by-card').click()
    await page.waitForURL(url => url.href.startsWith(`${PAYMENT_URL}/pay/`))
    expect(await page.getByTestId('fake-total').textContent()).toBe('£324.00')
    await shot(page, 'billing-payment-page')
    await page.getByTestId('fake-decline').click()
    await page.getByTestId('fake-declined').waitFor()
    await page.getByTestId('fake-back').click()
    await page.waitForURL(new RegExp(`/invoices/${invoiceId}\\?payment=cancelled$`))
    await page.getByTestId('payment-cancelled').waitFor()
    expect(await page.getByTestId('billing-status').textContent()).toBe('Unpaid')
    expect(await page.getByTestId('invoice-balance').textContent()).toBe('£324.00')
    const unpaid = (await admin.get<InvoiceDTO>(`/api/invoices/${invoiceId}`)).body
    expect(unpaid).toMatchObject({ status: 'open', paidMinor: 0, payments: [] })
    expect(unpaid.attempts.map(a => a.status)).toEqual(['failed'])

    // Paid: the signed event marks it paid before the customer is back on the invoice.
    await page.getByTestId('pay-by-card').click()
    await page.waitForURL(url => url.href.startsWith(`${PAYMENT_URL}/pay/`))
    await page.getByTestId('fake-pay').click()
    await page.waitForURL(new RegExp(`/invoices/${invoiceId}\\?payment=done$`))
    await page.getByTestId('payment-confirmed').waitFor()
    expect(await page.getByTestId('billing-status').textContent()).toBe('Paid')
    expect(await page.getByTestId('invoice-balance').textContent()).toBe('£0.00')
    expect(await page.getByTestId('payments').textContent()).toMatch(/Card \(online\)[\s\S]*£324\.00/)
    expect(await page.getByTestId('pay-by-card').count()).toBe(0)
    await shot(page, 'billing-invoice-paid-customer')
    await signOut(page)

    await signIn(page, DEMO_ACCOUNTS.admin)
    await page.goto(`${BASE_URL}/invoices/${invoiceId}`)
    expect(await page.getByTestId('billing-status').textContent()).toBe('Paid')
    expect(await page.getByTestId('attempts').textContent()).toMatch(/paid[\s\S]*failed — Your card was declined\./)
    await shot(page, 'billing-invoice-paid-lab')
    const paid = (await admin.get<InvoiceDTO>(`/api/invoices/${invoiceId}`)).body
    expect(paid).toMatchObject({ status: 'paid', paidMinor: 32400, balanceMinor: 0 })

    // The provider delivers the same event again: 200, and nothing changes.
    const events = await (await fetch(`${PAYMENT_URL}/_fake/events`)).json() as { id: string, type: string, body: string, answers: number[] }[]
    const completed = events.filter(e => e.type === 'checkout.session.completed' && JSON.parse(e.body).data.object.metadata.invoiceId === String(invoiceId))
    expect(completed).toHaveLength(1)
    const again = await (await fetch(`${PAYMENT_URL}/_fake/events/${completed[0]!.id}/resend`, { method: 'POST' })).json()
    expect(again).toEqual({ status: 200 })
    expect((await admin.get<InvoiceDTO>(`/api/invoices/${invoiceId}`)).body).toEqual(paid)
    await page.reload()
    expect(await page.locator('[data-testid="payments"] tbody tr').count()).toBe(1)
    await page.goto(`${BASE_URL}/orders/${orderId}`)
    expect(await page.getByTestId('order-invoice').textContent()).toBe(paid.number)
    await signOut(page)
  })

  it('the billing pages fit a phone for the lab and for the customer', async () => {
    const { page } = browser
    const wide: string[] = []
    for (const [who, paths] of [
      [DEMO_ACCOUNTS.admin, ['/admin/prices', `/quotes/${quoteId}`, `/orders/${orderId}`, `/invoices/${invoiceId}`, '/quotes', '/orders', '/invoices']],
      [DEMO_ACCOUNTS.customer, ['/', `/quotes/${quoteId}`, `/orders/${orderId}`, `/invoices/${invoiceId}`, '/invoices']],
    ] as const) {
      await signIn(page, who)
      for (const path of paths) {
        await page.goto(`${BASE_URL}${path}`)
        await page.locator('h1').first().waitFor()
        const name = `billing-${who.split('@')[0]}${path.replace(/\//g, '-').replace(/-$/, '') || '-overview'}`
        await shotBoth(page, name)
        await page.setViewportSize(PHONE)
        if (await pageOverflow(page) > 0) wide.push(`${who} ${path}`)
        await page.setViewportSize({ width: 1360, height: 860 })
      }
      await signOut(page)
    }
    expect(wide, 'pages that scroll sideways on a phone').toEqual([])
  })
})
