// Reminders and the outbox against a temporary database (SQLite, or PostgreSQL under --db=postgres) and a real SMTP server
// (scripts/lib/mailSink.ts on a free 127.0.0.1 port). Server modules are imported after
// DATABASE_URL is set, because server/utils/db.ts opens the database on import.
import fs from 'node:fs'
import os from 'node:os'
import path from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { testDatabaseUrl } from '../support/database'
import { addDays } from '../../shared/mail/milestones'
import { startMailSink, type MailSink, type StoredMessage } from '../../scripts/lib/mailSink'

const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'bandlight-mail-it-'))
const mailbox = path.join(dir, 'mailbox')
process.env.DATABASE_URL = await testDatabaseUrl(dir, 'mail')
process.env.MAIL_TOKEN_SECRET = 'integration-test-secret-0123456789abcdef'
process.env.PUBLIC_BASE_URL = 'https://lab.bandlight.test'
delete process.env.LAB_NAME

const db = await import('../../server/utils/db')
const { migrate } = await import('../../server/utils/migrate')
const models = await import('../../server/models')
const reminders = await import('../../server/services/reminders/reminders')
const outbox = await import('../../server/services/mail/outbox')
const { closeMailTransport } = await import('../../server/services/mail/transport')
const { resetConfig } = await import('../../server/utils/config')
const { forgetLabTimeZone } = await import('../../server/services/settings/today')
const { Organization, Contact, Instrument, User, OutboxMessage, ReminderLog, AuditEvent, BlackbodySource, EquipmentCalibration, LabSettings } = models

// 06:30 in London (GMT in March) on 2027-03-01: the send hour (6) has come.
const NOW = new Date('2027-03-01T06:30:00Z')
const TODAY = '2027-03-01'
let sink: MailSink
let smtpPort = 0

function received(): StoredMessage[] {
  if (!fs.existsSync(mailbox)) return []
  return fs.readdirSync(mailbox).filter(f => f.endsWith('.json')).map(f => JSON.parse(fs.readFileSync(path.join(mailbox, f), 'utf8')) as StoredMessage)
}

let serialCounter = 0
async function instrument(organizationId: number, dueDate: string | null, extra: Partial<{ archived: boolean, status: 'active' | 'out-of-service' | 'retired', maker: string, model: string }> = {}) {
  serialCounter++
  return Instrument.create({
    organizationId,
    serial: `IT-${String(serialCounter).padStart(4, '0')}`,
    assetTag: null,
    maker: extra.maker ?? 'Calderon Optics',
    model: extra.model ?? 'CX-40',
    kind: 'spot-infrared',
    bandLambda1Um: 8,
    bandLambda2Um: 14,
    spectralResponseId: null,
    distanceToSpot: 12,
    rangeMinK: 253.15,
    rangeMaxK: 773.15,
    defaultEmissivity: 0.95,
    resolutionK: 0.1,
    accuracy: { kind: 'greaterOf', a: 1, b: 1 },
    calibrationIntervalMonths: 12,
    status: extra.status ?? 'active',
    nextDueDate: dueDate,
    photoUploadId: null,
    notes: null,
    archived: extra.archived ?? false,
  })
}

const ids: Record<string, number> = {}

beforeAll(async () => {
  sink = await startMailSink({ port: 0, dir: mailbox, quiet: true })
  smtpPort = sink.port
  process.env.SMTP_URL = `smtp://127.0.0.1:${smtpPort}`
  resetConfig()
  await migrate()

  const foundry = await Organization.create({ name: 'Ashgrove Castings', contactEmails: [] })
  const glass = await Organization.create({ name: 'Tidewater Glassworks', contactEmails: [] })
  const closed = await Organization.create({ name: 'Former Kilns Ltd', contactEmails: [], active: false })
  ids.foundry = foundry.id
  ids.glass = glass.id
  const c = async (org: number, name: string, email: string, extra: { receivesReminders?: boolean, active?: boolean } = {}) =>
    (await Contact.create({ organizationId: org, name, email, phone: null, receivesReminders: extra.receivesReminders ?? true, active: extra.active ?? true })).id
  ids.hollis = await c(foundry.id, 'Hollis Penrow', 'hollis@ashgrove.example')
  ids.mira = await c(foundry.id, 'Mira Oakes', 'mira@ashgrove.example')
  ids.optedOut = await c(foundry.id, 'Ned Quiet', 'ned@ashgrove.example', { receivesReminders: false })
  ids.gone = await c(foundry.id, 'Olive Left', 'olive@ashgrove.example', { active: false })
  ids.tide = await c(glass.id, 'Sander Vos', 'sander@tidewater.example')
  await c(closed.id, 'Closed Contact', 'closed@formerkilns.example')

  ids.lead30 = (await instrument(foundry.id, addDays(TODAY, 30), { maker: 'Norrvik Instruments', model: 'NP-7' })).id // 2027-03-31, across February
  ids.lead7 = (await instrument(foundry.id, addDays(TODAY, 5))).id
  ids.overdue = (await instrument(foundry.id, addDays(TODAY, -8), { status: 'out-of-service' })).id
  ids.far = (await instrument(foundry.id, addDays(TODAY, 100))).id
  ids.archived = (await instrument(foundry.id, addDays(TODAY, 7), { archived: true })).id
  ids.retired = (await instrument(foundry.id, addDays(TODAY, 7), { status: 'retired' })).id
  ids.noDue = (await instrument(foundry.id, null)).id
  ids.glassDue = (await instrument(glass.id, TODAY)).id
  ids.closedDue = (await instrument(closed.id, TODAY)).id

  await User.create({ email: 'quinn@bandlight.test', name: 'Quinn Marl', role: 'quality', passwordHash: 'x', organizationId: null })
  await User.create({ email: 'ada@bandlight.test', name: 'Ada Stroud', role: 'admin', passwordHash: 'x', organizationId: null })
  const source = await BlackbodySource.create({
    assetTag: 'BB-IT-01', kind: 'cavity', maker: 'Hollowell Thermal', model: 'HC-1200', serial: 'HT-881', apertureMm: 50,
    minTemperatureK: 323.15, maxTemperatureK: 1473.15, emissivity: 0.999, emissivityU: 0.0005, emissivityBandLambda1Um: 8,
    emissivityBandLambda2Um: 14, uniformityK: 0.2, stabilityK: 0.05, notes: null,
  })
  ids.source = source.id
  await EquipmentCalibration.create({ equipmentType: 'source', equipmentId: source.id, provider: 'Old provider', certificateNumber: 'C-1', calibrationDate: '2025-03-10', dueDate: '2026-03-10', results: null, uploadId: null, createdBy: null })
  await EquipmentCalibration.create({ equipmentType: 'source', equipmentId: source.id, provider: 'National lab', certificateNumber: 'C-2', calibrationDate: '2026-03-20', dueDate: addDays(TODAY, 20), results: null, uploadId: null, createdBy: null })
})

afterAll(async () => {
  closeMailTransport()
  await sink?.close()
  await db.closeDatabase()
  fs.rmSync(dir, { recursive: true, force: true })
})

describe('the reminder scan', () => {
  it('does nothing before the send hour in the lab time zone', async () => {
    const r = await reminders.runDailyReminders({ now: new Date('2027-03-01T05:59:00Z') })
    expect(r.ran).toBe(false)
    expect(await OutboxMessage.count()).toBe(0)
  })

  it('previews without writing anything', async () => {
    const preview = await reminders.previewReminders({ now: NOW })
    expect(preview.today).toBe(TODAY)
    expect(preview.messages.map(m => m.to[0]).sort()).toEqual(['hollis@ashgrove.example', 'mira@ashgrove.example', 'quinn@bandlight.test', 'sander@tidewater.example'])
    expect(await OutboxMessage.count()).toBe(0)
    expect(await ReminderLog.count()).toBe(0)
  })

  it('queues one message per contact listing their due instruments, then delivers them', async () => {
    const r = await reminders.runDailyReminders({ now: NOW })
    expect(r.ran).toBe(true)
    expect(r.run).toMatchObject({ today: TODAY, queued: 4, logged: 3 + 1 + 1, skipped: 0 })
    expect(r.run!.delivery.sent).toBe(4)

    const mails = received()
    expect(mails.map(m => m.to.join(',')).sort()).toEqual(['hollis@ashgrove.example', 'mira@ashgrove.example', 'quinn@bandlight.test', 'sander@tidewater.example'])
    const hollis = mails.find(m => m.to[0] === 'hollis@ashgrove.example')!
    const serial = async (id: number) => (await Instrument.findByPk(id))!.serial
    for (const id of [ids.lead30, ids.lead7, ids.overdue]) {
      expect(hollis.text).toContain(await serial(id!))
      expect(hollis.html).toContain(await serial(id!))
    }
    for (const id of [ids.far, ids.archived, ids.retired, ids.noDue, ids.glassDue, ids.closedDue]) expect(hollis.text).not.toContain(await serial(id!))
    expect(hollis.text).toContain('Norrvik Instruments NP-7')
    expect(hollis.text).toContain('2027-03-31 (due in 30 days)')
    expect(hollis.text).toContain('overdue by 8 days')
    expect(hollis.subject).toBe('Recalibration overdue: 3 instruments — Ashgrove Castings')
    expect(hollis.text).toContain(`https://lab.bandlight.test/api/mail/unsubscribe?token=${ids.hollis}.`)
    expect(hollis.from).toContain('calibration@bandlight.test')
    // HTML: inline styles only, nothing fetched from elsewhere.
    expect(hollis.html).not.toMatch(/<img|<link|<style|url\(|@import/i)
    const tide = mails.find(m => m.to[0] === 'sander@tidewater.example')!
    expect(tide.text).toContain(await serial(ids.glassDue!))
    expect(tide.text).toContain('due today')
    const quinn = mails.find(m => m.to[0] === 'quinn@bandlight.test')!
    expect(quinn.text).toContain('BB-IT-01')
    expect(quinn.text).toContain(`${addDays(TODAY, 20)} (due in 20 days)`)
    expect(quinn.text).not.toContain('unsubscribe')

    const logs = await ReminderLog.findAll({ order: [['itemId', 'ASC']] })
    expect(logs.filter(l => l.itemType === 'instrument').map(l => [l.itemId, l.milestone])).toEqual([
      [ids.lead30, 'lead-30'], [ids.lead7, 'lead-7'], [ids.overdue, 'overdue-1w'], [ids.glassDue, 'due'],
    ])
    expect(logs.find(l => l.itemType === 'source')).toMatchObject({ itemId: ids.source, milestone: 'due-soon', dueDate: addDays(TODAY, 20) })
  })

  it('sends nothing new when run again, the same hour or later that day', async () => {
    const before = received().length
    const again = await reminders.runDailyReminders({ now: NOW })
    expect(again.run).toMatchObject({ queued: 0, logged: 0 })
    const later = await reminders.runDailyReminders({ now: new Date('2027-03-01T15:05:00Z') })
    expect(later.run).toMatchObject({ queued: 0, logged: 0 })
    expect(received().length).toBe(before)
    expect(await OutboxMessage.count()).toBe(4)
  })

  it('catches up a milestone reached on a day the job did not run', async () => {
    // Due in 31 days today: at its 60-day milestone. Its 30-day day is tomorrow; the job next runs the day after.
    const late = await instrument(ids.glass!, addDays(TODAY, 31))
    expect((await reminders.runReminderScan({ today: TODAY })).logged).toBe(1)
    const r = await reminders.runReminderScan({ today: addDays(TODAY, 2) })
    const logs = await ReminderLog.findAll({ where: { itemType: 'instrument', itemId: late.id }, order: [['id', 'ASC']] })
    expect(logs.map(l => [l.milestone, l.sentOn])).toEqual([['lead-60', TODAY], ['lead-30', addDays(TODAY, 2)]])
    expect(r.queued).toBeGreaterThanOrEqual(1)
    const msg = (await OutboxMessage.findAll({ where: { kind: 'reminder' }, order: [['id', 'DESC']] })).find(m => m.recipients[0] === 'sander@tidewater.example')
    expect(msg?.text).toContain(late.serial)
    expect(msg?.text).not.toContain((await Instrument.findByPk(ids.glassDue))!.serial) // its 'due' milestone was sent already
    await outbox.sendQueued()
  })

  it('lets only one of two racing runs record a milestone', async () => {
    const racer = await instrument(ids.glass!, addDays(TODAY, 3))
    const countBefore = await OutboxMessage.count()
    const [a, b] = await Promise.all([
      reminders.runReminderScan({ today: addDays(TODAY, 2) }),
      reminders.runReminderScan({ today: addDays(TODAY, 2) }),
    ])
    expect(a.queued + b.queued).toBe(1)
    expect(a.skipped + b.skipped).toBe(1)
    expect(await ReminderLog.count({ where: { itemType: 'instrument', itemId: racer.id } })).toBe(1)
    expect(await OutboxMessage.count()).toBe(countBefore + 1)
    await outbox.sendQueued()
  })

  it('takes the lab date in the configured time zone', async () => {
    // The time zone is the laboratory's (lab settings), one "today" for everything.
    const row = await LabSettings.findOne() ?? await LabSettings.create({
      name: 'Integration Lab', addressLines: '1 Test Yard', city: 'Testbury', postcode: null, country: 'United Kingdom', email: null, phone: null,
      accreditationBody: 'Test Body', accreditationNumber: 'T-1', numberPrefix: 'IT', numberIncludesYear: true, numberDigits: 5,
      signatoryFunctions: ['Quality manager'], traceabilityStatement: 'x', decisionRuleStatement: 'x', itemsStatement: 'x', reproductionStatement: null,
    })
    // 11:30 UTC on 1 March is 00:30 on 2 March in Auckland (NZDT, UTC+13).
    const instant = new Date('2027-03-01T11:30:00Z')
    const probe = await instrument(ids.glass!, '2027-03-09')
    const london = await reminders.previewReminders({ now: instant })
    expect(london.today).toBe('2027-03-01')
    const item = (p: typeof london) => p.messages.flatMap(m => m.items).find(i => i.itemId === probe.id)
    expect(item(london)?.milestone).toBe('lead-30') // 8 days
    row!.timeZone = 'Pacific/Auckland'
    await row!.save()
    forgetLabTimeZone()
    try {
      const auckland = await reminders.previewReminders({ now: instant })
      expect(auckland.today).toBe('2027-03-02')
      expect(item(auckland)?.milestone).toBe('lead-7') // 7 days
    }
    finally {
      row!.timeZone = 'Europe/London'
      await row!.save()
      forgetLabTimeZone()
      await probe.update({ archived: true })
    }
  })
})

describe('a long reminder', () => {
  it('lists the first 100 instruments in its body and attaches all of them as CSV', async () => {
    // Web mail clients clip long messages (Gmail past 102 KB of HTML, from memory), hiding the unsubscribe link at the end.
    const org = await Organization.create({ name: 'Brackenhurst Kilns', contactEmails: [] })
    await Contact.create({ organizationId: org.id, name: 'Ivo Brand', email: 'ivo@brackenhurst.example', phone: null, receivesReminders: true, active: true })
    const made: string[] = []
    for (let i = 0; i < 130; i++) made.push((await instrument(org.id, addDays(TODAY, i % 2 ? -8 : 0))).serial)
    const r = await reminders.runReminderScan({ today: TODAY })
    expect(r.logged).toBe(130)
    const row = (await OutboxMessage.findAll({ where: { kind: 'reminder' } })).find(m => m.recipients[0] === 'ivo@brackenhurst.example')!
    expect(row.subject).toBe('Recalibration overdue: 130 instruments — Brackenhurst Kilns')
    const file = `recalibration-due-${TODAY}.csv`
    expect(row.text).toContain(`The first 100 of them are listed here; all 130 are in the attached file ${file}.`)
    expect(row.text.split('\n').filter(l => l.startsWith('  - IT-')).length).toBe(100)
    expect(Buffer.byteLength(row.html!)).toBeLessThan(102 * 1024)
    expect(row.attachments).toEqual([{ filename: file, contentType: 'text/csv', sha256: expect.stringMatching(/^[0-9a-f]{64}$/) }])
    expect(outbox.outboxDTO(row).attachments).toEqual([{ filename: file, contentType: 'text/csv' }])
    const { fileStore } = await import('../../server/utils/fileStore')
    const csv = (await fileStore().get(row.attachments![0]!.sha256))!.toString('utf8')
    const lines = csv.replace(/^\uFEFF/, '').trim().split('\r\n')
    expect(lines[0]).toBe('Serial,Instrument,Due date,Due')
    expect(lines.length).toBe(131)
    expect(lines.map(l => l.split(',')[0]).slice(1).sort()).toEqual([...made].sort())
    expect(lines).toContain(`${made[1]},Calderon Optics CX-40,${addDays(TODAY, -8)},overdue by 8 days`)

    await outbox.sendQueued()
    const mail = received().find(m => m.to[0] === 'ivo@brackenhurst.example')!
    expect(mail.attachments).toEqual([expect.objectContaining({ filename: file, contentType: 'text/csv' })])
    await Instrument.update({ archived: true }, { where: { organizationId: org.id } })
  })
})

describe('the outbox', () => {
  it('keeps messages queued while SMTP is down and delivers each exactly once when it returns', async () => {
    await sink.close()
    const queued = await db.sequelize.transaction(async (t) => {
      const rows = []
      for (const n of [1, 2, 3]) {
        rows.push(await outbox.queueMail(t, {
          kind: 'request-received', to: [`outage${n}@ashgrove.example`], subject: `Outage test ${n}`, text: `Message ${n}`, html: null, dedupeKey: `outage-${n}`,
        }))
      }
      return rows
    })
    const t0 = new Date()
    const down = await outbox.sendQueued({ now: t0 })
    expect(down).toEqual({ sent: 0, retried: 3, failed: 0 })
    for (const q of queued) {
      const row = (await OutboxMessage.findByPk(q.id))!
      expect(row.status).toBe('queued')
      expect(row.attempts).toBe(1)
      expect(row.lastError).toMatch(/ECONNREFUSED|connect/i)
      expect(row.nextAttemptAt!.getTime()).toBe(t0.getTime() + 60_000)
      expect(row.claimedBy).toBe(null)
    }
    // Not yet due again: a second pass does not touch them.
    expect(await outbox.sendQueued({ now: new Date(t0.getTime() + 30_000) })).toEqual({ sent: 0, retried: 0, failed: 0 })
    const second = await outbox.sendQueued({ now: new Date(t0.getTime() + 61_000) })
    expect(second.retried).toBe(3)
    expect((await OutboxMessage.findByPk(queued[0]!.id))!.nextAttemptAt!.getTime()).toBe(t0.getTime() + 61_000 + 120_000)

    sink = await startMailSink({ port: smtpPort, dir: mailbox, quiet: true })
    const later = new Date(t0.getTime() + 10 * 60_000)
    const [a, b] = await Promise.all([
      outbox.sendQueued({ now: later, instanceId: 'instance-a' }),
      outbox.sendQueued({ now: later, instanceId: 'instance-b' }),
    ])
    expect(a.sent + b.sent).toBe(3)
    const got = received().filter(m => m.subject.startsWith('Outage test'))
    expect(got.map(m => m.subject).sort()).toEqual(['Outage test 1', 'Outage test 2', 'Outage test 3'])
    for (const q of queued) {
      const row = (await OutboxMessage.findByPk(q.id))!
      expect(row.status).toBe('sent')
      expect(row.attempts).toBe(3)
      expect(row.sentAt).not.toBe(null)
    }
    expect(await outbox.sendQueued({ now: new Date(later.getTime() + 3_600_000) })).toEqual({ sent: 0, retried: 0, failed: 0 })
  })

  it('keeps trying for more than 24 h with growing back-off (capped at 4 h), then gives up after 14 attempts', async () => {
    const row = await db.sequelize.transaction(t => outbox.queueMail(t, { kind: 'request-accepted', to: ['bounce@ashgrove.example'], subject: 'Never', text: 'x', html: null, dedupeKey: 'never-1' }))
    let now = new Date()
    const refuse = async () => { throw new Error('550 mailbox unavailable') }
    const delays: number[] = []
    for (let i = 0; i < 14; i++) {
      const r = await outbox.sendQueued({ now, deliver: refuse })
      const fresh = (await OutboxMessage.findByPk(row.id))!
      if (i < 13) {
        expect(r.retried).toBe(1)
        delays.push(fresh.nextAttemptAt!.getTime() - now.getTime())
        now = fresh.nextAttemptAt!
      }
      else {
        expect(r.failed).toBe(1)
        expect(fresh.status).toBe('failed')
        expect(fresh.attempts).toBe(14)
        expect(fresh.lastError).toBe('550 mailbox unavailable')
      }
    }
    expect(delays).toEqual([1, 2, 4, 8, 16, 32, 64, 128, 240, 240, 240, 240, 240].map(m => m * 60_000))
    // The first attempt to the last: 1455 min = 24 h 15 min of trying before giving up.
    expect(delays.reduce((a, b) => a + b, 0)).toBeGreaterThanOrEqual(24 * 3_600_000)
  })

  it('lets an administrator queue a failed message again, audited, and only a failed one', async () => {
    const row = await db.sequelize.transaction(t => outbox.queueMail(t, { kind: 'request-accepted', to: ['hollis@ashgrove.example'], subject: 'After the outage', text: 'x', html: null, dedupeKey: 'requeue-1' }))
    await row.update({ status: 'failed', attempts: 14, nextAttemptAt: null, lastError: 'connect ECONNREFUSED' })
    const admin = await User.create({ email: 'requeue-admin@bandlight.test', name: 'Requeue Admin', role: 'admin', passwordHash: 'x' })
    const done = await db.sequelize.transaction(t => outbox.requeueMessage(t, admin.id, row.id))
    expect(done?.requeued).toBe(true)
    const fresh = (await OutboxMessage.findByPk(row.id))!
    expect(fresh.status).toBe('queued')
    expect(fresh.attempts).toBe(0)
    expect(await AuditEvent.count({ where: { entity: 'OutboxMessage', entityId: row.id, action: 'requeue', userId: admin.id } })).toBe(1)
    const again = await db.sequelize.transaction(t => outbox.requeueMessage(t, admin.id, row.id))
    expect(again?.requeued).toBe(false)
    expect(await AuditEvent.count({ where: { entity: 'OutboxMessage', entityId: row.id, action: 'requeue' } })).toBe(1)
    await fresh.update({ status: 'sent', sentAt: new Date() })
  })

  it('queues an event message once per dedupe key', async () => {
    const first = await db.sequelize.transaction(t => outbox.queueEventMail(t, { kind: 'certificate-issued', to: ['hollis@ashgrove.example'], subject: 'Certificate BL-2027-00001 issued', text: 'Your certificate is ready.', html: '<p>Your certificate is ready.</p>', dedupeKey: 'certificate:1' }))
    expect(first?.dedupeKey).toBe('certificate-issued:certificate:1')
    const again = await db.sequelize.transaction(t => outbox.queueEventMail(t, { kind: 'certificate-issued', to: ['hollis@ashgrove.example'], subject: 'Certificate BL-2027-00001 issued', text: 'Again', html: null, dedupeKey: 'certificate:1' }))
    expect(again).toBe(null)
    expect(await OutboxMessage.count({ where: { kind: 'certificate-issued' } })).toBe(1)
  })
})

describe('unsubscribe', () => {
  it('refuses a forged or malformed token', async () => {
    const { unsubscribeToken } = await import('../../server/services/mail/tokens')
    const good = unsubscribeToken(ids.hollis!)
    const forged = `${ids.mira}.${good.split('.')[1]}`
    expect(await reminders.unsubscribeByToken(forged)).toBe(null)
    expect(await reminders.unsubscribeByToken('garbage')).toBe(null)
    expect(await reminders.unsubscribeByToken(`99999.${'A'.repeat(43)}`)).toBe(null)
    expect((await Contact.findByPk(ids.mira))!.receivesReminders).toBe(true)
  })

  it('stops reminders to the contact named by the token, with an audit row', async () => {
    const hollisMail = received().find(m => m.to[0] === 'hollis@ashgrove.example')!
    const token = decodeURIComponent(/token=([^\s"&]+)/.exec(hollisMail.text)![1]!)
    const r = await reminders.unsubscribeByToken(token)
    expect(r?.changed).toBe(true)
    expect((await Contact.findByPk(ids.hollis))!.receivesReminders).toBe(false)
    const audit = await AuditEvent.findOne({ where: { entity: 'Contact', entityId: ids.hollis, action: 'unsubscribe' } })
    expect(audit).not.toBe(null)
    expect((await reminders.unsubscribeByToken(token))?.changed).toBe(false)

    const fresh = await instrument(ids.foundry!, addDays(TODAY, 6))
    await reminders.runReminderScan({ today: TODAY })
    const msgs = await OutboxMessage.findAll({ where: { kind: 'reminder' }, order: [['id', 'DESC']], limit: 5 })
    const withFresh = msgs.filter(m => m.text.includes(fresh.serial))
    expect(withFresh.map(m => m.recipients)).toEqual([['mira@ashgrove.example']])
  })
})
