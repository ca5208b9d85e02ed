// Billing through the API (issue 18): the price list kept in versions; quotes from reviewed requests
// accepted with a purchase order into orders; invoices numbered gap-free in their own series under
// concurrent issues; customers kept to their own organization's quotes, orders and invoices (404);
// and card payment through the local payment service the test runner starts
// (scripts/lib/paymentFake.ts, BANDLIGHT_TEST_PAYMENT_URL): only a verified event pays an invoice, a
// wrong or missing signature is 400, audited and changes nothing, a replayed event changes nothing.
// Prices here are invented for the test; the arithmetic (20 % tax on the net total) is the price
// list's own rule (shared/billing/money.ts).
import Papa from 'papaparse'
import { beforeAll, describe, expect, it } from 'vitest'
import { signatureFor } from '../../scripts/lib/paymentFake'
import type { AuditEventDTO, Page } from '../../shared/types'
import type { InvoiceDTO, OrderDTO, PriceListsDTO, QuoteDTO } from '../../shared/types/billing'
import type { OutboxMessageDTO } from '../../shared/types/mail'
import { equipmentId, issueCertificate, makeCustomer, makeInstrument, makeProcedure, organizationOf, pointOn } from '../support/factories'
import { Client, DEMO_PASSWORD, signedIn, unique } from '../support/http'

const PAYMENT_URL = process.env.BANDLIGHT_TEST_PAYMENT_URL ?? ''
const WEBHOOK_SECRET = process.env.STRIPE_WEBHOOK_SECRET ?? ''

let admin: Client
let tech: Client
let quality: Client
let customer: Client
let ownOrg = 0
let procedure: { id: number, currentVersion: { id: number } }

/** The current price list as the body of POST /api/prices, with changes. */
async function priceListBody(over: Record<string, unknown> = {}): Promise<Record<string, unknown>> {
  const { current } = (await admin.get<PriceListsDTO>('/api/prices')).body
  expect(current, 'the demo has a price list').toBeTruthy()
  const { currency, taxRatePercent, paymentTermsDays, quoteValidDays, bankDetails, items, extras } = current!
  return { currency, taxRatePercent, paymentTermsDays, quoteValidDays, bankDetails, note: null, items, extras, ...over }
}

/** The price list with this test's procedure priced at `priceMinor` for 2 points and 2000 per further point. */
async function priceProcedure(priceMinor: number, note: string): Promise<PriceListsDTO> {
  const body = await priceListBody({ note })
  const items = (body.items as { procedureId: number | null }[]).filter(i => i.procedureId !== procedure.id)
  const r = await admin.post<PriceListsDTO>('/api/prices', { ...body, items: [...items, { label: 'Billing test procedure', procedureId: procedure.id, instrumentKind: null, priceMinor, includedPoints: 2, extraPointMinor: 2000 }] })
  expect(r.status, JSON.stringify(r.body)).toBe(201)
  return r.body
}

/** A request of the customer's organization for one new instrument, reviewed by the lab with three points. */
async function reviewedRequest(asker: Client, organizationId: number): Promise<{ id: number, version: number }> {
  const instrument = await makeInstrument(tech, organizationId)
  const made = await asker.post('/api/requests', { instrumentIds: [instrument.id], requirements: 'At 0, 50 and 100 °C' })
  expect(made.status, JSON.stringify(made.body)).toBe(201)
  const reviewed = await tech.post(`/api/requests/${made.body.id}/review`, {
    version: made.body.version,
    terms: { procedureVersionId: procedure.currentVersion.id, pointsK: [273.15, 323.15, 373.15], distanceMm: 300, emissivitySetting: 0.95, decisionRule: 'simple-acceptance' },
  })
  expect(reviewed.status, JSON.stringify(reviewed.body)).toBe(200)
  return reviewed.body
}

/** A quote made by the laboratory for a request and sent. */
async function sentQuote(requestId: number): Promise<QuoteDTO> {
  const draft = await admin.post<QuoteDTO>('/api/quotes', { requestId })
  expect(draft.status, JSON.stringify(draft.body)).toBe(201)
  const sent = await admin.post<QuoteDTO>(`/api/quotes/${draft.body.id}/send`, { version: draft.body.version })
  expect(sent.status, JSON.stringify(sent.body)).toBe(200)
  return sent.body
}

/** Request → review → quote → the customer accepts with a purchase order: the order. */
async function placedOrder(asker: Client, organizationId: number, purchaseOrder = unique('PO-')): Promise<{ quote: QuoteDTO, order: OrderDTO }> {
  const request = await reviewedRequest(asker, organizationId)
  const quote = await sentQuote(request.id)
  const accepted = await asker.post<QuoteDTO>(`/api/quotes/${quote.id}/accept`, { version: quote.version, purchaseOrder })
  expect(accepted.status, JSON.stringify(accepted.body)).toBe(200)
  expect(accepted.body.orderId).toEqual(expect.any(Number))
  const order = await admin.get<OrderDTO>(`/api/orders/${accepted.body.orderId}`)
  expect(order.status).toBe(200)
  return { quote: accepted.body, order: order.body }
}

/** An order invoiced by hand: the invoice. */
async function invoicedOrder(asker: Client, organizationId: number, purchaseOrder?: string): Promise<{ quote: QuoteDTO, order: OrderDTO, invoice: InvoiceDTO }> {
  const { quote, order } = await placedOrder(asker, organizationId, purchaseOrder)
  const r = await admin.post<InvoiceDTO>(`/api/orders/${order.id}/invoice`, { version: order.version })
  expect(r.status, JSON.stringify(r.body)).toBe(201)
  return { quote, order, invoice: r.body }
}

/** A new customer organization with its own portal user, signed in. */
async function otherCustomer(): Promise<{ client: Client, organizationId: number }> {
  const org = await makeCustomer(admin)
  const email = `${unique('billing')}@bandlight.test`
  const made = await admin.post('/api/admin/users', { email, name: 'Other Customer', role: 'customer', organizationId: org.id, password: 'a-good-long-password' })
  expect(made.status, JSON.stringify(made.body)).toBe(201)
  const client = new Client()
  expect((await client.login(email, 'a-good-long-password')).status).toBe(200)
  return { client, organizationId: org.id }
}

const sequenceOf = (number: string) => Number(number.split('-').pop())

/** Where this file's webhook deliveries come from (the test server trusts X-Forwarded-For); refusals are counted per address. */
const SENDER = '203.0.113.118'

/** POST a body to the webhook as the provider would, with this signature header (none when null). */
function deliver(body: string, signature: string | null, userAgent: string) {
  return new Client().request('POST', '/api/payments/webhook', body, { 'content-type': 'application/json', 'user-agent': userAgent, 'x-forwarded-for': SENDER, ...(signature === null ? {} : { 'stripe-signature': signature }) })
}

/** The latest audit rows of an action whose `after` matches (other test files may write rows meanwhile). */
async function auditRows(action: string, after: Record<string, unknown>): Promise<AuditEventDTO[]> {
  const r = await admin.get<Page<AuditEventDTO>>(`/api/admin/audit?action=${action}&pageSize=200`)
  expect(r.status).toBe(200)
  return r.body.rows.filter(a => Object.entries(after).every(([k, v]) => (a.after as Record<string, unknown> | null)?.[k] === v))
}

interface FakeEvent { id: string, type: string, body: string, answers: number[] }
async function fakeEvents(): Promise<FakeEvent[]> {
  const r = await fetch(`${PAYMENT_URL}/_fake/events`)
  expect(r.status).toBe(200)
  return await r.json() as FakeEvent[]
}

/** The customer's answer on the fake's hosted page: pay or decline. */
async function answerOnPage(sessionUrl: string, action: 'pay' | 'decline'): Promise<Response> {
  return fetch(sessionUrl, { method: 'POST', headers: { 'content-type': 'application/x-www-form-urlencoded' }, body: `action=${action}`, redirect: 'manual' })
}

beforeAll(async () => {
  expect(PAYMENT_URL, 'the test runner starts the local payment service').toBeTruthy()
  expect(WEBHOOK_SECRET, 'the test runner gives the tests the webhook secret').toBeTruthy()
  admin = await signedIn('admin')
  tech = await signedIn('technician')
  quality = await signedIn('quality')
  customer = await signedIn('customer')
  ownOrg = await organizationOf(customer)
  procedure = await makeProcedure(quality, {
    cmc: [{ minK: 253.15, maxK: 423.15, expandedUncertaintyK: 0.6 }],
    applicability: { sourceKinds: ['flat-plate'], bandMinUm: 7, bandMaxUm: 15, minK: 253.15, maxK: 423.15 },
  })
  await priceProcedure(15000, 'Billing test: a price for the test procedure')
})

describe('price list', () => {
  it('every save is a new version, audited; a quote keeps the prices it was made with', async () => {
    const before = (await admin.get<PriceListsDTO>('/api/prices')).body
    const first = await priceProcedure(15000, unique('first '))
    expect(first.current!.versionNumber).toBe(before.current!.versionNumber + 1)
    const requestA = await reviewedRequest(customer, ownOrg)
    const quoteA = (await admin.post<QuoteDTO>('/api/quotes', { requestId: requestA.id })).body
    // 1 × 150.00 with 2 points included, 1 further point at 20.00: net 170.00, 20 % tax 34.00.
    expect(quoteA.lines.map(l => [l.kind, l.quantity, l.unitPriceMinor])).toEqual([['calibration', 1, 15000], ['extra-points', 1, 2000]])
    expect(quoteA).toMatchObject({ currency: 'GBP', taxRatePercent: 20, netMinor: 17000, taxMinor: 3400, grossMinor: 20400 })

    const second = await priceProcedure(16000, unique('second '))
    expect(second.current!.versionNumber).toBe(first.current!.versionNumber + 1)
    // Every version is kept, newest first.
    expect(second.versions.slice(0, 3).map(v => v.versionNumber)).toEqual([second.current!.versionNumber, first.current!.versionNumber, before.current!.versionNumber])
    expect(second.versions[1]!.note).toBe(first.current!.note)
    const audit = (await admin.get<Page<AuditEventDTO>>(`/api/admin/audit?entity=PriceList&entityId=${second.current!.id}&pageSize=10`)).body.rows
    expect(audit.map(a => [a.action, a.userName])).toEqual([['new-version', 'Ada Marwick']])

    // The draft made before keeps its prices; a quote made now takes the new version's.
    expect((await admin.get<QuoteDTO>(`/api/quotes/${quoteA.id}`)).body.grossMinor).toBe(20400)
    const requestB = await reviewedRequest(customer, ownOrg)
    const quoteB = (await admin.post<QuoteDTO>('/api/quotes', { requestId: requestB.id })).body
    expect(quoteB.lines[0]!.unitPriceMinor).toBe(16000)
    expect(quoteB.grossMinor).toBe(21600)

    // Only the administrator keeps the prices; a bad list changes nothing.
    expect((await tech.get('/api/prices')).status).toBe(403)
    expect((await customer.post('/api/prices', await priceListBody())).status).toBe(403)
    const bad = await admin.post('/api/prices', await priceListBody({ currency: 'pounds', taxRatePercent: -1 }))
    expect(bad.status).toBe(400)
    expect(Object.keys(bad.body.data.fields)).toEqual(expect.arrayContaining(['currency', 'taxRatePercent']))
    expect((await admin.get<PriceListsDTO>('/api/prices')).body.current!.versionNumber).toBe(second.current!.versionNumber)
    // Back to the first price for the tests below.
    await priceProcedure(15000, 'Billing test: back to 150.00')
  })
})

describe('invoice numbers', () => {
  it('are gap-free in their own series under 8 concurrent issues, one invoice per order', async () => {
    const orders: OrderDTO[] = []
    for (let i = 0; i < 8; i++) orders.push((await placedOrder(customer, ownOrg)).order)
    const replies = await Promise.all(orders.map(o => admin.post<InvoiceDTO>(`/api/orders/${o.id}/invoice`, { version: o.version })))
    for (const r of replies) expect(r.status, JSON.stringify(r.body)).toBe(201)
    const numbers = replies.map(r => r.body.number)
    expect(new Set(numbers).size).toBe(8)
    const year = numbers[0]!.split('-')[1]
    for (const n of numbers) expect(n).toMatch(new RegExp(`^INV-${year}-\\d{5}$`))
    const ours = numbers.map(sequenceOf).sort((a, b) => a - b)
    expect(ours.at(-1)! - ours[0]!).toBe(7)
    // The whole year's series has no gap, from 1.
    const all = (await admin.get<Page<InvoiceDTO>>('/api/invoices?pageSize=500')).body.rows
      .filter(i => i.number.startsWith(`INV-${year}-`)).map(i => sequenceOf(i.number)).sort((a, b) => a - b)
    expect(all).toEqual(all.map((_, i) => i + 1))
    // Each invoice is the quote's lines, due 30 days after issue (the price list's terms).
    for (const r of replies) {
      expect(r.body).toMatchObject({ status: 'open', grossMinor: 20400, balanceMinor: 20400, origin: 'manual' })
      expect(Date.parse(r.body.dueDate) - Date.parse(r.body.issueDate)).toBe(30 * 86_400_000)
    }
    // An order is invoiced once, also when asked twice at the same time.
    const { order } = await placedOrder(customer, ownOrg)
    const twice = await Promise.all([0, 1].map(() => admin.post(`/api/orders/${order.id}/invoice`, { version: order.version })))
    expect(twice.map(r => r.status).sort()).toEqual([201, 409])
  })
})

describe('customers see only their own organization\'s billing', () => {
  it('another organization\'s quote, order and invoice answer 404 and are not listed; a draft is not shown to anyone outside the lab', async () => {
    const other = await otherCustomer()
    const { quote, order, invoice } = await invoicedOrder(other.client, other.organizationId)
    // The other organization sees its own.
    expect((await other.client.get(`/api/quotes/${quote.id}`)).status).toBe(200)
    expect((await other.client.get(`/api/orders/${order.id}`)).status).toBe(200)
    expect((await other.client.get(`/api/invoices/${invoice.id}`)).status).toBe(200)
    expect((await other.client.get(`/api/invoices/${invoice.id}/pdf`)).status).toBe(200)
    expect((await other.client.get(`/api/quotes/${quote.id}/pdf`)).status).toBe(200)

    for (const path of [`/api/quotes/${quote.id}`, `/api/quotes/${quote.id}/pdf`, `/api/orders/${order.id}`, `/api/invoices/${invoice.id}`, `/api/invoices/${invoice.id}/pdf`]) {
      expect((await customer.get(path)).status, path).toBe(404)
    }
    expect((await customer.post(`/api/quotes/${quote.id}/decline`, { version: quote.version, reason: 'Not ours' })).status).toBe(404)
    expect((await customer.post(`/api/invoices/${invoice.id}/checkout`)).status).toBe(404)
    const lists = await Promise.all(['/api/quotes', '/api/orders', '/api/invoices'].map(p => customer.get<Page<{ id: number, organizationId: number }>>(`${p}?pageSize=500`)))
    for (const l of lists) {
      expect(l.status).toBe(200)
      expect(l.body.rows.every(r => r.organizationId === ownOrg)).toBe(true)
    }
    expect(lists[0]!.body.rows.map(r => r.id)).not.toContain(quote.id)
    expect(lists[1]!.body.rows.map(r => r.id)).not.toContain(order.id)
    expect(lists[2]!.body.rows.map(r => r.id)).not.toContain(invoice.id)

    // A draft quote of the customer's own request: not shown to the customer until it is sent.
    const request = await reviewedRequest(customer, ownOrg)
    const draft = (await admin.post<QuoteDTO>('/api/quotes', { requestId: request.id })).body
    expect((await customer.get(`/api/quotes/${draft.id}`)).status).toBe(404)
    expect((await customer.post(`/api/quotes/${draft.id}/accept`, { version: draft.version, purchaseOrder: 'PO-1' })).status).toBe(404)
    expect((await customer.get(`/api/quotes?requestId=${request.id}`)).body.total).toBe(0)
  })
})

describe('card payment through the local payment service', () => {
  it('a wrong or missing signature is 400, audited, and changes nothing; a declined card leaves the invoice unpaid; only the verified event pays it; a replayed event changes nothing', async () => {
    const { invoice } = await invoicedOrder(customer, ownOrg)
    const checkout = await customer.post<{ url: string }>(`/api/invoices/${invoice.id}/checkout`)
    expect(checkout.status, JSON.stringify(checkout.body)).toBe(200)
    expect(checkout.body.url.startsWith(`${PAYMENT_URL}/pay/cs_test_`)).toBe(true)
    const sessionId = checkout.body.url.split('/').pop()!
    const before = (await admin.get<InvoiceDTO>(`/api/invoices/${invoice.id}`)).body
    expect(before).toMatchObject({ status: 'open', paidMinor: 0, payments: [] })
    expect(before.attempts.map(a => a.status)).toEqual(['open'])

    // A forged "paid" event for this very session, signed with another secret, with none, with a garbled one, and a genuine signature over another body.
    const forged = JSON.stringify({
      id: `evt_${unique('forged')}`, object: 'event', type: 'checkout.session.completed', created: Math.floor(Date.now() / 1000),
      data: { object: { id: sessionId, object: 'checkout.session', payment_status: 'paid', amount_total: invoice.grossMinor, currency: 'gbp', metadata: { invoiceId: String(invoice.id), attemptId: String(before.attempts[0]!.id) } } },
    })
    const agent = unique('forger-')
    const wrongSecret = await deliver(forged, signatureFor(forged, 'whsec_not_the_secret'), agent)
    expect(wrongSecret.status).toBe(400)
    expect(wrongSecret.body.data.fields).toHaveProperty('signature')
    expect((await deliver(forged, null, agent)).status).toBe(400)
    expect((await deliver(forged, 't=1,v1=00', agent)).status).toBe(400)
    const other = JSON.stringify({ id: 'evt_other', object: 'event', type: 'ping', data: { object: {} } })
    expect((await deliver(forged, signatureFor(other, WEBHOOK_SECRET), agent)).status).toBe(400)
    // Nothing changed, and each refusal is in the audit trail with the caller.
    expect((await admin.get<InvoiceDTO>(`/api/invoices/${invoice.id}`)).body).toEqual(before)
    expect(await auditRows('payment-event', { invoiceId: invoice.id })).toEqual([])
    const refusals = await auditRows('refused-webhook', { userAgent: agent })
    expect(refusals).toHaveLength(4)
    for (const a of refusals) expect(a.after).toMatchObject({ address: SENDER, reason: expect.any(String) })
    expect(refusals.map(a => (a.after as { signaturePresent: boolean }).signaturePresent).sort()).toEqual([false, true, true, true])

    // The customer's card is declined on the hosted page: the attempt fails, the invoice stays unpaid.
    const declined = await answerOnPage(checkout.body.url, 'decline')
    expect(declined.status).toBe(402)
    await expect.poll(async () => (await admin.get<InvoiceDTO>(`/api/invoices/${invoice.id}`)).body.attempts[0]!.status).toBe('failed')
    const afterDecline = (await admin.get<InvoiceDTO>(`/api/invoices/${invoice.id}`)).body
    expect(afterDecline).toMatchObject({ status: 'open', paidMinor: 0, balanceMinor: invoice.grossMinor, payments: [] })
    expect(afterDecline.attempts[0]!.failure).toBe('Your card was declined.')

    // Paid on the hosted page: the provider's signed event pays the invoice (the page returns to the invoice).
    const paid = await answerOnPage(checkout.body.url, 'pay')
    expect(paid.status).toBe(303)
    expect(paid.headers.get('location')).toMatch(new RegExp(`/invoices/${invoice.id}\\?payment=done$`))
    await expect.poll(async () => (await customer.get<InvoiceDTO>(`/api/invoices/${invoice.id}`)).body.status).toBe('paid')
    const done = (await admin.get<InvoiceDTO>(`/api/invoices/${invoice.id}`)).body
    expect(done).toMatchObject({ status: 'paid', paidMinor: invoice.grossMinor, balanceMinor: 0 })
    expect(done.payments).toHaveLength(1)
    expect(done.payments[0]).toMatchObject({ method: 'card', amountMinor: invoice.grossMinor, reference: `Card payment, session ${sessionId}` })
    expect(done.attempts[0]!.status).toBe('paid')
    const completed = (await fakeEvents()).find(e => e.type === 'checkout.session.completed' && e.body.includes(sessionId))!
    expect(completed.answers).toEqual([200])

    // The same event again — the provider's retry (freshly signed) or a captured delivery replayed — is 200 and changes nothing.
    const applied = await auditRows('payment-event', { invoiceId: invoice.id })
    expect(applied.map(a => (a.after as { type: string, outcome: string })).map(a => `${a.type} ${a.outcome}`).sort())
      .toEqual(['checkout.session.completed applied', 'payment_intent.payment_failed applied'])
    const resent = await fetch(`${PAYMENT_URL}/_fake/events/${completed.id}/resend`, { method: 'POST' })
    expect(await resent.json()).toEqual({ status: 200 })
    const replay = await deliver(completed.body, signatureFor(completed.body, WEBHOOK_SECRET), unique('replay-'))
    expect(replay.status).toBe(200)
    expect(replay.body).toEqual({ received: true, duplicate: true })
    // Twice at once, too.
    const both = await Promise.all([0, 1].map(() => deliver(completed.body, signatureFor(completed.body, WEBHOOK_SECRET), 'replay')))
    expect(both.map(r => r.status)).toEqual([200, 200])
    expect((await admin.get<InvoiceDTO>(`/api/invoices/${invoice.id}`)).body).toEqual(done)
    expect(await auditRows('payment-event', { invoiceId: invoice.id })).toEqual(applied)
    // One thank-you mail for the one payment.
    const thanks = (await admin.get<Page<OutboxMessageDTO>>('/api/admin/mail/outbox?kind=payment-received&pageSize=200')).body.rows
    expect(thanks.filter(m => m.subject === `Payment received for invoice ${invoice.number}`)).toHaveLength(1)
    // Nothing left to pay: no second checkout.
    expect((await customer.post(`/api/invoices/${invoice.id}/checkout`)).status).toBe(409)
  })

  it('the lab records a bank transfer by hand, never more than is owed; customers cannot', async () => {
    const { invoice } = await invoicedOrder(customer, ownOrg)
    expect((await customer.post(`/api/invoices/${invoice.id}/payments`, { version: invoice.version, amountMinor: 100, receivedOn: invoice.issueDate, reference: 'x' })).status).toBe(403)
    const tooMuch = await admin.post(`/api/invoices/${invoice.id}/payments`, { version: invoice.version, amountMinor: invoice.grossMinor + 1, receivedOn: invoice.issueDate, reference: 'BACS 1' })
    expect(tooMuch.status).toBe(400)
    expect(tooMuch.body.data.fields).toHaveProperty('amountMinor')
    const part = await admin.post<InvoiceDTO>(`/api/invoices/${invoice.id}/payments`, { version: invoice.version, amountMinor: 10000, receivedOn: invoice.issueDate, reference: 'BACS 1' })
    expect(part.status, JSON.stringify(part.body)).toBe(201)
    expect(part.body).toMatchObject({ status: 'open', paidMinor: 10000, balanceMinor: invoice.grossMinor - 10000 })
    const rest = await admin.post<InvoiceDTO>(`/api/invoices/${invoice.id}/payments`, { version: part.body.version, amountMinor: invoice.grossMinor - 10000, receivedOn: invoice.issueDate, reference: 'BACS 2' })
    expect(rest.status, JSON.stringify(rest.body)).toBe(201)
    expect(rest.body).toMatchObject({ status: 'paid', balanceMinor: 0 })
    expect(rest.body.payments.map(p => p.method)).toEqual(['bank-transfer', 'bank-transfer'])
  })
})

describe('the books', () => {
  it('exports invoices, credit notes and payments of a period as CSV, credits negative and formula cells escaped', async () => {
    const purchaseOrder = `=1+2 ${unique()}`
    const { invoice } = await invoicedOrder(customer, ownOrg, purchaseOrder)
    const paid = await admin.post<InvoiceDTO>(`/api/invoices/${invoice.id}/payments`, { version: invoice.version, amountMinor: 10000, receivedOn: invoice.issueDate, reference: '@bank 1' })
    expect(paid.status, JSON.stringify(paid.body)).toBe(201)
    // Credit the additional point (20.00 + 20 % tax).
    const credited = await admin.post<InvoiceDTO>(`/api/invoices/${invoice.id}/credit-notes`, { version: paid.body.version, reason: 'Goodwill: the fourth point is on us', lines: [{ invoiceLine: 1, quantity: 1 }] })
    expect(credited.status, JSON.stringify(credited.body)).toBe(201)
    expect(credited.body).toMatchObject({ creditedMinor: 2400, paidMinor: 10000, balanceMinor: 20400 - 2400 - 10000, status: 'open' })
    expect(credited.body.creditNotes[0]!.number).toMatch(/^CN-\d{4}-\d{5}$/)
    // More than is left of a line is refused, naming it.
    const again = await admin.post(`/api/invoices/${invoice.id}/credit-notes`, { version: credited.body.version, reason: 'Twice', lines: [{ invoiceLine: 1, quantity: 1 }] })
    expect(again.status).toBe(400)
    expect(again.body.data.fields).toHaveProperty(['lines[0].quantity'])

    const day = invoice.issueDate
    const r = await admin.request('GET', `/api/billing/export?from=${day}&to=${day}`, undefined, { accept: 'text/csv' })
    expect(r.status).toBe(200)
    expect(r.headers.get('content-type')).toContain('text/csv')
    const rows = Papa.parse<Record<string, string>>(String(r.body).replace(/^\uFEFF/, ''), { header: true, skipEmptyLines: true }).data
    const mine = rows.filter(x => x.invoice === invoice.number)
    expect(mine.map(x => [x.type, x.net, x.tax, x.gross, x.method])).toEqual([
      ['invoice', '170.00', '34.00', '204.00', ''],
      ['credit-note', '-20.00', '-4.00', '-24.00', ''],
      ['payment', '', '', '100.00', 'bank-transfer'],
    ])
    for (const x of mine) expect(x.purchaseOrder).toBe(`'${purchaseOrder}`)
    expect(mine[2]!.reference).toBe("'@bank 1")
    expect(mine[0]!.customer).toBe('Kestrelmoor Foundry Ltd')
    // Outside the period: none of it.
    const before = await admin.request('GET', '/api/billing/export?from=2020-01-01&to=2020-12-31', undefined, { accept: 'text/csv' })
    expect(String(before.body)).not.toContain(invoice.number)
    // A period that ends before it starts; a customer.
    const bad = await admin.get(`/api/billing/export?from=${day}&to=2020-01-01`)
    expect(bad.status).toBe(400)
    expect(bad.body.data.fields).toHaveProperty('to')
    expect((await customer.get(`/api/billing/export?from=${day}&to=${day}`)).status).toBe(403)
  })

  it('lists overdue invoices for the lab and reminds each organization once per weekly milestone', async () => {
    // The demo's advance invoice to Pellucid Float Glass (PO PFG-4471) was due on 2026-11-19 and is unpaid.
    const overdue = (await admin.get<Page<InvoiceDTO>>('/api/invoices?status=overdue&pageSize=500')).body.rows
    const pellucid = overdue.find(i => i.purchaseOrder === 'PFG-4471')
    expect(pellucid).toMatchObject({ status: 'open', overdue: true, dueDate: '2026-11-19', organizationName: 'Pellucid Float Glass' })
    expect(overdue.every(i => i.overdue && i.status === 'open')).toBe(true)
    // Not the demo customer's.
    expect((await customer.get<Page<InvoiceDTO>>('/api/invoices?status=overdue&pageSize=500')).body.rows.map(i => i.id)).not.toContain(pellucid!.id)

    const reminders = async () => ((await admin.get<Page<OutboxMessageDTO>>('/api/admin/mail/outbox?kind=invoice-overdue&pageSize=200')).body.rows).filter(m => m.text.includes(pellucid!.number))
    for (let run = 0; run < 2; run++) expect((await admin.post('/api/admin/mail/reminders/run', {})).status).toBe(200)
    const sent = await reminders()
    expect(sent).toHaveLength(1)
    expect(sent[0]!.subject).toMatch(/overdue/i)
    expect(sent[0]!.recipients.length).toBeGreaterThan(0)
  })
})

describe('an order followed from receipt to return, invoiced by its certificate', () => {
  it('the certificate issues the invoice; its withdrawal issues a credit note for all of it; the return is recorded with the tracking reference and mailed', async () => {
    const { order } = await placedOrder(customer, ownOrg)
    const today = (await customer.get('/api/settings/today')).body.today as string
    const request = (await tech.get(`/api/requests/${order.requestId}`)).body
    // Accepting the quote agreed the terms: the lab accepts the request into work.
    expect(request.status).toBe('agreed')
    const accepted = await tech.post(`/api/requests/${order.requestId}/accept`, { version: request.version, calibrationDate: today })
    expect(accepted.status, JSON.stringify(accepted.body)).toBe(200)
    const runId = accepted.body.runIds[0] as number
    expect((await customer.get<OrderDTO>(`/api/orders/${order.id}`)).body).toMatchObject({ stage: 'awaiting', items: [{ receivedOn: null, runId: null, certificate: null }] })

    const receipt = await tech.post(`/api/runs/${runId}/receipt`, { receivedOn: today, packaging: 'Maker’s case, intact', condition: 'No visible damage' })
    expect(receipt.status, JSON.stringify(receipt.body)).toBe(200)
    expect((await customer.get<OrderDTO>(`/api/orders/${order.id}`)).body).toMatchObject({ stage: 'received', items: [{ receivedOn: today, runId: null }] })
    const header = await tech.patch(`/api/runs/${runId}`, { version: receipt.body.version, ambientTemperatureK: 296.15, relativeHumidityPct: 40, distanceMm: 300, reflectedTemperatureK: 296.15, instrumentTemperatureK: 296.45 })
    expect(header.status, JSON.stringify(header.body)).toBe(200)
    const plate = await equipmentId(tech, 'BB-FP-01')
    for (const k of [273.15, 323.15, 373.15]) expect((await tech.post(`/api/runs/${runId}/points`, pointOn(plate, k))).status).toBe(201)
    expect((await customer.get<OrderDTO>(`/api/orders/${order.id}`)).body.stage).toBe('in-calibration')
    const submitted = await tech.post(`/api/runs/${runId}/submit`, { version: (await tech.get(`/api/runs/${runId}`)).body.version })
    expect(submitted.status, JSON.stringify(submitted.body)).toBe(200)
    expect((await quality.post(`/api/runs/${runId}/approve`, { version: submitted.body.version })).status).toBe(200)
    expect((await customer.get<OrderDTO>(`/api/orders/${order.id}`)).body.stage).toBe('in-review')
    expect((await admin.get<OrderDTO>(`/api/orders/${order.id}`)).body.invoice).toBeNull()

    const cert = await issueCertificate(quality, runId)
    expect(cert.status, JSON.stringify(cert.body)).toBe(201)
    const certified = (await customer.get<OrderDTO>(`/api/orders/${order.id}`)).body
    expect(certified).toMatchObject({ stage: 'certified', items: [{ certificate: { id: cert.body.id, number: cert.body.number, status: 'valid' } }], invoice: { status: 'open' } })
    expect(certified.steps.map(st => [st.stage, st.date])).toEqual([['received', today], ['in-calibration', today], ['in-review', today], ['certified', today], ['returned', null]])
    const invoice = (await customer.get<InvoiceDTO>(`/api/invoices/${certified.invoice!.id}`)).body
    expect(invoice).toMatchObject({ origin: 'automatic', issueDate: today, grossMinor: 20400, status: 'open', purchaseOrder: certified.purchaseOrder })
    const issuedMail = (await admin.get<Page<OutboxMessageDTO>>('/api/admin/mail/outbox?kind=invoice-issued&pageSize=200')).body.rows.filter(m => m.subject === `Invoice ${invoice.number} for order ${order.number}`)
    expect(issuedMail).toHaveLength(1)
    // Nothing is invoiced twice.
    expect((await admin.post(`/api/orders/${order.id}/invoice`, { version: certified.version })).status).toBe(409)

    // The certificate is withdrawn: its calibration is not charged, in full.
    const withdrawn = await quality.post(`/api/certificates/${cert.body.id}/withdraw`, { reason: 'Issued against the wrong purchase order', password: DEMO_PASSWORD })
    expect(withdrawn.status, JSON.stringify(withdrawn.body)).toBe(200)
    const credited = (await customer.get<InvoiceDTO>(`/api/invoices/${invoice.id}`)).body
    expect(credited).toMatchObject({ status: 'credited', creditedMinor: 20400, balanceMinor: 0, canPayByCard: false })
    expect(credited.creditNotes).toHaveLength(1)
    expect(credited.creditNotes[0]).toMatchObject({ cause: 'withdrawal', grossMinor: 20400 })
    expect(credited.creditNotes[0]!.reason).toContain(`Certificate ${cert.body.number} was withdrawn`)
    expect((await customer.get(`/api/credit-notes/${credited.creditNotes[0]!.id}/pdf`)).status).toBe(200)
    expect((await customer.post(`/api/invoices/${invoice.id}/checkout`)).status).toBe(409)

    // The instruments go back: the customer reads the tracking reference and is told by mail; customers cannot record it.
    expect((await customer.post(`/api/orders/${order.id}/return`, { version: certified.version, returnedOn: today, trackingReference: 'X' })).status).toBe(403)
    const tracking = unique('RC-')
    const returned = await tech.post<OrderDTO>(`/api/orders/${order.id}/return`, { version: certified.version, returnedOn: today, carrier: 'Ridgeway Couriers', trackingReference: tracking })
    expect(returned.status, JSON.stringify(returned.body)).toBe(200)
    expect((await customer.get<OrderDTO>(`/api/orders/${order.id}`)).body).toMatchObject({ stage: 'returned', returnedOn: today, carrier: 'Ridgeway Couriers', trackingReference: tracking })
    const back = (await admin.get<Page<OutboxMessageDTO>>('/api/admin/mail/outbox?kind=order-returned&pageSize=200')).body.rows.filter(m => m.text.includes(tracking))
    expect(back).toHaveLength(1)
    expect(back[0]!.recipients).toContain('customer@bandlight.test')
    const received = (await admin.get<Page<OutboxMessageDTO>>('/api/admin/mail/outbox?kind=order-received&pageSize=200')).body.rows.filter(m => m.subject.startsWith(`Order ${order.number}:`))
    expect(received).toHaveLength(1)
    // A return in the future is refused, naming the field.
    const future = await tech.post(`/api/orders/${order.id}/return`, { version: returned.body.version, returnedOn: '2999-01-01', trackingReference: tracking })
    expect(future.status).toBe(400)
    expect(future.body.data.fields).toHaveProperty('returnedOn')
  })
})

/** The order's one instrument accepted into work, received, measured at three points, reviewed and certified: its run and certificate. */
async function certify(order: OrderDTO): Promise<{ runId: number, cert: { id: number, number: string } }> {
  const today = (await customer.get('/api/settings/today')).body.today as string
  const request = (await tech.get(`/api/requests/${order.requestId}`)).body
  const accepted = await tech.post(`/api/requests/${order.requestId}/accept`, { version: request.version, calibrationDate: today })
  expect(accepted.status, JSON.stringify(accepted.body)).toBe(200)
  const runId = accepted.body.runIds[0] as number
  const receipt = await tech.post(`/api/runs/${runId}/receipt`, { receivedOn: today, packaging: 'Maker’s case, intact', condition: 'No visible damage' })
  expect(receipt.status, JSON.stringify(receipt.body)).toBe(200)
  const header = await tech.patch(`/api/runs/${runId}`, { version: receipt.body.version, ambientTemperatureK: 296.15, relativeHumidityPct: 40, distanceMm: 300, reflectedTemperatureK: 296.15, instrumentTemperatureK: 296.45 })
  expect(header.status, JSON.stringify(header.body)).toBe(200)
  const plate = await equipmentId(tech, 'BB-FP-01')
  for (const k of [273.15, 323.15, 373.15]) expect((await tech.post(`/api/runs/${runId}/points`, pointOn(plate, k))).status).toBe(201)
  const submitted = await tech.post(`/api/runs/${runId}/submit`, { version: (await tech.get(`/api/runs/${runId}`)).body.version })
  expect(submitted.status, JSON.stringify(submitted.body)).toBe(200)
  expect((await quality.post(`/api/runs/${runId}/approve`, { version: submitted.body.version })).status).toBe(200)
  const cert = await issueCertificate(quality, runId)
  expect(cert.status, JSON.stringify(cert.body)).toBe(201)
  return { runId, cert: cert.body }
}

describe('credit notes follow amendments', () => {
  it('an amendment that certifies fewer points than invoiced credits the additional points no longer certified, once', async () => {
    const { order } = await placedOrder(customer, ownOrg)
    const { cert } = await certify(order)
    const invoiceId = (await admin.get<OrderDTO>(`/api/orders/${order.id}`)).body.invoice!.id
    const invoice = (await admin.get<InvoiceDTO>(`/api/invoices/${invoiceId}`)).body
    // Three points certified: the calibration with 2 points and 1 additional point.
    expect(invoice.lines.map(l => [l.kind, l.quantity])).toEqual([['calibration', 1], ['extra-points', 1]])

    // Reopened, one point voided, approved and amended: 2 points certified.
    const reopened = await quality.post(`/api/certificates/${cert.id}/reopen`, { reason: 'The 100 °C point was taken before the plate had settled' })
    expect(reopened.status, JSON.stringify(reopened.body)).toBe(201)
    const rev = reopened.body
    const third = rev.points[2]
    const voided = await tech.post(`/api/runs/${rev.id}/points/${third.id}/void`, { version: third.version, reason: 'Taken before the plate had settled' })
    expect(voided.status, JSON.stringify(voided.body)).toBe(200)
    const sent = await tech.post(`/api/runs/${rev.id}/submit`, { version: (await tech.get(`/api/runs/${rev.id}`)).body.version })
    expect(sent.status, JSON.stringify(sent.body)).toBe(200)
    expect((await quality.post(`/api/runs/${rev.id}/approve`, { version: sent.body.version })).status).toBe(200)
    const amended = await quality.post(`/api/certificates/${cert.id}/amend`, { password: DEMO_PASSWORD, signatoryFunction: 'Quality manager' })
    expect(amended.status, JSON.stringify(amended.body)).toBe(201)

    const after = (await customer.get<InvoiceDTO>(`/api/invoices/${invoiceId}`)).body
    expect(after.creditNotes).toHaveLength(1)
    expect(after.creditNotes[0]).toMatchObject({ cause: 'amendment', netMinor: 2000, taxMinor: 400, grossMinor: 2400 })
    expect(after.creditNotes[0]!.lines.map(l => [l.kind, l.quantity, l.invoiceLine])).toEqual([['extra-points', 1, 1]])
    expect(after.creditNotes[0]!.reason).toContain(`Certificate ${amended.body.number} was amended with fewer calibration points than invoiced`)
    expect(after).toMatchObject({ status: 'open', creditedMinor: 2400, balanceMinor: 18000 })
    const mail = (await admin.get<Page<OutboxMessageDTO>>('/api/admin/mail/outbox?kind=credit-note-issued&pageSize=200')).body.rows.filter(m => m.subject.includes(`against invoice ${invoice.number}`))
    expect(mail).toHaveLength(1)
  })
})

