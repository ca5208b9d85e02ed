/**
 * Invoices and credit notes. An order is invoiced once: automatically in the transaction that issues
 * the certificate of its last instrument (withdrawn ones count as done), or by hand by the
 * laboratory. Its lines are the accepted quote's, as far as they are owed (shared/billing/lines.ts),
 * its number gap-free in its own series (./counters.ts), its due date from the price list's payment
 * terms, its PDF stored and sent to the customer through the outbox. A withdrawal or an amendment of
 * a certificate that lowers what is owed issues a credit note for the difference, in the same
 * transaction. An invoice is paid when its payments cover its total less its credit notes: card
 * payments come only from verified provider events (server/services/payments), bank transfers are
 * recorded by the laboratory. Customers see only their organization's invoices (404 otherwise).
 */
import { Op, type Transaction, type WhereOptions } from 'sequelize'
import { creditLinesFor, owedLines, type BillingLine, type CreditLine } from '#shared/billing/lines'
import { basisPointsToPercent, totalsOf } from '#shared/billing/money'
import { addDays } from '#shared/mail/milestones'
import type { CreditCause, InvoiceOrigin, InvoiceStatus } from '#shared/billing/constants'
import type { CreditNoteManualInput, InvoiceQuery, PaymentRecordInput } from '#shared/schemas/billing'
import type { Page, SessionUser } from '#shared/types'
import type { CreditNoteDTO, InvoiceDTO } from '#shared/types/billing'
import { CalibrationRun } from '#server/models/CalibrationRun'
import type { Certificate } from '#server/models/Certificate'
import { CreditNote } from '#server/models/CreditNote'
import { Invoice } from '#server/models/Invoice'
import { Order } from '#server/models/Order'
import { Organization } from '#server/models/Organization'
import { Payment } from '#server/models/Payment'
import { PaymentAttempt } from '#server/models/PaymentAttempt'
import { Quote } from '#server/models/Quote'
import { User } from '#server/models/User'
import { organizationScope } from '#server/utils/access'
import { createAudited, recordAudit, snapshot, updateAudited } from '#server/utils/audit'
import { config } from '#server/utils/config'
import { assertVersion, conflict, invalidInput, notFound } from '#server/utils/errors'
import { inTransaction } from '#server/utils/transaction'
import { labToday } from '#server/services/settings/today'
import type { StoredFile } from '#server/services/uploads/uploads'
import { allocateNumberIn } from './counters'
import { creditNotePdf, invoicePdf, linesDTO, storePdf } from './documents'
import { notifyCreditNote, notifyInvoiceIssued, notifyPaymentReceived } from './mail'
import { findOrder, orderWorkIn, workByInstrument } from './orders'
import { currentPriceList } from './prices'
import { readTogether } from '#server/utils/db'

const DEFAULT_PAYMENT_TERMS_DAYS = 30

// ---------------------------------------------------------------- balance and status

export interface Balance {
  creditedMinor: number
  paidMinor: number
  balanceMinor: number
}

/** Credits and payments against an invoice, and what is left to pay. */
export async function balanceOf(invoice: Invoice, t?: Transaction): Promise<Balance> {
  const [creditedMinor, paidMinor] = await readTogether(t, [
    () => CreditNote.sum('grossMinor', { where: { invoiceId: invoice.id }, transaction: t }),
    () => Payment.sum('amountMinor', { where: { invoiceId: invoice.id }, transaction: t }),
  ])
  const c = Number(creditedMinor) || 0
  const p = Number(paidMinor) || 0
  return { creditedMinor: c, paidMinor: p, balanceMinor: invoice.grossMinor - c - p }
}

function statusFor(b: Balance): InvoiceStatus {
  if (b.balanceMinor > 0) return 'open'
  return b.paidMinor > 0 ? 'paid' : 'credited'
}

/** Move the invoice's status (and paidAt) to what its credits and payments say, audited. */
export async function refreshInvoiceStatusIn(t: Transaction, invoice: Invoice, actorId: number | null): Promise<Balance> {
  const b = await balanceOf(invoice, t)
  const status = statusFor(b)
  if (status !== invoice.status) {
    await updateAudited(t, actorId === null ? null : { id: actorId }, invoice, { status, paidAt: status === 'paid' ? new Date() : null }, { entity: 'Invoice', action: status === 'open' ? 'reopen' : status, omit: ['lines'] })
  }
  return b
}

// ---------------------------------------------------------------- reading

const visible = (user: SessionUser): WhereOptions => organizationScope(user)

export async function findInvoice(user: SessionUser, id: number, t?: Transaction): Promise<Invoice> {
  const i = await Invoice.findOne({ where: { id, ...visible(user) }, transaction: t, lock: t ? t.LOCK.UPDATE : undefined })
  if (!i) notFound('invoice')
  return i
}

function creditNoteDTO(c: CreditNote): CreditNoteDTO {
  return {
    id: c.id, number: c.number, invoiceId: c.invoiceId, issueDate: c.issueDate, cause: c.cause, reason: c.reason,
    lines: linesDTO(c.lines), netMinor: c.netMinor, taxMinor: c.taxMinor, grossMinor: c.grossMinor,
  }
}

async function toDTOs(user: SessionUser, rows: Invoice[]): Promise<InvoiceDTO[]> {
  if (!rows.length) return []
  const ids = rows.map(r => r.id)
  const lab = user.role !== 'customer'
  const [notes, payments, attempts, orders, orgs] = await Promise.all([
    CreditNote.findAll({ where: { invoiceId: ids }, order: [['id', 'ASC']] }),
    Payment.findAll({ where: { invoiceId: ids }, order: [['receivedOn', 'ASC'], ['id', 'ASC']] }),
    lab ? PaymentAttempt.findAll({ where: { invoiceId: ids }, order: [['id', 'DESC']] }) : [],
    Order.findAll({ where: { id: rows.map(r => r.orderId) }, attributes: ['id', 'number'] }),
    Organization.findAll({ where: { id: [...new Set(rows.map(r => r.organizationId))] }, attributes: ['id', 'name'] }),
  ])
  const recorders = [...new Set(payments.map(p => p.recordedBy).filter((v): v is number => v !== null))]
  const names = new Map((recorders.length ? await User.findAll({ where: { id: recorders }, attributes: ['id', 'name'] }) : []).map(u => [u.id, u.name]))
  const orderNumber = new Map(orders.map(o => [o.id, o.number]))
  const orgName = new Map(orgs.map(o => [o.id, o.name]))
  const today = await labToday()
  const cardOn = !!config().payments.secretKey
  return rows.map((i) => {
    const cn = notes.filter(n => n.invoiceId === i.id)
    const ps = payments.filter(p => p.invoiceId === i.id)
    const creditedMinor = cn.reduce((s, n) => s + n.grossMinor, 0)
    const paidMinor = ps.reduce((s, p) => s + p.amountMinor, 0)
    const balanceMinor = i.grossMinor - creditedMinor - paidMinor
    return {
      id: i.id,
      number: i.number,
      orderId: i.orderId,
      orderNumber: orderNumber.get(i.orderId) ?? null,
      organizationId: i.organizationId,
      organizationName: orgName.get(i.organizationId) ?? null,
      purchaseOrder: i.purchaseOrder ?? null,
      issueDate: i.issueDate,
      dueDate: i.dueDate,
      currency: i.currency,
      taxRatePercent: basisPointsToPercent(i.taxRateBp),
      lines: linesDTO(i.lines),
      netMinor: i.netMinor,
      taxMinor: i.taxMinor,
      grossMinor: i.grossMinor,
      creditedMinor,
      paidMinor,
      balanceMinor,
      status: i.status,
      overdue: i.status === 'open' && i.dueDate < today,
      paidAt: i.paidAt ? i.paidAt.toISOString() : null,
      origin: i.origin,
      creditNotes: cn.map(creditNoteDTO),
      payments: ps.map(p => ({ id: p.id, method: p.method, amountMinor: p.amountMinor, currency: p.currency, receivedOn: p.receivedOn, reference: p.reference, recordedByName: p.recordedBy ? names.get(p.recordedBy) ?? null : null })),
      attempts: attempts.filter(a => a.invoiceId === i.id).map(a => ({ id: a.id, status: a.status, amountMinor: a.amountMinor, createdAt: a.createdAt.toISOString(), completedAt: a.completedAt ? a.completedAt.toISOString() : null, failure: a.failure ?? null })),
      canPayByCard: cardOn && i.status === 'open' && balanceMinor > 0,
      version: i.version,
    }
  })
}

export async function listInvoices(user: SessionUser, q: InvoiceQuery): Promise<Page<InvoiceDTO>> {
  const where: WhereOptions = { ...visible(user) }
  if (q.status === 'overdue') Object.assign(where, { status: 'open', dueDate: { [Op.lt]: await labToday() } })
  else if (q.status) Object.assign(where, { status: q.status })
  if (q.q) Object.assign(where, { [Op.or]: [{ number: { [Op.like]: `${q.q.replace(/[\\%_]/g, c => `\\${c}`)}%` } }, { purchaseOrder: { [Op.like]: `${q.q.replace(/[\\%_]/g, c => `\\${c}`)}%` } }] })
  const order: [string, string][] = q.status === 'overdue' ? [['dueDate', 'ASC'], ['id', 'ASC']] : [['issueDate', 'DESC'], ['id', 'DESC']]
  const { rows, count } = await Invoice.findAndCountAll({ where, order, limit: q.pageSize, offset: (q.page - 1) * q.pageSize })
  return { rows: await toDTOs(user, rows), total: count, page: q.page, pageSize: q.pageSize }
}

export async function invoiceDetail(user: SessionUser, id: number): Promise<InvoiceDTO> {
  return (await toDTOs(user, [await findInvoice(user, id)]))[0]!
}

export async function invoicePdfFile(user: SessionUser, id: number): Promise<StoredFile> {
  const i = await findInvoice(user, id)
  return { sha256: i.pdfSha256, type: 'application/pdf', size: i.pdfSize, name: `${i.number}.pdf` }
}

export async function creditNotePdfFile(user: SessionUser, id: number): Promise<StoredFile> {
  const c = await CreditNote.findOne({ where: { id, ...visible(user) } })
  if (!c) notFound('credit note')
  return { sha256: c.pdfSha256, type: 'application/pdf', size: c.pdfSize, name: `${c.number}.pdf` }
}

// ---------------------------------------------------------------- issuing

/**
 * Invoice an order, in the caller's transaction: the quote's lines as far as they are owed, a
 * gap-free number, the due date from the payment terms, the PDF stored and mailed. Null when the
 * order is invoiced already or nothing is owed (the caller decides whether that is an error).
 * @param opts.issueDate - lab-local date of issue (default today; the demo dates its invoices)
 */
export async function issueInvoiceIn(t: Transaction, order: Order, opts: { origin: InvoiceOrigin, actorId: number | null, issueDate?: string }): Promise<Invoice | null> {
  if (await Invoice.findOne({ where: { orderId: order.id }, attributes: ['id'], transaction: t })) return null
  const quote = await Quote.findByPk(order.quoteId, { transaction: t })
  if (!quote) return null
  const work = workByInstrument(await orderWorkIn(t, order))
  const lines: BillingLine[] = owedLines(quote.lines, work)
  if (!lines.length) return null
  const list = await currentPriceList(t)
  const issueDate = opts.issueDate ?? await labToday(new Date(), t)
  const dueDate = addDays(issueDate, list?.paymentTermsDays ?? DEFAULT_PAYMENT_TERMS_DAYS)
  const { number, year, sequence } = await allocateNumberIn(t, 'invoice', issueDate)
  const totals = totalsOf(lines, quote.taxRateBp)
  const fields = { number, organizationId: order.organizationId, issueDate, dueDate, purchaseOrder: order.purchaseOrder, currency: quote.currency, taxRateBp: quote.taxRateBp, lines, ...totals }
  const pdf = await storePdf(t, await invoicePdf(t, fields, order.number))
  const invoice = await Invoice.create({
    ...fields, counterYear: year, sequence, orderId: order.id, origin: opts.origin, pdfSha256: pdf.sha256, pdfSize: pdf.size,
    status: 'open', paidAt: null, createdBy: opts.actorId,
  }, { transaction: t })
  await recordAudit(t, { userId: opts.actorId, action: opts.origin === 'automatic' ? 'issue-automatic' : 'issue', entity: 'Invoice', entityId: invoice.id, after: snapshot(invoice) })
  await notifyInvoiceIssued(t, invoice, order)
  return invoice
}

/** POST /api/orders/[id]/invoice: the laboratory invoices an order now (409 when it is invoiced already or nothing is owed). */
export async function invoiceOrderByHand(user: SessionUser, orderId: number, input: { version: number }): Promise<InvoiceDTO> {
  const invoice = await inTransaction(async (t) => {
    const order = await findOrder(user, orderId, t)
    assertVersion(order.version, input.version)
    const existing = await Invoice.findOne({ where: { orderId: order.id }, attributes: ['number'], transaction: t })
    if (existing) conflict(`Order ${order.number} is invoiced already (${existing.number})`)
    const made = await issueInvoiceIn(t, order, { origin: 'manual', actorId: user.id })
    if (!made) conflict('Nothing is owed on this order (every certificate was withdrawn)')
    return made
  })
  return invoiceDetail(user, invoice.id)
}

/** A credit note against an invoice for the given lines, numbered, drawn, stored, mailed; the invoice's status follows. */
async function issueCreditNoteIn(t: Transaction, invoice: Invoice, order: Order, lines: CreditLine[], how: { cause: CreditCause, reason: string, certificateId: number | null, actorId: number | null }): Promise<CreditNote> {
  const issueDate = await labToday(new Date(), t)
  const { number, year, sequence } = await allocateNumberIn(t, 'credit-note', issueDate)
  const totals = totalsOf(lines, invoice.taxRateBp)
  const fields = { number, organizationId: invoice.organizationId, issueDate, reason: how.reason, currency: invoice.currency, lines, ...totals }
  const pdf = await storePdf(t, await creditNotePdf(t, fields, invoice))
  const note = await createAudited(t, how.actorId === null ? null : { id: how.actorId }, CreditNote, {
    ...fields, counterYear: year, sequence, invoiceId: invoice.id, cause: how.cause, certificateId: how.certificateId,
    pdfSha256: pdf.sha256, pdfSize: pdf.size, createdBy: how.actorId,
  }, { entity: 'CreditNote', action: how.cause === 'manual' ? 'issue' : `issue-on-${how.cause}` })
  await refreshInvoiceStatusIn(t, invoice, how.actorId)
  await notifyCreditNote(t, note, invoice, order)
  return note
}

async function creditedQuantities(t: Transaction, invoiceId: number): Promise<Map<number, number>> {
  const credited = new Map<number, number>()
  for (const n of await CreditNote.findAll({ where: { invoiceId }, attributes: ['lines'], transaction: t })) {
    for (const l of n.lines) credited.set(l.invoiceLine, (credited.get(l.invoiceLine) ?? 0) + l.quantity)
  }
  return credited
}

/**
 * Called in the transaction that issues, amends or withdraws a certificate
 * (server/services/certificates/issue.ts). For a run of an order: the order is invoiced when every
 * instrument has its certificate (or had it withdrawn); an invoiced order whose certificates now owe
 * less gets a credit note for the difference.
 */
export async function onCertificateChangedIn(t: Transaction, cert: Certificate, change: 'issue' | 'amendment' | 'withdrawal', actorId: number | null): Promise<void> {
  const run = await CalibrationRun.findByPk(cert.runId, { attributes: ['requestId'], transaction: t })
  if (!run?.requestId) return
  const order = await Order.findOne({ where: { requestId: run.requestId }, transaction: t })
  if (!order) return
  const invoice = await Invoice.findOne({ where: { orderId: order.id }, transaction: t })
  const items = await orderWorkIn(t, order)
  if (!invoice) {
    if (items.every(i => i.work.certificate !== 'none')) await issueInvoiceIn(t, order, { origin: 'automatic', actorId: null })
    return
  }
  const lines = creditLinesFor(invoice.lines, await creditedQuantities(t, invoice.id), workByInstrument(items))
  if (!lines.length) return
  const words = { issue: 'issued', amendment: 'amended', withdrawal: 'withdrawn' }[change]
  const reason = change === 'withdrawal'
    ? `Certificate ${cert.number} was withdrawn${cert.withdrawalReason ? ` (${cert.withdrawalReason})` : ''}: its calibration is not charged.`
    : `Certificate ${cert.number} was ${words} with fewer calibration points than invoiced: the points no longer certified are not charged.`
  await issueCreditNoteIn(t, invoice, order, lines, { cause: change === 'withdrawal' ? 'withdrawal' : 'amendment', reason, certificateId: cert.id, actorId })
}

/** POST /api/invoices/[id]/credit-notes: a credit note by hand, line by line, never more than is still invoiced. */
export async function creditByHand(user: SessionUser, invoiceId: number, input: CreditNoteManualInput): Promise<InvoiceDTO> {
  await inTransaction(async (t) => {
    const invoice = await findInvoice(user, invoiceId, t)
    assertVersion(invoice.version, input.version)
    const credited = await creditedQuantities(t, invoice.id)
    const lines: CreditLine[] = []
    const seen = new Set<number>()
    input.lines.forEach((l, k) => {
      const line = invoice.lines[l.invoiceLine]
      if (!line) invalidInput({ [`lines[${k}].invoiceLine`]: 'The invoice has no such line' })
      if (seen.has(l.invoiceLine)) invalidInput({ [`lines[${k}].invoiceLine`]: 'This line is listed twice' })
      seen.add(l.invoiceLine)
      const left = line.quantity - (credited.get(l.invoiceLine) ?? 0)
      if (l.quantity > left) invalidInput({ [`lines[${k}].quantity`]: left > 0 ? `At most ${left} of this line is still invoiced` : 'This line is credited in full already' })
      lines.push({ ...line, quantity: l.quantity, invoiceLine: l.invoiceLine, description: `Credit: ${line.description}` })
    })
    const order = await Order.findByPk(invoice.orderId, { transaction: t })
    if (!order) notFound('order')
    await issueCreditNoteIn(t, invoice, order, lines, { cause: 'manual', reason: input.reason, certificateId: null, actorId: user.id })
  })
  return invoiceDetail(user, invoiceId)
}

// ---------------------------------------------------------------- payments

/**
 * Record money received against an invoice in the caller's transaction; the invoice's status
 * follows and the customer is thanked. Card payments pass their checkout session as
 * `providerReference` (unique: one payment per session).
 */
export async function recordPaymentIn(t: Transaction, invoice: Invoice, p: { method: 'card' | 'bank-transfer', amountMinor: number, receivedOn: string, reference: string, provider: string | null, providerReference: string | null, eventId: string | null, actorId: number | null }): Promise<Payment> {
  const payment = await createAudited(t, p.actorId === null ? null : { id: p.actorId }, Payment, {
    invoiceId: invoice.id, organizationId: invoice.organizationId, method: p.method, amountMinor: p.amountMinor, currency: invoice.currency,
    receivedOn: p.receivedOn, reference: p.reference, provider: p.provider, providerReference: p.providerReference, eventId: p.eventId, recordedBy: p.actorId,
  }, { entity: 'Payment', action: p.method === 'card' ? 'card-payment' : 'record-transfer', extra: { invoice: invoice.number } })
  const b = await refreshInvoiceStatusIn(t, invoice, p.actorId)
  const order = await Order.findByPk(invoice.orderId, { transaction: t })
  if (order) await notifyPaymentReceived(t, invoice, order, p.amountMinor, payment.id, b.balanceMinor)
  return payment
}

/** POST /api/invoices/[id]/payments: a bank transfer, recorded by the laboratory (no more than the balance). */
export async function recordBankTransfer(user: SessionUser, invoiceId: number, input: PaymentRecordInput): Promise<InvoiceDTO> {
  await inTransaction(async (t) => {
    const invoice = await findInvoice(user, invoiceId, t)
    assertVersion(invoice.version, input.version)
    const { balanceMinor } = await balanceOf(invoice, t)
    if (balanceMinor <= 0) conflict('Nothing is left to pay on this invoice', 'amountMinor')
    if (input.amountMinor > balanceMinor) invalidInput({ amountMinor: `More than is left to pay (${balanceMinor} in minor units)` })
    if (input.receivedOn > await labToday(new Date(), t)) invalidInput({ receivedOn: 'The money cannot arrive in the future' })
    if (input.receivedOn < invoice.issueDate) invalidInput({ receivedOn: `Before the invoice was issued (${invoice.issueDate})` })
    await recordPaymentIn(t, invoice, { method: 'bank-transfer', amountMinor: input.amountMinor, receivedOn: input.receivedOn, reference: input.reference, provider: null, providerReference: null, eventId: null, actorId: user.id })
  })
  return invoiceDetail(user, invoiceId)
}
