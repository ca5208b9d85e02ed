/**
 * Overdue invoices in the reminder job (server/services/reminders/reminders.ts): every open invoice
 * past its due date (lab-local) is at a weekly milestone — `overdue-0w` from the day after the due
 * date, `overdue-1w` seven days later, and so on. Each milestone not yet in the reminder log (item
 * type `invoice`) is reminded about once: one message per organization per run, listing all its
 * invoices at a new milestone, to its active contacts and contact addresses. The log rows and the
 * message are written in one transaction with unique keys, so no run — and no second server
 * instance — sends a milestone twice.
 */
import crypto from 'node:crypto'
import { Op } from 'sequelize'
import { formatMoney } from '#shared/billing/money'
import { daysBetween, dueInWords, type IsoDate } from '#shared/mail/milestones'
import { Contact } from '#server/models/Contact'
import { CreditNote } from '#server/models/CreditNote'
import { Invoice } from '#server/models/Invoice'
import { Organization } from '#server/models/Organization'
import { Payment } from '#server/models/Payment'
import { ReminderLog } from '#server/models/ReminderLog'
import { eventMail, type LabIdentity } from '#server/services/mail/templates'
import type { PlannedGroup, PlannedItem } from '#server/services/reminders/reminders'
import { publicBaseUrl } from '#server/utils/publicUrl'

/**
 * The weekly milestone of an invoice due on `dueDate`, on `today`; null while it is not overdue.
 * @example invoiceMilestone('2026-11-19', '2026-11-20') // 'overdue-0w'
 * @example invoiceMilestone('2026-11-19', '2026-11-27') // 'overdue-1w'
 */
export function invoiceMilestone(dueDate: IsoDate, today: IsoDate): string | null {
  const days = daysBetween(dueDate, today)
  return days >= 1 ? `overdue-${Math.floor((days - 1) / 7)}w` : null
}

export async function planInvoiceGroups(today: IsoDate, lab: LabIdentity): Promise<PlannedGroup[]> {
  const late = await Invoice.findAll({ where: { status: 'open', dueDate: { [Op.lt]: today } }, order: [['dueDate', 'ASC'], ['id', 'ASC']] })
  if (!late.length) return []
  const ids = late.map(i => i.id)
  const [logged, notes, payments] = await Promise.all([
    ReminderLog.findAll({ where: { itemType: 'invoice', itemId: ids }, attributes: ['itemId', 'dueDate', 'milestone'] }),
    CreditNote.findAll({ where: { invoiceId: ids }, attributes: ['invoiceId', 'grossMinor'] }),
    Payment.findAll({ where: { invoiceId: ids }, attributes: ['invoiceId', 'amountMinor'] }),
  ])
  const sent = new Set(logged.map(l => `${l.itemId}:${l.dueDate}:${l.milestone}`))
  const byOrg = new Map<number, PlannedItem[]>()
  for (const i of late) {
    const milestone = invoiceMilestone(i.dueDate, today)
    if (!milestone || sent.has(`${i.id}:${i.dueDate}:${milestone}`)) continue
    const balance = i.grossMinor - notes.filter(n => n.invoiceId === i.id).reduce((s, n) => s + n.grossMinor, 0) - payments.filter(p => p.invoiceId === i.id).reduce((s, p) => s + p.amountMinor, 0)
    if (balance <= 0) continue
    const list = byOrg.get(i.organizationId) ?? []
    list.push({
      itemType: 'invoice', itemId: i.id, dueDate: i.dueDate, milestone, label: i.number,
      detail: `${formatMoney(balance, i.currency)} outstanding of ${formatMoney(i.grossMinor, i.currency)}, issued ${i.issueDate}${i.purchaseOrder ? `, your order ${i.purchaseOrder}` : ''}`,
      dueInWords: dueInWords(-daysBetween(i.dueDate, today)), overdue: true,
    })
    byOrg.set(i.organizationId, list)
  }
  if (!byOrg.size) return []
  const orgIds = [...byOrg.keys()]
  const [orgs, contacts] = await Promise.all([
    Organization.findAll({ where: { id: orgIds, active: true } }),
    Contact.findAll({ where: { organizationId: orgIds, active: true }, attributes: ['organizationId', 'email'] }),
  ])
  const groups: PlannedGroup[] = []
  for (const org of orgs) {
    const items = byOrg.get(org.id)!
    const to = [...new Set([...contacts.filter(c => c.organizationId === org.id).map(c => c.email), ...(org.contactEmails ?? [])].map(e => e.toLowerCase()))]
    // Nobody to write to: nothing is logged, so a contact added later still gets the reminder.
    if (!to.length) continue
    const hash = crypto.createHash('sha256').update(items.map(i => `${i.itemId}:${i.milestone}`).sort().join('\n')).digest('hex').slice(0, 20)
    const n = items.length
    const m = eventMail({
      lab,
      subject: `Overdue invoice${n === 1 ? '' : 's'}: ${items.map(i => i.label).join(', ')} — ${org.name}`,
      greeting: `Dear ${org.name},`,
      paragraphs: [
        `Our records show ${n === 1 ? 'this invoice' : `these ${n} invoices`} unpaid after the due date:`,
        ...items.map(i => `${i.label}, due ${i.dueDate} (${i.dueInWords}): ${i.detail}.`),
        'If you have paid in the last few days, thank you, and please ignore this reminder. Otherwise please pay by bank transfer as the invoice says, or by card in the customer portal.',
      ],
      link: { url: `${publicBaseUrl()}/invoices`, label: 'See your invoices' },
    })
    groups.push({ key: `invoices:${org.id}`, items, messages: [{ kind: 'invoice-overdue', to, ...m, dedupeKey: `invoice-overdue:${org.id}:${today}:${hash}` }] })
  }
  return groups
}
