/**
 * The words of billing: kinds of line, the states of quotes, orders, invoices and payments, and
 * how people read them. One list each, used by schemas, the server, the PDFs and the pages.
 */

/**
 * What a line charges for: the calibration of an instrument (including the price list's number of
 * points), points beyond those, the extras, or anything the laboratory writes in by hand.
 */
export const LINE_KINDS = ['calibration', 'extra-points', 'express', 'on-site', 'adjustment', 'other'] as const
export type LineKind = (typeof LINE_KINDS)[number]
export const LINE_KIND_LABELS: Record<LineKind, string> = {
  'calibration': 'Calibration',
  'extra-points': 'Additional points',
  'express': 'Express service',
  'on-site': 'On-site calibration',
  'adjustment': 'Adjustment',
  'other': 'Other',
}

/**
 * draft (the laboratory edits it; customers do not see it) → sent → accepted (an order is made) or
 * declined; a new quote for the same request supersedes a draft or sent one.
 */
export const QUOTE_STATUSES = ['draft', 'sent', 'accepted', 'declined', 'superseded'] as const
export type QuoteStatus = (typeof QUOTE_STATUSES)[number]
export const QUOTE_STATUS_LABELS: Record<QuoteStatus, string> = {
  draft: 'Draft',
  sent: 'Awaiting the customer',
  accepted: 'Accepted',
  declined: 'Declined',
  superseded: 'Superseded',
}

/** The stages of an order the customer follows, in order. */
export const ORDER_STAGES = ['awaiting', 'received', 'in-calibration', 'in-review', 'certified', 'returned'] as const
export type OrderStage = (typeof ORDER_STAGES)[number]
export const ORDER_STAGE_LABELS: Record<OrderStage, string> = {
  'awaiting': 'Awaiting the instrument',
  'received': 'Received',
  'in-calibration': 'In calibration',
  'in-review': 'In review',
  'certified': 'Certificate issued',
  'returned': 'Returned',
}

/**
 * open (money owed) → paid (payments cover the amount less credits) or credited (credit notes
 * cover it all). Overdue is an open invoice past its due date (lab-local), worked out when read.
 */
export const INVOICE_STATUSES = ['open', 'paid', 'credited'] as const
export type InvoiceStatus = (typeof INVOICE_STATUSES)[number]
export const INVOICE_STATUS_LABELS: Record<InvoiceStatus | 'overdue', string> = {
  open: 'Unpaid',
  overdue: 'Overdue',
  paid: 'Paid',
  credited: 'Credited',
}

/** How an invoice came to be: when the order's certificates were issued, or by hand. */
export const INVOICE_ORIGINS = ['automatic', 'manual'] as const
export type InvoiceOrigin = (typeof INVOICE_ORIGINS)[number]

/** Why a credit note was issued. */
export const CREDIT_CAUSES = ['withdrawal', 'amendment', 'manual'] as const
export type CreditCause = (typeof CREDIT_CAUSES)[number]

export const PAYMENT_METHODS = ['card', 'bank-transfer'] as const
export type PaymentMethod = (typeof PAYMENT_METHODS)[number]
export const PAYMENT_METHOD_LABELS: Record<PaymentMethod, string> = {
  'card': 'Card (online)',
  'bank-transfer': 'Bank transfer',
}

/** A card payment attempt through the hosted checkout. */
export const ATTEMPT_STATUSES = ['open', 'paid', 'failed', 'expired'] as const
export type AttemptStatus = (typeof ATTEMPT_STATUSES)[number]

/** Number series, each gap-free in its own counter per year. */
export const BILLING_SERIES = { quote: 'Q', order: 'ORD', invoice: 'INV', 'credit-note': 'CN' } as const
export type BillingSeries = keyof typeof BILLING_SERIES

/**
 * A billing document's number: prefix, year and the sequence with five digits.
 * @example billingNumber('invoice', 2026, 7) // 'INV-2026-00007'
 */
export function billingNumber(series: BillingSeries, year: number, sequence: number): string {
  return `${BILLING_SERIES[series]}-${year}-${String(sequence).padStart(5, '0')}`
}
