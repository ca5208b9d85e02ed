/**
 * The accounting export: every invoice and credit note issued, and every payment received, within
 * a period (both ends included, lab-local dates), one row each, as CSV. Amounts are decimal text
 * in the currency's major unit; credit notes carry negative amounts, so the sum of `gross` over
 * invoices and credit notes is what was billed, and over payments what was received. Cells a
 * spreadsheet would run as formulas are escaped (server/utils/csv.ts, shared/csv.ts).
 */
import { Op } from 'sequelize'
import { currencyDigits, minorToDecimal } from '#shared/billing/money'
import type { BillingExportQuery } from '#shared/schemas/billing'
import { CreditNote } from '#server/models/CreditNote'
import { Invoice } from '#server/models/Invoice'
import { Organization } from '#server/models/Organization'
import { Payment } from '#server/models/Payment'
import { csvFromRows } from '#server/utils/csv'

export const EXPORT_COLUMNS = ['type', 'date', 'number', 'invoice', 'customer', 'purchaseOrder', 'currency', 'net', 'tax', 'gross', 'method', 'reference', 'dueDate'] as const

const ORDER = { 'invoice': 0, 'credit-note': 1, 'payment': 2 } as const

/** The rows of the export for a period, by date, then kind, then number. */
export async function accountingRows(q: BillingExportQuery): Promise<Record<(typeof EXPORT_COLUMNS)[number], string>[]> {
  const inPeriod = { [Op.gte]: q.from, [Op.lte]: q.to }
  const [invoices, notes, payments] = await Promise.all([
    Invoice.findAll({ where: { issueDate: inPeriod } }),
    CreditNote.findAll({ where: { issueDate: inPeriod } }),
    Payment.findAll({ where: { receivedOn: inPeriod } }),
  ])
  const invoiceIds = [...new Set([...notes.map(n => n.invoiceId), ...payments.map(p => p.invoiceId)])].filter(id => !invoices.some(i => i.id === id))
  const all = [...invoices, ...(invoiceIds.length ? await Invoice.findAll({ where: { id: invoiceIds } }) : [])]
  const invoiceById = new Map(all.map(i => [i.id, i]))
  const orgIds = [...new Set([...all.map(i => i.organizationId), ...notes.map(n => n.organizationId), ...payments.map(p => p.organizationId)])]
  const orgName = new Map((orgIds.length ? await Organization.findAll({ where: { id: orgIds }, attributes: ['id', 'name'] }) : []).map(o => [o.id, o.name]))
  const money = (minor: number, currency: string) => minorToDecimal(minor, currencyDigits(currency))
  const rows: { sort: [string, number, string], row: Record<(typeof EXPORT_COLUMNS)[number], string> }[] = []
  for (const i of invoices) {
    rows.push({ sort: [i.issueDate, ORDER.invoice, i.number], row: {
      type: 'invoice', date: i.issueDate, number: i.number, invoice: i.number, customer: orgName.get(i.organizationId) ?? '', purchaseOrder: i.purchaseOrder ?? '',
      currency: i.currency, net: money(i.netMinor, i.currency), tax: money(i.taxMinor, i.currency), gross: money(i.grossMinor, i.currency), method: '', reference: '', dueDate: i.dueDate,
    } })
  }
  for (const n of notes) {
    const inv = invoiceById.get(n.invoiceId)
    rows.push({ sort: [n.issueDate, ORDER['credit-note'], n.number], row: {
      type: 'credit-note', date: n.issueDate, number: n.number, invoice: inv?.number ?? '', customer: orgName.get(n.organizationId) ?? '', purchaseOrder: inv?.purchaseOrder ?? '',
      currency: n.currency, net: money(-n.netMinor, n.currency), tax: money(-n.taxMinor, n.currency), gross: money(-n.grossMinor, n.currency), method: '', reference: n.reason, dueDate: '',
    } })
  }
  for (const p of payments) {
    const inv = invoiceById.get(p.invoiceId)
    rows.push({ sort: [p.receivedOn, ORDER.payment, String(p.id).padStart(10, '0')], row: {
      type: 'payment', date: p.receivedOn, number: `P-${p.id}`, invoice: inv?.number ?? '', customer: orgName.get(p.organizationId) ?? '', purchaseOrder: inv?.purchaseOrder ?? '',
      currency: p.currency, net: '', tax: '', gross: money(p.amountMinor, p.currency), method: p.method, reference: p.reference, dueDate: '',
    } })
  }
  rows.sort((a, b) => (a.sort[0] < b.sort[0] ? -1 : a.sort[0] > b.sort[0] ? 1 : a.sort[1] - b.sort[1] || a.sort[2].localeCompare(b.sort[2])))
  return rows.map(r => r.row)
}

/** The export as CSV text. */
export async function accountingCsv(q: BillingExportQuery): Promise<string> {
  return csvFromRows(EXPORT_COLUMNS, await accountingRows(q))
}
