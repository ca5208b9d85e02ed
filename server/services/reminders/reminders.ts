/**
 * The reminder scan (the daily job `reminders:daily`, "run reminders now" and its preview):
 *
 * - customers: each instrument that is not archived or retired, of an active organization, is at
 *   a milestone of its due date (shared/mail/milestones.ts: lead times, due date, weekly while
 *   overdue); each milestone not yet in the reminder log is reminded about once. One message per
 *   active contact who receives reminders, listing all of that organization's instruments at a new
 *   milestone (a long list: its first lines in the body and all of it in an attached CSV file), with
 *   the contact's own unsubscribe link;
 * - the lab: each blackbody source and reference instrument in service or quarantined whose
 *   latest calibration is due within 30 days (`due-soon`) or past due (`overdue`), one message per
 *   active quality manager;
 * - the quality managers: each action of an open corrective action not done after its due date
 *   (`overdue`, once per action and due date), one message per active quality manager;
 * - customers with overdue invoices: weekly, one message per organization
 *   (server/services/billing/overdue.ts).
 *
 * Idempotent: all groups (an organization's log rows and outbox rows; the lab's) are written in
 * one transaction, each group under its own savepoint; the log key (itemType, itemId, dueDate,
 * milestone) and the outbox dedupeKey are unique, so running twice sends nothing new and two
 * instances cannot both send — a group the other got to first fails on the unique key, rolls back
 * to its savepoint and is counted as skipped. A milestone reached on a day the job did not
 * run is still unlogged, and the next run sends it. No Nuxt or Nitro imports.
 */
import crypto from 'node:crypto'
import { Op, QueryTypes, UniqueConstraintError, type Transaction } from 'sequelize'
import {
  daysBetween,
  dueInWords,
  equipmentMilestoneOn,
  labLocalDate,
  labLocalHour,
  milestonesOn,
  reminderHorizon,
  type IsoDate,
  type MilestoneRules,
} from '#shared/mail/milestones'
import type { MailKind } from '#shared/schemas/mail'
import type { ReminderPreviewDTO, ReminderRunDTO } from '#shared/types/mail'
import { Contact } from '#server/models/Contact'
import type { MailSettings } from '#server/models/MailSettings'
import { Organization } from '#server/models/Organization'
import type { ReminderItemType } from '#server/models/ReminderLog'
import { User } from '#server/models/User'
import { recordAudit, snapshot } from '#server/utils/audit'
import { onPostgres, sequelize, writeTransaction } from '#server/utils/db'
import { withLease } from '#server/utils/lease'
import { conflict } from '#server/utils/errors'
import { unsubscribeUrl, verifyUnsubscribeToken } from '#server/services/mail/tokens'
import { REMINDER_BODY_LINES, equipmentAlertMail, labIdentity, qualityAlertMail, reminderListCsv, reminderMail, type LabIdentity, type ReminderLine } from '#server/services/mail/templates'
import { fileStore } from '#server/utils/fileStore'
import { CorrectiveAction } from '#server/models/CorrectiveAction'
import { CorrectiveActionItem } from '#server/models/CorrectiveActionItem'
import { ReminderLog } from '#server/models/ReminderLog'
import { queueMail, sendQueued, type SendOptions } from '#server/services/mail/outbox'
import { mailSettingsRow } from '#server/services/mail/settings'
import { labTimeZone } from '#server/services/settings/today'
import { planInvoiceGroups } from '#server/services/billing/overdue'

/** Reference equipment is reported this many days before its due date. */
export const EQUIPMENT_WINDOW_DAYS = 30

function rulesOf(row: MailSettings): MilestoneRules {
  return { leadTimes: row.leadTimes, overdueWeekly: !!row.overdueWeekly }
}

// ---------------------------------------------------------------- planning

export interface PlannedItem extends ReminderLine {
  itemType: ReminderItemType
  itemId: number
  milestone: string
}

export interface PlannedMessage {
  kind: MailKind
  to: string[]
  subject: string
  text: string
  html: string
  dedupeKey: string
  /** A file sent with it (the whole list of a long reminder), stored when the message is queued. */
  attachment?: { filename: string, contentType: string, content: Buffer }
}

/** What one transaction writes: the log rows of a group (an organization, or the lab's equipment) and its messages. */
export interface PlannedGroup {
  key: string
  items: PlannedItem[]
  messages: PlannedMessage[]
}

export interface ReminderPlan {
  today: IsoDate
  groups: PlannedGroup[]
}

/** An instrument that could be at a milestone: id, organization, due date, serial, maker, model, and the milestones of that due date already logged (space-separated, or null). */
type CandidateTuple = [id: number, organizationId: number, nextDueDate: string, serial: string, maker: string, model: string, sent: string | null]

interface CandidateRow {
  id: number
  organizationId: number
  nextDueDate: string
  serial: string
  maker: string
  model: string
  sent: string | null
}

function itemsHash(items: PlannedItem[]): string {
  const keys = items.map(i => `${i.itemType}:${i.itemId}:${i.dueDate}:${i.milestone}`).sort()
  return crypto.createHash('sha256').update(keys.join('\n')).digest('hex').slice(0, 20)
}

function byDueThenLabel(a: PlannedItem, b: PlannedItem): number {
  return a.dueDate < b.dueDate ? -1 : a.dueDate > b.dueDate ? 1 : a.label.localeCompare(b.label)
}

async function planCustomerGroups(today: IsoDate, rules: MilestoneRules, lab: LabIdentity): Promise<PlannedGroup[]> {
  const horizon = reminderHorizon(today, rules.leadTimes)
  // One pass over the register: every instrument that could be at a milestone, of an organization
  // someone at which receives reminders, with what a message lists of it and the milestones of its
  // due date already logged (a correlated look-up on the log's unique index). The rows come as one
  // JSON array per organization: a large register at a milestone is tens of thousands of rows, and
  // the driver building an object for each costs more than the database's whole scan.
  // Identifiers in double quotes and booleans as TRUE/FALSE: the same SQL on SQLite and PostgreSQL.
  const [concat, arrayOf, tuple] = onPostgres() ? ['string_agg', 'json_agg', 'json_build_array'] : ['group_concat', 'json_group_array', 'json_array']
  const perOrganization = await sequelize.query<{ organizationId: number, items: string | CandidateTuple[] }>(
    `SELECT i."organizationId", ${arrayOf}(${tuple}(i.id, i."organizationId", i."nextDueDate", i.serial, i.maker, i.model,
            (SELECT ${concat}(r.milestone, ' ') FROM reminder_logs r
              WHERE r."itemType" = 'instrument' AND r."itemId" = i.id AND r."dueDate" = i."nextDueDate"))) AS items
       FROM instruments i
      WHERE i.archived = FALSE AND i.status <> 'retired' AND i."nextDueDate" IS NOT NULL AND i."nextDueDate" <= :horizon
        AND i."organizationId" IN (SELECT o.id FROM organizations o WHERE o.active = TRUE
              AND EXISTS (SELECT 1 FROM contacts c WHERE c."organizationId" = o.id AND c.active = TRUE AND c."receivesReminders" = TRUE))
      GROUP BY i."organizationId"`,
    { type: QueryTypes.SELECT, replacements: { horizon } },
  )
  const candidates: CandidateRow[] = []
  for (const group of perOrganization) {
    // SQLite returns the array as text, PostgreSQL's driver parses json itself
    const tuples = typeof group.items === 'string' ? JSON.parse(group.items) as CandidateTuple[] : group.items
    for (const [id, organizationId, nextDueDate, serial, maker, model, sent] of tuples) {
      candidates.push({ id, organizationId, nextDueDate: String(nextDueDate).slice(0, 10), serial, maker, model, sent })
    }
  }
  // due dates repeat across a large register: each one's milestone is worked out once
  const milestoneOfDate = milestonesOn(today, rules)
  const milestones = new Map<string, ReturnType<typeof milestoneOfDate>>()
  const milestoneOf = (due: string) => {
    let m = milestones.get(due)
    if (m === undefined) {
      m = milestoneOfDate(due)
      milestones.set(due, m)
    }
    return m
  }
  const due: { row: CandidateRow, key: string, daysToDue: number }[] = []
  for (const c of candidates) {
    const m = milestoneOf(c.nextDueDate)
    if (!m || (c.sent && c.sent.split(' ').includes(m.key))) continue
    due.push({ row: c, key: m.key, daysToDue: m.daysToDue })
  }
  if (!due.length) return []

  const pending = new Map<number, PlannedItem[]>()
  for (const { row, key, daysToDue } of due) {
    const list = pending.get(row.organizationId) ?? []
    list.push({
      itemType: 'instrument',
      itemId: row.id,
      dueDate: row.nextDueDate,
      milestone: key,
      label: row.serial,
      detail: `${row.maker} ${row.model}`,
      dueInWords: dueInWords(daysToDue),
      overdue: daysToDue < 0,
    })
    pending.set(row.organizationId, list)
  }

  const orgIds = [...pending.keys()]
  const [contacts, orgs] = await Promise.all([
    Contact.findAll({ where: { organizationId: orgIds, active: true, receivesReminders: true }, order: [['id', 'ASC']] }),
    Organization.findAll({ where: { id: orgIds }, attributes: ['id', 'name'] }),
  ])
  const orgName = new Map(orgs.map(o => [o.id, o.name]))
  const contactsOf = new Map<number, Contact[]>()
  for (const c of contacts) {
    const list = contactsOf.get(c.organizationId) ?? []
    // One message per address, even if two contact rows share it.
    if (!list.some(x => x.email.toLowerCase() === c.email.toLowerCase())) list.push(c)
    contactsOf.set(c.organizationId, list)
  }

  const groups: PlannedGroup[] = []
  for (const [orgId, items] of pending) {
    const recipients = contactsOf.get(orgId)
    // Nobody to tell: nothing is logged, so a contact added later still gets the reminder.
    if (!recipients?.length) continue
    items.sort(byDueThenLabel)
    const hash = itemsHash(items)
    // A list too long for a message body goes whole in an attached CSV file (with a byte-order mark for spreadsheets).
    const attachment = items.length > REMINDER_BODY_LINES
      ? { filename: `recalibration-due-${today}.csv`, contentType: 'text/csv', content: Buffer.from(`\uFEFF${reminderListCsv(items)}`, 'utf8') }
      : undefined
    const messages = recipients.map((contact) => {
      const mail = reminderMail({ lab, contactName: contact.name, organizationName: orgName.get(orgId) ?? 'your organization', lines: items, unsubscribeUrl: unsubscribeUrl(contact.id), listFile: attachment?.filename })
      return { kind: 'reminder' as const, to: [contact.email], ...mail, dedupeKey: `reminder:${contact.id}:${today}:${hash}`, attachment }
    })
    groups.push({ key: `organization:${orgId}`, items, messages })
  }
  return groups
}

interface EquipmentRow { id: number, assetTag: string, maker: string, model: string, serial: string }

async function planEquipmentGroup(today: IsoDate, lab: LabIdentity): Promise<PlannedGroup[]> {
  const live = `archived = FALSE AND status <> 'out-of-service'`
  const [sources, references, calibrations] = await Promise.all([
    sequelize.query<EquipmentRow>(`SELECT id, "assetTag", maker, model, serial FROM blackbody_sources WHERE ${live}`, { type: QueryTypes.SELECT }),
    sequelize.query<EquipmentRow>(`SELECT id, "assetTag", maker, model, serial FROM reference_instruments WHERE ${live}`, { type: QueryTypes.SELECT }),
    sequelize.query<{ equipmentType: ReminderItemType, equipmentId: number, calibrationDate: string, dueDate: string }>(
      'SELECT "equipmentType", "equipmentId", "calibrationDate", "dueDate" FROM equipment_calibrations ORDER BY "calibrationDate" ASC, id ASC',
      { type: QueryTypes.SELECT },
    ),
  ])
  // The current due date of a piece of equipment is that of its latest calibration.
  const due = new Map<string, string>()
  for (const c of calibrations) due.set(`${c.equipmentType}:${c.equipmentId}`, c.dueDate)
  const rows = await sequelize.query<{ itemType: string, itemId: number, dueDate: string, milestone: string }>(
    `SELECT "itemType", "itemId", "dueDate", milestone FROM reminder_logs WHERE "itemType" IN ('source', 'reference')`, { type: QueryTypes.SELECT })
  const loggedWithDue = new Set(rows.map(r => `${r.itemType}:${r.itemId}:${r.dueDate}:${r.milestone}`))

  const items: PlannedItem[] = []
  const consider = (type: ReminderItemType, list: EquipmentRow[]) => {
    for (const e of list) {
      const dueDate = due.get(`${type}:${e.id}`)
      if (!dueDate) continue
      const m = equipmentMilestoneOn(dueDate, today, EQUIPMENT_WINDOW_DAYS)
      if (!m || loggedWithDue.has(`${type}:${e.id}:${dueDate}:${m.key}`)) continue
      items.push({
        itemType: type,
        itemId: e.id,
        dueDate,
        milestone: m.key,
        label: e.assetTag,
        detail: `${type === 'source' ? 'Blackbody source' : 'Reference instrument'} ${e.maker} ${e.model} (${e.serial})`,
        dueInWords: dueInWords(m.daysToDue),
        overdue: m.daysToDue < 0,
      })
    }
  }
  consider('source', sources)
  consider('reference', references)
  if (!items.length) return []
  const managers = await User.findAll({ where: { role: 'quality', active: true }, order: [['id', 'ASC']] })
  if (!managers.length) return []
  items.sort(byDueThenLabel)
  const hash = itemsHash(items)
  const messages = managers.map((u) => {
    const mail = equipmentAlertMail({ lab, userName: u.name, lines: items })
    return { kind: 'equipment-alert' as const, to: [u.email], ...mail, dedupeKey: `equipment-alert:${u.id}:${today}:${hash}` }
  })
  return [{ key: 'equipment', items, messages }]
}

/** Actions of open corrective actions past their due date and not yet reported: one message per active quality manager. */
async function planActionGroup(today: IsoDate, lab: LabIdentity): Promise<PlannedGroup[]> {
  const late = await CorrectiveActionItem.findAll({ where: { doneOn: null, dueDate: { [Op.lt]: today } }, order: [['dueDate', 'ASC'], ['id', 'ASC']] })
  if (!late.length) return []
  const [actions, logged] = await Promise.all([
    CorrectiveAction.findAll({ where: { id: [...new Set(late.map(i => i.correctiveActionId))], status: 'open' }, attributes: ['id', 'number', 'title'] }),
    ReminderLog.findAll({ where: { itemType: 'action', itemId: late.map(i => i.id) }, attributes: ['itemId', 'dueDate', 'milestone'] }),
  ])
  const action = new Map(actions.map(a => [a.id, a]))
  const sent = new Set(logged.map(l => `${l.itemId}:${l.dueDate}:${l.milestone}`))
  const owners = await User.findAll({ where: { id: [...new Set(late.map(i => i.ownerId))] }, attributes: ['id', 'name'] })
  const owner = new Map(owners.map(u => [u.id, u.name]))
  const items: PlannedItem[] = []
  for (const i of late) {
    const a = action.get(i.correctiveActionId)
    if (!a || sent.has(`${i.id}:${i.dueDate}:overdue`)) continue
    items.push({
      itemType: 'action',
      itemId: i.id,
      dueDate: i.dueDate,
      milestone: 'overdue',
      label: a.number,
      detail: `${i.description} (${owner.get(i.ownerId) ?? 'no owner'})`,
      dueInWords: dueInWords(-daysBetween(i.dueDate, today)),
      overdue: true,
    })
  }
  if (!items.length) return []
  const managers = await User.findAll({ where: { role: 'quality', active: true }, order: [['id', 'ASC']] })
  if (!managers.length) return []
  const hash = itemsHash(items)
  const messages = managers.map((u) => {
    const mail = qualityAlertMail({ lab, userName: u.name, lines: items })
    return { kind: 'quality-alert' as const, to: [u.email], ...mail, dedupeKey: `quality-alert:${u.id}:${today}:${hash}` }
  })
  return [{ key: 'actions', items, messages }]
}

/** Everything a run on the lab-local date `today` would send. Reads only. */
export async function planReminders(opts: { today?: IsoDate, now?: Date, settings?: MailSettings } = {}): Promise<ReminderPlan> {
  const settings = opts.settings ?? await mailSettingsRow()
  const today = opts.today ?? labLocalDate(opts.now ?? new Date(), await labTimeZone())
  const lab = await labIdentity()
  const groups = [
    ...await planCustomerGroups(today, rulesOf(settings), lab),
    ...await planEquipmentGroup(today, lab),
    ...await planActionGroup(today, lab),
    ...await planInvoiceGroups(today, lab),
  ]
  return { today, groups }
}

export async function previewReminders(opts: { today?: IsoDate, now?: Date } = {}): Promise<ReminderPreviewDTO> {
  const plan = await planReminders(opts)
  return {
    today: plan.today,
    messages: plan.groups.flatMap(g => g.messages.map(m => ({
      kind: m.kind,
      to: m.to,
      subject: m.subject,
      items: g.items.map(i => ({ itemType: i.itemType, itemId: i.itemId, label: i.label, detail: i.detail, dueDate: i.dueDate, milestone: i.milestone, dueInWords: i.dueInWords })),
    }))),
  }
}

// ---------------------------------------------------------------- writing

export interface ScanResult {
  today: IsoDate
  queued: number
  logged: number
  skipped: number
}

/**
 * A group's log rows in one statement: the rows travel as one JSON array parameter and the database
 * unpacks it (SQLite `json_each`, PostgreSQL `jsonb_array_elements`), so tens of thousands of rows cost
 * one parse and one round trip instead of hundreds of multi-row INSERTs.
 */
async function insertLogRows(t: Transaction, items: PlannedItem[], today: IsoDate, outboxMessageId: number | null): Promise<void> {
  if (!items.length) return
  const rows = JSON.stringify(items.map(i => [i.itemType, i.itemId, i.dueDate, i.milestone]))
  const columns = '"itemType", "itemId", "dueDate", milestone, "sentOn", "outboxMessageId", "createdAt"'
  const sql = onPostgres()
    ? `INSERT INTO reminder_logs (${columns})
       SELECT r->>0, (r->>1)::integer, (r->>2)::date, r->>3, CAST(:today AS date), CAST(:outbox AS integer), CAST(:createdAt AS timestamptz)
         FROM jsonb_array_elements(CAST(:rows AS jsonb)) AS r`
    : `INSERT INTO reminder_logs (${columns})
       SELECT r.value->>0, r.value->>1, r.value->>2, r.value->>3, :today, :outbox, :createdAt FROM json_each(:rows) AS r`
  // Formatted as Sequelize stores dates in SQLite ('YYYY-MM-DD HH:MM:SS.SSS +00:00'); PostgreSQL reads it as a timestamptz.
  const createdAt = new Date().toISOString().replace('T', ' ').replace('Z', ' +00:00')
  await sequelize.query(sql, { replacements: { rows, today, outbox: outboxMessageId, createdAt }, transaction: t, type: QueryTypes.INSERT })
}

/** One group's messages, then its log rows, in the caller's transaction. */
async function writeGroupIn(t: Transaction, group: PlannedGroup, today: IsoDate): Promise<void> {
  let first: number | null = null
  for (const { attachment, ...m } of group.messages) {
    const attachments = attachment
      ? [{ filename: attachment.filename, contentType: attachment.contentType, sha256: await fileStore().put(attachment.content, t) }]
      : undefined
    const row = await queueMail(t, { ...m, attachments })
    first ??= row.id
  }
  await insertLogRows(t, group.items, today, first)
}

/**
 * Write every group in one transaction (one commit for the whole scan). Each group is written
 * under its own savepoint: a group that another run wrote first (its log key or outbox dedupeKey is
 * taken: a unique clash) is rolled back to that savepoint and counted as skipped, the others commit.
 */
async function writeGroups(groups: PlannedGroup[], today: IsoDate, result: ScanResult): Promise<void> {
  if (!groups.length) return
  const written = await writeTransaction(async (t) => {
    const ok: boolean[] = []
    for (const group of groups) {
      try {
        // a nested transaction is a savepoint in `t`
        await sequelize.transaction({ transaction: t }, sp => writeGroupIn(sp, group, today))
        ok.push(true)
      }
      catch (err) {
        if (!(err instanceof UniqueConstraintError)) throw err
        ok.push(false)
      }
    }
    return ok
  })
  groups.forEach((group, i) => {
    if (written[i]) {
      result.queued += group.messages.length
      result.logged += group.items.length
    }
    else {
      result.skipped++
    }
  })
}

/** Plan and write the reminders for the lab-local date of `now` (or `today`). */
export async function runReminderScan(opts: { today?: IsoDate, now?: Date } = {}): Promise<ScanResult> {
  const plan = await planReminders(opts)
  const result: ScanResult = { today: plan.today, queued: 0, logged: 0, skipped: 0 }
  await writeGroups(plan.groups, plan.today, result)
  return result
}

export interface DailyRunResult {
  /** False when it is before the configured hour in the lab's time zone (nothing done). */
  ran: boolean
  run: ReminderRunDTO | null
}

/** The lease (server/utils/lease.ts) under which one server instance at a time runs the reminder job. */
export const REMINDER_LEASE = 'reminders:daily'

/**
 * The hourly scheduled job: from the configured send hour (lab-local) on, scan and then send.
 * Later runs the same day find everything logged and send nothing new; `force` ignores the hour
 * ("run reminders now"). One instance at a time does the work (a lease in the database): the
 * scheduled run of another instance skips it, and "run reminders now" waits for it (up to a minute,
 * then 409) and finds what it did already logged.
 */
export async function runDailyReminders(opts: { now?: Date, force?: boolean, send?: SendOptions } = {}): Promise<DailyRunResult> {
  const now = opts.now ?? new Date()
  const settings = await mailSettingsRow()
  if (!opts.force && labLocalHour(now, await labTimeZone()) < settings.sendHour) return { ran: false, run: null }
  const leased = await withLease(REMINDER_LEASE, async () => {
    const scan = await runReminderScan({ now })
    const delivery = await sendQueued({ ...opts.send })
    return { ...scan, delivery }
  }, { waitMs: opts.force ? 60_000 : 0 })
  if (!leased.ran) {
    if (opts.force) conflict('Another server instance is running the reminder job; try again in a minute')
    return { ran: false, run: null }
  }
  return { ran: true, run: leased.value }
}

// ---------------------------------------------------------------- unsubscribe

/**
 * Honour an unsubscribe link: the contact it names stops receiving reminders, with an audit
 * row in the same transaction. Null when the token is not valid or names no contact.
 */
export async function unsubscribeByToken(token: string): Promise<{ contact: Contact, changed: boolean } | null> {
  const id = verifyUnsubscribeToken(token)
  if (id === null) return null
  return writeTransaction(async (t) => {
    const contact = await Contact.findByPk(id, { transaction: t })
    if (!contact) return null
    if (!contact.receivesReminders) return { contact, changed: false }
    const before = snapshot(contact)
    contact.receivesReminders = false
    await contact.save({ transaction: t })
    await recordAudit(t, { userId: null, action: 'unsubscribe', entity: 'Contact', entityId: contact.id, before, after: snapshot(contact) })
    return { contact, changed: true }
  })
}
