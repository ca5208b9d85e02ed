/**
 * Billing inputs: the price list (every save a new version), quotes and their lines, the
 * customer's answer, the return of an order, invoices by hand, bank transfers, credit notes by
 * hand and the accounting export. Amounts are whole minor units (`…Minor`: pence, cents).
 */
import { z } from 'zod'
import { INVOICE_STATUSES, LINE_KINDS, QUOTE_STATUSES } from '../billing/constants'
import { CURRENCY_RE, MAX_MINOR } from '../billing/money'
import { INSTRUMENT_KINDS } from '../registers/constants'
import { pageQuerySchema, text, versionSchema } from './common'
import { dateOnlySchema, optionalText } from './registerQuery'

/** An amount in minor units: a whole number from 0. */
export const minorSchema = (label: string) => z
  .number({ error: `${label} must be an amount` })
  .int(`${label}: whole minor units (pence, cents)`)
  .min(0, `${label} cannot be negative`)
  .max(MAX_MINOR, `${label} is too large`)

const count = (label: string, min: number, max: number) => z
  .number({ error: `${label} must be a number` })
  .int(`${label} is a whole number`)
  .min(min, `${label} is at least ${min}`)
  .max(max, `${label} is at most ${max}`)

/** One price: for a procedure, for a kind of instrument, or general (neither). */
export const priceItemSchema = z.object({
  label: text(120, 'The name of the price'),
  procedureId: z.number({ error: 'Choose a procedure' }).int().positive('Choose a procedure').nullable().default(null),
  instrumentKind: z.enum(INSTRUMENT_KINDS, { error: 'Choose a kind of instrument' }).nullable().default(null),
  priceMinor: minorSchema('The price'),
  includedPoints: count('Points included', 1, 30),
  extraPointMinor: minorSchema('The price per additional point'),
})

export const priceExtrasSchema = z.object({
  expressMinor: minorSchema('Express service'),
  onSiteMinor: minorSchema('On-site calibration'),
  adjustmentMinor: minorSchema('Adjustment'),
})

/** POST /api/prices: the whole price list, saved as its next version. */
export const priceListSchema = z.object({
  currency: z.string({ error: 'Give the currency' }).trim().toUpperCase().regex(CURRENCY_RE, 'A currency code of three letters, e.g. GBP'),
  taxRatePercent: z.number({ error: 'The tax rate must be a number' }).min(0, 'The tax rate cannot be negative').max(100, 'At most 100 %')
    .refine(v => Math.abs(v * 100 - Math.round(v * 100)) < 1e-6, 'At most two decimals'),
  paymentTermsDays: count('Payment terms', 0, 365),
  quoteValidDays: count('Quotes valid for', 1, 365),
  bankDetails: optionalText(1000).default(null),
  note: optionalText(500).default(null),
  items: z.array(priceItemSchema, { error: 'Give the prices' }).min(1, 'Give at least one price').max(100, 'At most 100 prices'),
  extras: priceExtrasSchema,
}).superRefine((v, ctx) => {
  const seen = new Map<string, number>()
  v.items.forEach((item, i) => {
    if (item.procedureId !== null && item.instrumentKind !== null) {
      ctx.addIssue({ code: 'custom', path: ['items', i, 'instrumentKind'], message: 'A price is for a procedure or for a kind of instrument, not both' })
    }
    const key = `${item.procedureId}:${item.instrumentKind}`
    if (seen.has(key)) ctx.addIssue({ code: 'custom', path: ['items', i, 'label'], message: `Repeats price ${seen.get(key)! + 1} (the same procedure or kind)` })
    else seen.set(key, i)
  })
})
export type PriceListInput = z.infer<typeof priceListSchema>

/** One line of a quote (the laboratory's edit). */
export const billingLineSchema = z.object({
  kind: z.enum(LINE_KINDS, { error: 'Choose what the line is for' }),
  instrumentId: z.number({ error: 'Which instrument?' }).int().positive().nullable().default(null),
  description: text(300, 'The description'),
  quantity: count('The quantity', 1, 1000),
  unitPriceMinor: minorSchema('The unit price'),
  includedPoints: count('Points included', 0, 30).nullable().default(null),
})
export type BillingLineInput = z.infer<typeof billingLineSchema>

/** POST /api/quotes: a draft quote from a reviewed request, its lines from the price list. */
export const quoteCreateSchema = z.object({
  requestId: z.number({ error: 'Which request?' }).int().positive('Which request?'),
})
export type QuoteCreateInput = z.infer<typeof quoteCreateSchema>

/** PATCH /api/quotes/[id]: the laboratory edits a draft. */
export const quoteUpdateSchema = z.object({
  version: versionSchema,
  lines: z.array(billingLineSchema, { error: 'Give the lines' }).min(1, 'A quote has at least one line').max(100, 'At most 100 lines'),
  message: optionalText(2000),
  validUntil: dateOnlySchema.nullable().optional(),
})
export type QuoteUpdateInput = z.infer<typeof quoteUpdateSchema>

/** POST /api/quotes/[id]/send */
export const quoteSendSchema = z.object({ version: versionSchema })

/** POST /api/quotes/[id]/accept: the customer's purchase-order number makes the order. */
export const quoteAcceptSchema = z.object({
  version: versionSchema,
  purchaseOrder: text(80, 'Your purchase-order number'),
})
export type QuoteAcceptInput = z.infer<typeof quoteAcceptSchema>

/** POST /api/quotes/[id]/decline */
export const quoteDeclineSchema = z.object({
  version: versionSchema,
  reason: text(2000, 'The reason'),
})
export type QuoteDeclineInput = z.infer<typeof quoteDeclineSchema>

export const quoteQuerySchema = pageQuerySchema.extend({
  status: z.enum(QUOTE_STATUSES, { error: `status is one of ${QUOTE_STATUSES.join(', ')}` }).optional(),
  requestId: z.coerce.number({ error: 'Must be a number' }).int().positive().optional(),
})
export type QuoteQuery = z.infer<typeof quoteQuerySchema>

export const orderQuerySchema = pageQuerySchema
export type OrderQuery = z.infer<typeof orderQuerySchema>

/** POST /api/orders/[id]/return: the instruments went back, with the carrier's tracking reference. */
export const orderReturnSchema = z.object({
  version: versionSchema,
  returnedOn: dateOnlySchema,
  carrier: optionalText(80).default(null),
  trackingReference: text(120, 'The tracking reference'),
})
export type OrderReturnInput = z.infer<typeof orderReturnSchema>

/** POST /api/orders/[id]/invoice: invoice the order now, by hand. */
export const orderInvoiceSchema = z.object({ version: versionSchema })

export const INVOICE_FILTERS = [...INVOICE_STATUSES, 'overdue'] as const
export const invoiceQuerySchema = pageQuerySchema.extend({
  status: z.enum(INVOICE_FILTERS, { error: `status is one of ${INVOICE_FILTERS.join(', ')}` }).optional(),
})
export type InvoiceQuery = z.infer<typeof invoiceQuerySchema>

/** POST /api/invoices/[id]/payments: a bank transfer the laboratory recorded by hand. */
export const paymentRecordSchema = z.object({
  version: versionSchema,
  amountMinor: minorSchema('The amount').min(1, 'The amount is above 0'),
  receivedOn: dateOnlySchema,
  reference: text(200, 'The bank reference'),
})
export type PaymentRecordInput = z.infer<typeof paymentRecordSchema>

/** POST /api/invoices/[id]/credit-notes: a credit note by hand, line by line. */
export const creditNoteManualSchema = z.object({
  version: versionSchema,
  reason: text(2000, 'The reason'),
  lines: z.array(z.object({
    invoiceLine: count('The invoice line', 0, 99),
    quantity: count('The quantity', 1, 1000),
  }), { error: 'Choose the lines to credit' }).min(1, 'Choose at least one line').max(100),
})
export type CreditNoteManualInput = z.infer<typeof creditNoteManualSchema>

/** GET /api/billing/export: invoices, credit notes and payments dated within the period (both ends included). */
export const billingExportQuerySchema = z.object({
  from: dateOnlySchema,
  to: dateOnlySchema,
}).refine(v => v.from <= v.to, { path: ['to'], message: 'The end is on or after the start' })
export type BillingExportQuery = z.infer<typeof billingExportQuerySchema>
