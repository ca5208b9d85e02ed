/**
 * What the three billing documents share: who issues them (the laboratory, from its settings),
 * to whom (the organization, with its address), their lines with amounts, and the PDF of each,
 * drawn from the stored record (./pdf.ts) and stored by SHA-256 in the caller's transaction.
 */
import type { Transaction } from 'sequelize'
import type { BillingLine } from '#shared/billing/lines'
import { basisPointsToPercent, formatMoney, lineAmount } from '#shared/billing/money'
import type { BillingLineDTO } from '#shared/types/billing'
import type { CreditNote } from '#server/models/CreditNote'
import type { Invoice } from '#server/models/Invoice'
import { LabSettings } from '#server/models/LabSettings'
import { Organization } from '#server/models/Organization'
import type { Quote } from '#server/models/Quote'
import { labIdentity } from '#server/services/mail/templates'
import { storeUploadBytes } from '#server/services/uploads/uploads'
import { billingPdf, factDate, type BillingDocumentData } from './pdf'
import { currentPriceList } from './prices'

export function linesDTO<L extends BillingLine>(lines: readonly L[]): (L & { amountMinor: number })[] {
  return lines.map(l => ({ ...l, amountMinor: lineAmount(l.quantity, l.unitPriceMinor) }))
}

export type { BillingLineDTO }

async function labParty(t: Transaction | undefined): Promise<BillingDocumentData['lab']> {
  const row = await LabSettings.findOne({ order: [['id', 'ASC']], transaction: t })
  if (!row) {
    const id = await labIdentity(t)
    return { name: id.name, addressLines: id.address, email: null, phone: null }
  }
  const address = [...row.addressLines.split('\n'), [row.postcode, row.city].filter(Boolean).join(' '), row.country].map(l => l.trim()).filter(Boolean)
  return { name: row.name, addressLines: address, email: row.email ?? null, phone: row.phone ?? null }
}

async function customerParty(t: Transaction | undefined, organizationId: number): Promise<BillingDocumentData['customer']> {
  const org = await Organization.findByPk(organizationId, { transaction: t })
  if (!org) return { name: 'Customer', addressLines: [] }
  const lines = [...(org.addressLines ?? '').split('\n'), [org.postcode, org.city].filter(Boolean).join(' '), org.country ?? ''].map(l => l.trim()).filter(Boolean)
  return { name: org.name, addressLines: lines }
}

function pdfLines(lines: readonly BillingLine[]): BillingDocumentData['lines'] {
  return lines.map(l => ({ description: l.description, quantity: l.quantity, unitPriceMinor: l.unitPriceMinor, amountMinor: lineAmount(l.quantity, l.unitPriceMinor) }))
}

async function bankDetails(t: Transaction | undefined): Promise<string | null> {
  return (await currentPriceList(t))?.bankDetails ?? null
}

/** The quote as a PDF, from the record. */
export async function quotePdf(t: Transaction | undefined, q: Pick<Quote, 'number' | 'organizationId' | 'message' | 'validUntil' | 'sentAt' | 'createdAt' | 'currency' | 'taxRateBp' | 'lines' | 'netMinor' | 'taxMinor' | 'grossMinor'>, requestId: number): Promise<Buffer> {
  const notes: BillingDocumentData['notes'] = []
  if (q.message) notes.push({ heading: 'From the laboratory', text: q.message })
  notes.push({ heading: 'Accepting this quote', text: `Accept this quote in the customer portal with your purchase-order number${q.validUntil ? ` by ${factDate(q.validUntil)}` : ''}. Accepting it agrees to the terms of calibration request ${requestId} that the laboratory offered, and makes the order. Prices include the points stated; tax is charged at the rate shown.` })
  return billingPdf({
    kind: 'quote',
    number: q.number,
    lab: await labParty(t),
    customer: await customerParty(t, q.organizationId),
    facts: [['Date', factDate((q.sentAt ?? q.createdAt).toISOString().slice(0, 10))], ['Valid until', factDate(q.validUntil)], ['Calibration request', String(requestId)], ['Currency', q.currency]],
    lines: pdfLines(q.lines),
    currency: q.currency,
    taxRatePercent: basisPointsToPercent(q.taxRateBp),
    netMinor: q.netMinor,
    taxMinor: q.taxMinor,
    grossMinor: q.grossMinor,
    notes,
  })
}

/** The invoice as a PDF (before its row exists: the fields it states). */
export async function invoicePdf(t: Transaction | undefined, i: Pick<Invoice, 'number' | 'organizationId' | 'issueDate' | 'dueDate' | 'purchaseOrder' | 'currency' | 'taxRateBp' | 'lines' | 'netMinor' | 'taxMinor' | 'grossMinor'>, orderNumber: string): Promise<Buffer> {
  const bank = await bankDetails(t)
  const pay = `Please pay ${formatMoney(i.grossMinor, i.currency)} by ${factDate(i.dueDate)}, quoting ${i.number}${i.purchaseOrder ? ` and your order ${i.purchaseOrder}` : ''}.${bank ? ` Bank transfer: ${bank}.` : ''} You can also pay by card in the customer portal.`
  return billingPdf({
    kind: 'invoice',
    number: i.number,
    lab: await labParty(t),
    customer: await customerParty(t, i.organizationId),
    facts: [['Invoice date', factDate(i.issueDate)], ['Due date', factDate(i.dueDate)], ['Your order', i.purchaseOrder ?? '—'], ['Our order', orderNumber]],
    lines: pdfLines(i.lines),
    currency: i.currency,
    taxRatePercent: basisPointsToPercent(i.taxRateBp),
    netMinor: i.netMinor,
    taxMinor: i.taxMinor,
    grossMinor: i.grossMinor,
    notes: [{ heading: 'Payment', text: pay }],
  })
}

/** The credit note as a PDF (before its row exists). */
export async function creditNotePdf(t: Transaction | undefined, c: Pick<CreditNote, 'number' | 'organizationId' | 'issueDate' | 'reason' | 'currency' | 'lines' | 'netMinor' | 'taxMinor' | 'grossMinor'>, invoice: Invoice): Promise<Buffer> {
  return billingPdf({
    kind: 'credit-note',
    number: c.number,
    lab: await labParty(t),
    customer: await customerParty(t, c.organizationId),
    facts: [['Date', factDate(c.issueDate)], ['Invoice credited', invoice.number], ['Invoice date', factDate(invoice.issueDate)], ['Your order', invoice.purchaseOrder ?? '—']],
    lines: pdfLines(c.lines),
    currency: c.currency,
    taxRatePercent: basisPointsToPercent(invoice.taxRateBp),
    netMinor: c.netMinor,
    taxMinor: c.taxMinor,
    grossMinor: c.grossMinor,
    notes: [{ heading: 'Reason', text: c.reason }, { heading: 'What happens now', text: `This credit note lowers what is owed on invoice ${invoice.number} by ${formatMoney(c.grossMinor, c.currency)}. If you have already paid more than is now owed, we refund the difference.` }],
  })
}

/** Store a document's PDF by SHA-256 in the caller's transaction. */
export async function storePdf(t: Transaction, pdf: Buffer): Promise<{ sha256: string, size: number }> {
  return { sha256: await storeUploadBytes(pdf, t), size: pdf.length }
}
