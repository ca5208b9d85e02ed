/**
 * Billing messages, queued in the outbox in the transaction of their event (server/services/mail):
 * a quote sent (to whoever asked), an order's instrument received and the order returned (to whoever
 * asked and the organization's contacts), an invoice or credit note issued (to the organization's
 * contacts, with the PDF attached), a payment received.
 */
import type { Transaction } from 'sequelize'
import { formatMoney } from '#shared/billing/money'
import type { CreditNote } from '#server/models/CreditNote'
import type { Invoice } from '#server/models/Invoice'
import type { Order } from '#server/models/Order'
import type { Quote } from '#server/models/Quote'
import { CalibrationRequest } from '#server/models/CalibrationRequest'
import { User } from '#server/models/User'
import { organizationRecipients } from '#server/services/mail/events'
import { queueEventMail } from '#server/services/mail/outbox'
import { eventMail, labIdentity } from '#server/services/mail/templates'
import { publicBaseUrl } from '#server/utils/publicUrl'

/** Whoever asked for the request, and the organization's contacts; the greeting names the organization. */
async function orderRecipients(t: Transaction, organizationId: number, requestId: number): Promise<{ name: string, to: string[] } | null> {
  const r = await CalibrationRequest.findByPk(requestId, { attributes: ['requestedBy'], transaction: t })
  const asker = r ? await User.findByPk(r.requestedBy, { attributes: ['email', 'active'], transaction: t }) : null
  const org = await organizationRecipients(t, organizationId)
  const to = [...new Set([...(asker?.active ? [asker.email.toLowerCase()] : []), ...(org?.to ?? [])])]
  return to.length ? { name: org?.org.name ?? 'customer', to } : null
}

export async function notifyQuoteSent(t: Transaction, q: Quote, requestId: number): Promise<void> {
  const r = await CalibrationRequest.findByPk(requestId, { attributes: ['requestedBy'], transaction: t })
  const user = r ? await User.findByPk(r.requestedBy, { attributes: ['name', 'email'], transaction: t }) : null
  if (!user) return
  const m = eventMail({
    lab: await labIdentity(t),
    subject: `Quote ${q.number} for calibration request ${requestId}`,
    greeting: `Dear ${user.name},`,
    paragraphs: [
      `Our quote ${q.number} for your calibration request ${requestId} comes to ${formatMoney(q.grossMinor, q.currency)} including tax${q.validUntil ? ` and stands until ${q.validUntil}` : ''}.`,
      'Accept it in the portal with your purchase-order number (this also agrees to the terms we offered), or tell us what should change.',
      ...(q.message ? [q.message] : []),
    ],
    link: { url: `${publicBaseUrl()}/quotes/${q.id}`, label: 'Read and accept the quote' },
  })
  await queueEventMail(t, { kind: 'quote-sent', to: [user.email], ...m, dedupeKey: `quote-${q.number}` })
}

/** An instrument of an order was received (its receipt record). */
export async function notifyItemReceived(t: Transaction, order: Order, serial: string, receivedOn: string, instrumentId: number): Promise<void> {
  const rcpt = await orderRecipients(t, order.organizationId, order.requestId)
  if (!rcpt) return
  const m = eventMail({
    lab: await labIdentity(t),
    subject: `Order ${order.number}: instrument ${serial} received`,
    greeting: `Dear ${rcpt.name},`,
    paragraphs: [`We received your instrument ${serial} on ${receivedOn} for order ${order.number} (your order ${order.purchaseOrder}). We will let you know when it is on its way back.`],
    link: { url: `${publicBaseUrl()}/orders/${order.id}`, label: 'Follow your order' },
  })
  await queueEventMail(t, { kind: 'order-received', to: rcpt.to, ...m, dedupeKey: `order-${order.number}-instrument-${instrumentId}` })
}

export async function notifyOrderReturned(t: Transaction, order: Order): Promise<void> {
  const rcpt = await orderRecipients(t, order.organizationId, order.requestId)
  if (!rcpt || !order.returnedOn) return
  const m = eventMail({
    lab: await labIdentity(t),
    subject: `Order ${order.number}: your instruments are on their way back`,
    greeting: `Dear ${rcpt.name},`,
    paragraphs: [
      `The instruments of order ${order.number} (your order ${order.purchaseOrder}) were sent back on ${order.returnedOn}${order.carrier ? ` with ${order.carrier}` : ''}.`,
      `Tracking reference: ${order.trackingReference ?? '—'}`,
    ],
    link: { url: `${publicBaseUrl()}/orders/${order.id}`, label: 'See the order' },
  })
  await queueEventMail(t, { kind: 'order-returned', to: rcpt.to, ...m, dedupeKey: `order-${order.number}-returned-${order.trackingReference ?? ''}`.slice(0, 180) })
}

export async function notifyInvoiceIssued(t: Transaction, invoice: Invoice, order: Order): Promise<void> {
  const rcpt = await orderRecipients(t, invoice.organizationId, order.requestId)
  if (!rcpt) return
  const m = eventMail({
    lab: await labIdentity(t),
    subject: `Invoice ${invoice.number} for order ${order.number}`,
    greeting: `Dear ${rcpt.name},`,
    paragraphs: [
      `Our invoice ${invoice.number} for order ${order.number} (your order ${invoice.purchaseOrder ?? order.purchaseOrder}) comes to ${formatMoney(invoice.grossMinor, invoice.currency)} and is due on ${invoice.dueDate}. The invoice is attached as a PDF.`,
      'You can pay it by card in the customer portal, or by bank transfer as the invoice says.',
    ],
    link: { url: `${publicBaseUrl()}/invoices/${invoice.id}`, label: 'See and pay the invoice' },
  })
  await queueEventMail(t, {
    kind: 'invoice-issued', to: rcpt.to, ...m, dedupeKey: `invoice-${invoice.number}`,
    attachments: [{ filename: `${invoice.number}.pdf`, contentType: 'application/pdf', sha256: invoice.pdfSha256 }],
  })
}

export async function notifyCreditNote(t: Transaction, note: CreditNote, invoice: Invoice, order: Order): Promise<void> {
  const rcpt = await orderRecipients(t, note.organizationId, order.requestId)
  if (!rcpt) return
  const m = eventMail({
    lab: await labIdentity(t),
    subject: `Credit note ${note.number} against invoice ${invoice.number}`,
    greeting: `Dear ${rcpt.name},`,
    paragraphs: [`Our credit note ${note.number} lowers what is owed on invoice ${invoice.number} by ${formatMoney(note.grossMinor, note.currency)}.`, `Reason: ${note.reason}`, 'The credit note is attached as a PDF.'],
    link: { url: `${publicBaseUrl()}/invoices/${invoice.id}`, label: 'See the invoice' },
  })
  await queueEventMail(t, {
    kind: 'credit-note-issued', to: rcpt.to, ...m, dedupeKey: `credit-note-${note.number}`,
    attachments: [{ filename: `${note.number}.pdf`, contentType: 'application/pdf', sha256: note.pdfSha256 }],
  })
}

export async function notifyPaymentReceived(t: Transaction, invoice: Invoice, order: Order, amountMinor: number, paymentId: number, balanceMinor: number): Promise<void> {
  const rcpt = await orderRecipients(t, invoice.organizationId, order.requestId)
  if (!rcpt) return
  const m = eventMail({
    lab: await labIdentity(t),
    subject: `Payment received for invoice ${invoice.number}`,
    greeting: `Dear ${rcpt.name},`,
    paragraphs: [`Thank you: we received ${formatMoney(amountMinor, invoice.currency)} for invoice ${invoice.number}. ${balanceMinor > 0 ? `${formatMoney(balanceMinor, invoice.currency)} is still to pay.` : 'The invoice is paid.'}`],
    link: { url: `${publicBaseUrl()}/invoices/${invoice.id}`, label: 'See the invoice' },
  })
  await queueEventMail(t, { kind: 'payment-received', to: rcpt.to, ...m, dedupeKey: `payment-${paymentId}` })
}
