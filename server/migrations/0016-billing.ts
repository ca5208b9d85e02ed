import { DataTypes, type QueryInterface } from 'sequelize'
import { createGuard, dropColumns, dropGuard, pgAnyChanged, sqliteAnyChanged, type Guard } from './lib'

/**
 * Billing, from request to payment: price lists (each save a new version, never changed), quotes
 * from reviewed requests, orders made by accepted quotes, invoices and credit notes numbered
 * gap-free in their own series (`billing_counters`, one row per series and year), payments (card,
 * from verified provider events, or bank transfers recorded by hand), card payment attempts, and
 * every verified provider event once (`payment_events.eventId` unique: a replay changes nothing).
 * Outbox messages may carry attachments (stored files, by SHA-256).
 *
 * Guards on both engines: a counter starts at 1 and moves by exactly one, never deleted; invoices
 * and credit notes are never deleted and what they state never changes once issued (only an
 * invoice's status and paidAt move); price lists, payments and provider events are never changed
 * or deleted.
 */
const id = { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true }
const user = (allowNull: boolean) => ({ type: DataTypes.INTEGER, allowNull, references: { model: 'users', key: 'id' }, onDelete: 'RESTRICT' })
const ref = (table: string, allowNull = false) => ({ type: DataTypes.INTEGER, allowNull, references: { model: table, key: 'id' }, onDelete: 'RESTRICT' })
// Minor units as 32-bit integers (up to 21 million pounds a document): both engines return them as numbers.
const money = { type: DataTypes.INTEGER, allowNull: false }
const stamps = {
  version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
  createdAt: { type: DataTypes.DATE, allowNull: false },
  updatedAt: { type: DataTypes.DATE, allowNull: false },
}

const INVOICE_FIXED = ['number', 'counterYear', 'sequence', 'orderId', 'organizationId', 'issueDate', 'dueDate', 'currency', 'taxRateBp', 'lines', 'netMinor', 'taxMinor', 'grossMinor', 'purchaseOrder', 'origin', 'pdfSha256', 'pdfSize', 'createdAt']
const CREDIT_FIXED = ['number', 'counterYear', 'sequence', 'invoiceId', 'organizationId', 'issueDate', 'cause', 'reason', 'certificateId', 'lines', 'netMinor', 'taxMinor', 'grossMinor', 'currency', 'pdfSha256', 'pdfSize', 'createdAt']


const GUARDS: Guard[] = [
  { name: 'billing_counters_no_delete', table: 'billing_counters', event: 'DELETE', message: 'billing counters cannot be deleted' },
  { name: 'billing_counters_step', table: 'billing_counters', event: 'UPDATE', message: 'invoice and credit-note numbers advance by one: no gaps, no reuse',
    sqliteWhen: 'NEW.series IS NOT OLD.series OR NEW.year IS NOT OLD.year OR NEW."lastSequence" IS NOT OLD."lastSequence" + 1',
    when: 'NEW.series IS DISTINCT FROM OLD.series OR NEW.year IS DISTINCT FROM OLD.year OR NEW."lastSequence" IS DISTINCT FROM OLD."lastSequence" + 1' },
  { name: 'billing_counters_start', table: 'billing_counters', event: 'INSERT', message: 'a billing counter starts at 1',
    sqliteWhen: 'NEW."lastSequence" IS NOT 1', when: 'NEW."lastSequence" IS DISTINCT FROM 1' },
  { name: 'invoices_no_delete', table: 'invoices', event: 'DELETE', message: 'invoices cannot be deleted: credit them' },
  { name: 'invoices_fixed', table: 'invoices', event: 'UPDATE', message: 'an issued invoice cannot change: issue a credit note',
    sqliteWhen: sqliteAnyChanged(INVOICE_FIXED), when: pgAnyChanged(INVOICE_FIXED) },
  { name: 'credit_notes_no_delete', table: 'credit_notes', event: 'DELETE', message: 'credit notes cannot be deleted' },
  { name: 'credit_notes_fixed', table: 'credit_notes', event: 'UPDATE', message: 'an issued credit note cannot change',
    sqliteWhen: sqliteAnyChanged(CREDIT_FIXED), when: pgAnyChanged(CREDIT_FIXED) },
  { name: 'price_lists_no_update', table: 'price_lists', event: 'UPDATE', message: 'a price list version cannot change: save a new version' },
  { name: 'price_lists_no_delete', table: 'price_lists', event: 'DELETE', message: 'price list versions cannot be deleted' },
  { name: 'payments_no_update', table: 'payments', event: 'UPDATE', message: 'a recorded payment cannot change' },
  { name: 'payments_no_delete', table: 'payments', event: 'DELETE', message: 'payments cannot be deleted' },
  { name: 'payment_events_no_update', table: 'payment_events', event: 'UPDATE', message: 'a received payment event cannot change' },
  { name: 'payment_events_no_delete', table: 'payment_events', event: 'DELETE', message: 'payment events cannot be deleted' },
]

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.addColumn('outbox_messages', 'attachments', { type: DataTypes.JSON, allowNull: true })

  await qi.createTable('price_lists', {
    id,
    versionNumber: { type: DataTypes.INTEGER, allowNull: false, unique: true },
    currency: { type: DataTypes.STRING(3), allowNull: false },
    taxRateBp: { type: DataTypes.INTEGER, allowNull: false },
    paymentTermsDays: { type: DataTypes.INTEGER, allowNull: false },
    quoteValidDays: { type: DataTypes.INTEGER, allowNull: false },
    bankDetails: { type: DataTypes.TEXT, allowNull: true },
    note: { type: DataTypes.TEXT, allowNull: true },
    items: { type: DataTypes.JSON, allowNull: false },
    extras: { type: DataTypes.JSON, allowNull: false },
    createdBy: user(true),
    ...stamps,
  })

  await qi.createTable('billing_counters', {
    series: { type: DataTypes.STRING(20), primaryKey: true },
    year: { type: DataTypes.INTEGER, primaryKey: true },
    lastSequence: { type: DataTypes.INTEGER, allowNull: false },
  })

  await qi.createTable('quotes', {
    id,
    number: { type: DataTypes.STRING(30), allowNull: false, unique: true },
    requestId: ref('calibration_requests'),
    organizationId: ref('organizations'),
    termsVersion: { type: DataTypes.INTEGER, allowNull: false },
    status: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'draft' },
    priceListId: ref('price_lists', true),
    currency: { type: DataTypes.STRING(3), allowNull: false },
    taxRateBp: { type: DataTypes.INTEGER, allowNull: false },
    lines: { type: DataTypes.JSON, allowNull: false },
    netMinor: money,
    taxMinor: money,
    grossMinor: money,
    message: { type: DataTypes.TEXT, allowNull: true },
    validUntil: { type: DataTypes.DATEONLY, allowNull: true },
    pdfSha256: { type: DataTypes.STRING(64), allowNull: true },
    sentAt: { type: DataTypes.DATE, allowNull: true },
    sentBy: user(true),
    respondedAt: { type: DataTypes.DATE, allowNull: true },
    respondedBy: user(true),
    purchaseOrder: { type: DataTypes.STRING(80), allowNull: true },
    declineReason: { type: DataTypes.TEXT, allowNull: true },
    createdBy: user(true),
    ...stamps,
  })
  await qi.addIndex('quotes', ['requestId'])
  await qi.addIndex('quotes', ['organizationId', 'status'])

  await qi.createTable('orders', {
    id,
    number: { type: DataTypes.STRING(30), allowNull: false, unique: true },
    quoteId: { ...ref('quotes'), unique: true },
    requestId: { ...ref('calibration_requests'), unique: true },
    organizationId: ref('organizations'),
    purchaseOrder: { type: DataTypes.STRING(80), allowNull: false },
    placedAt: { type: DataTypes.DATE, allowNull: false },
    placedBy: user(false),
    returnedOn: { type: DataTypes.DATEONLY, allowNull: true },
    carrier: { type: DataTypes.STRING(80), allowNull: true },
    trackingReference: { type: DataTypes.STRING(120), allowNull: true },
    returnedBy: user(true),
    ...stamps,
  })
  await qi.addIndex('orders', ['organizationId', 'placedAt'])

  await qi.createTable('invoices', {
    id,
    number: { type: DataTypes.STRING(30), allowNull: false, unique: true },
    counterYear: { type: DataTypes.INTEGER, allowNull: false },
    sequence: { type: DataTypes.INTEGER, allowNull: false },
    orderId: { ...ref('orders'), unique: true },
    organizationId: ref('organizations'),
    issueDate: { type: DataTypes.DATEONLY, allowNull: false },
    dueDate: { type: DataTypes.DATEONLY, allowNull: false },
    currency: { type: DataTypes.STRING(3), allowNull: false },
    taxRateBp: { type: DataTypes.INTEGER, allowNull: false },
    lines: { type: DataTypes.JSON, allowNull: false },
    netMinor: money,
    taxMinor: money,
    grossMinor: money,
    purchaseOrder: { type: DataTypes.STRING(80), allowNull: true },
    origin: { type: DataTypes.STRING(10), allowNull: false },
    pdfSha256: { type: DataTypes.STRING(64), allowNull: false },
    pdfSize: { type: DataTypes.INTEGER, allowNull: false },
    status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'open' },
    paidAt: { type: DataTypes.DATE, allowNull: true },
    createdBy: user(true),
    ...stamps,
  })
  await qi.addIndex('invoices', ['counterYear', 'sequence'], { unique: true, name: 'invoices_sequence_unique' })
  await qi.addIndex('invoices', ['organizationId', 'issueDate'])
  await qi.addIndex('invoices', ['status', 'dueDate'])
  await qi.addIndex('invoices', ['issueDate'])

  await qi.createTable('credit_notes', {
    id,
    number: { type: DataTypes.STRING(30), allowNull: false, unique: true },
    counterYear: { type: DataTypes.INTEGER, allowNull: false },
    sequence: { type: DataTypes.INTEGER, allowNull: false },
    invoiceId: ref('invoices'),
    organizationId: ref('organizations'),
    issueDate: { type: DataTypes.DATEONLY, allowNull: false },
    cause: { type: DataTypes.STRING(12), allowNull: false },
    reason: { type: DataTypes.TEXT, allowNull: false },
    certificateId: ref('certificates', true),
    lines: { type: DataTypes.JSON, allowNull: false },
    netMinor: money,
    taxMinor: money,
    grossMinor: money,
    currency: { type: DataTypes.STRING(3), allowNull: false },
    pdfSha256: { type: DataTypes.STRING(64), allowNull: false },
    pdfSize: { type: DataTypes.INTEGER, allowNull: false },
    createdBy: user(true),
    ...stamps,
  })
  await qi.addIndex('credit_notes', ['counterYear', 'sequence'], { unique: true, name: 'credit_notes_sequence_unique' })
  await qi.addIndex('credit_notes', ['invoiceId'])
  await qi.addIndex('credit_notes', ['issueDate'])

  await qi.createTable('payment_attempts', {
    id,
    invoiceId: ref('invoices'),
    provider: { type: DataTypes.STRING(20), allowNull: false },
    sessionId: { type: DataTypes.STRING(200), allowNull: true, unique: true },
    amountMinor: money,
    currency: { type: DataTypes.STRING(3), allowNull: false },
    status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'open' },
    failure: { type: DataTypes.TEXT, allowNull: true },
    completedAt: { type: DataTypes.DATE, allowNull: true },
    createdBy: user(false),
    ...stamps,
  })
  await qi.addIndex('payment_attempts', ['invoiceId'])

  await qi.createTable('payments', {
    id,
    invoiceId: ref('invoices'),
    organizationId: ref('organizations'),
    method: { type: DataTypes.STRING(20), allowNull: false },
    amountMinor: money,
    currency: { type: DataTypes.STRING(3), allowNull: false },
    receivedOn: { type: DataTypes.DATEONLY, allowNull: false },
    reference: { type: DataTypes.STRING(200), allowNull: false },
    provider: { type: DataTypes.STRING(20), allowNull: true },
    /** The provider's checkout session: one payment per session, whatever events arrive. */
    providerReference: { type: DataTypes.STRING(200), allowNull: true, unique: true },
    eventId: { type: DataTypes.STRING(200), allowNull: true },
    recordedBy: user(true),
    ...stamps,
  })
  await qi.addIndex('payments', ['invoiceId'])
  await qi.addIndex('payments', ['receivedOn'])

  await qi.createTable('payment_events', {
    id,
    eventId: { type: DataTypes.STRING(200), allowNull: false, unique: true },
    type: { type: DataTypes.STRING(100), allowNull: false },
    objectId: { type: DataTypes.STRING(200), allowNull: true },
    outcome: { type: DataTypes.STRING(30), allowNull: false },
    invoiceId: ref('invoices', true),
    receivedAt: { type: DataTypes.DATE, allowNull: false },
    createdAt: { type: DataTypes.DATE, allowNull: false },
  })

  for (const g of GUARDS) await createGuard(qi, g)
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  for (const g of [...GUARDS].reverse()) await dropGuard(qi, g.name, g.table)
  for (const t of ['payment_events', 'payments', 'payment_attempts', 'credit_notes', 'invoices', 'orders', 'quotes', 'billing_counters', 'price_lists']) await qi.dropTable(t)
  await dropColumns(qi, 'outbox_messages', ['attachments'])
}
