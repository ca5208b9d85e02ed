/** What the billing API returns: price lists, quotes, orders, invoices, credit notes and payments. */
import type { AttemptStatus, CreditCause, InvoiceOrigin, InvoiceStatus, OrderStage, PaymentMethod, QuoteStatus } from '../billing/constants'
import type { BillingLine, PriceExtras, PriceItem } from '../billing/lines'
import type { OrderStep } from '../billing/orderProgress'

export interface PriceListDTO {
  id: number
  versionNumber: number
  currency: string
  taxRatePercent: number
  paymentTermsDays: number
  quoteValidDays: number
  bankDetails: string | null
  note: string | null
  items: PriceItem[]
  extras: PriceExtras
  createdByName: string | null
  createdAt: string
}

/** GET /api/prices: the current list and every earlier version (newest first). */
export interface PriceListsDTO {
  current: PriceListDTO | null
  versions: { id: number, versionNumber: number, note: string | null, createdByName: string | null, createdAt: string }[]
}

export interface BillingLineDTO extends BillingLine {
  amountMinor: number
}

export interface QuoteDTO {
  id: number
  number: string
  requestId: number
  organizationId: number
  organizationName: string | null
  status: QuoteStatus
  /** The request's terms this quote prices; false once the laboratory offered new terms. */
  termsCurrent: boolean
  procedureName: string | null
  pointsCount: number
  placeOfCalibration: string | null
  instruments: { id: number, serial: string, maker: string, model: string }[]
  currency: string
  taxRatePercent: number
  lines: BillingLineDTO[]
  netMinor: number
  taxMinor: number
  grossMinor: number
  message: string | null
  validUntil: string | null
  sentAt: string | null
  respondedAt: string | null
  respondedByName: string | null
  purchaseOrder: string | null
  declineReason: string | null
  orderId: number | null
  /** The price list's extras (the laboratory's editor offers them); null for customers. */
  extras: PriceExtras | null
  version: number
  createdAt: string
}

export interface OrderItemDTO {
  instrumentId: number
  serial: string
  label: string
  /** The laboratory's run (null for customers). */
  runId: number | null
  receivedOn: string | null
  certificate: { id: number, number: string, status: string } | null
}

export interface OrderDTO {
  id: number
  number: string
  organizationId: number
  organizationName: string | null
  requestId: number
  quoteId: number
  quoteNumber: string
  purchaseOrder: string
  placedAt: string
  placedByName: string | null
  stage: OrderStage
  steps: OrderStep[]
  items: OrderItemDTO[]
  returnedOn: string | null
  carrier: string | null
  trackingReference: string | null
  invoice: { id: number, number: string, status: InvoiceStatus } | null
  currency: string
  grossMinor: number
  version: number
}

export interface CreditNoteDTO {
  id: number
  number: string
  invoiceId: number
  issueDate: string
  cause: CreditCause
  reason: string
  lines: (BillingLineDTO & { invoiceLine: number })[]
  netMinor: number
  taxMinor: number
  grossMinor: number
}

export interface PaymentDTO {
  id: number
  method: PaymentMethod
  amountMinor: number
  currency: string
  receivedOn: string
  reference: string
  recordedByName: string | null
}

export interface PaymentAttemptDTO {
  id: number
  status: AttemptStatus
  amountMinor: number
  createdAt: string
  completedAt: string | null
  failure: string | null
}

export interface InvoiceDTO {
  id: number
  number: string
  orderId: number
  orderNumber: string | null
  organizationId: number
  organizationName: string | null
  purchaseOrder: string | null
  issueDate: string
  dueDate: string
  currency: string
  taxRatePercent: number
  lines: BillingLineDTO[]
  netMinor: number
  taxMinor: number
  grossMinor: number
  creditedMinor: number
  paidMinor: number
  /** Gross less credit notes less payments. */
  balanceMinor: number
  status: InvoiceStatus
  overdue: boolean
  paidAt: string | null
  origin: InvoiceOrigin
  creditNotes: CreditNoteDTO[]
  payments: PaymentDTO[]
  /** Card payment attempts (the laboratory only; empty for customers). */
  attempts: PaymentAttemptDTO[]
  /** Card payment is configured and the invoice has a balance. */
  canPayByCard: boolean
  version: number
}

/** POST /api/invoices/[id]/checkout: where to send the customer to pay. */
export interface CheckoutDTO {
  url: string
}
