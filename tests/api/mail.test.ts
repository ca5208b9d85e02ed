// Mail against the built server: "run reminders now" → outbox → the local mail server the test
// runner starts (BANDLIGHT_MAILBOX_DIR), the preview, settings, and the unsubscribe link.
// Organizations, people and instruments are invented.
import { describe, expect, it } from 'vitest'
import { addDays, labLocalDate } from '../../shared/mail/milestones'
import type { OutboxMessageDTO, ReceivedMessageDTO } from '../../shared/types'
import { Client, signedIn, unique } from '../support/http'

const address = { addressLines: '3 Ember Row', city: 'Slagford', postcode: 'SF1 2AB', country: 'United Kingdom' }

function instrument(organizationId: number, serial: string, nextDueDate: string) {
  return {
    organizationId, serial, maker: 'Quillfield Sensing', model: 'QS-12', kind: 'spot-infrared',
    bandLambda1Um: 8, bandLambda2Um: 14, distanceToSpot: 12, rangeMinK: 243.15, rangeMaxK: 773.15,
    defaultEmissivity: 0.95, resolutionK: 0.1, accuracy: { kind: 'greaterOf', a: 1, b: 1 }, calibrationIntervalMonths: 12, nextDueDate,
  }
}

async function waitFor<T>(fn: () => Promise<T | undefined>, ms = 10_000): Promise<T> {
  const deadline = Date.now() + ms
  for (;;) {
    const v = await fn()
    if (v !== undefined) return v
    if (Date.now() > deadline) throw new Error('timed out waiting')
    await new Promise(r => setTimeout(r, 250))
  }
}

async function receivedFor(admin: Client, email: string, marker: string): Promise<ReceivedMessageDTO | undefined> {
  const rows = (await admin.get('/api/admin/mail/received?pageSize=100')).body.rows as ReceivedMessageDTO[]
  return rows.find(m => m.to.includes(email) && m.text.includes(marker))
}

describe('mail', () => {
  it('runs reminders now: one message per contact, in the outbox and then received, and the preview writes nothing', async () => {
    expect(process.env.BANDLIGHT_MAILBOX_DIR, 'the test runner starts a mail sink').toBeTruthy()
    const admin = await signedIn('admin')
    const tech = await signedIn('technician')
    const today = labLocalDate(new Date(), 'Europe/London')
    const org = (await tech.post('/api/customers', { name: `Emberline Forge ${unique()}`, ...address })).body
    const tag = unique('ML').toUpperCase()
    const wants = (await tech.post(`/api/customers/${org.id}/contacts`, { name: 'Ilse Carrow', email: `ilse.${tag.toLowerCase()}@emberline.example` })).body
    await tech.post(`/api/customers/${org.id}/contacts`, { name: 'Otto Nope', email: `otto.${tag.toLowerCase()}@emberline.example`, receivesReminders: false })
    const soon = (await tech.post('/api/instruments', instrument(org.id, `${tag}-A`, addDays(today, 5)))).body
    const month = (await tech.post('/api/instruments', instrument(org.id, `${tag}-B`, addDays(today, 30)))).body
    const far = (await tech.post('/api/instruments', instrument(org.id, `${tag}-C`, addDays(today, 200)))).body
    expect([soon.id, month.id, far.id].every(Boolean)).toBe(true)

    const totalBefore = (await admin.get('/api/admin/mail/outbox')).body.total as number
    const preview = await admin.get('/api/admin/mail/reminders/preview')
    expect(preview.status).toBe(200)
    const planned = preview.body.messages.filter((m: { to: string[] }) => m.to.includes(wants.email))
    expect(planned).toHaveLength(1)
    expect(planned[0].items.map((i: { label: string, milestone: string }) => [i.label, i.milestone])).toEqual([[`${tag}-A`, 'lead-7'], [`${tag}-B`, 'lead-30']])
    expect(preview.body.messages.some((m: { to: string[] }) => m.to.some(t => t.startsWith('otto.')))).toBe(false)
    expect((await admin.get('/api/admin/mail/outbox')).body.total).toBe(totalBefore)

    const run = await admin.post('/api/admin/mail/reminders/run', {})
    expect(run.status).toBe(200)
    expect(run.body.today).toBe(today)
    const outbox = (await admin.get('/api/admin/mail/outbox?kind=reminder&pageSize=100')).body.rows as OutboxMessageDTO[]
    const mine = outbox.filter(m => m.recipients.includes(wants.email))
    expect(mine).toHaveLength(1)
    expect(mine[0]!.text).toContain(`${tag}-A`)
    expect(mine[0]!.text).toContain(`${tag}-B`)
    expect(mine[0]!.text).not.toContain(`${tag}-C`)
    expect(outbox.some(m => m.recipients.some(r => r.startsWith('otto.')))).toBe(false)

    const got = await waitFor(() => receivedFor(admin, wants.email, `${tag}-A`))
    expect(got.to).toEqual([wants.email])
    expect(got.text).toContain(`${tag}-B`)
    expect(got.text).toContain('Quillfield Sensing QS-12')
    expect(got.html).toContain(`${tag}-A`)
    expect(got.subject).toContain(org.name)
    await waitFor(async () => ((await admin.get('/api/admin/mail/outbox?kind=reminder&pageSize=100')).body.rows as OutboxMessageDTO[]).find(m => m.id === mine[0]!.id && m.status === 'sent'))

    // Again: nothing new for this contact.
    expect((await admin.post('/api/admin/mail/reminders/run', {})).status).toBe(200)
    const after = (await admin.get('/api/admin/mail/outbox?kind=reminder&pageSize=100')).body.rows as OutboxMessageDTO[]
    expect(after.filter(m => m.recipients.includes(wants.email))).toHaveLength(1)

    // The unsubscribe link works without a session and stops further reminders.
    const link = /(\/api\/mail\/unsubscribe\?token=[^\s]+)/.exec(got.text)![1]!
    const anon = new Client()
    const page = await anon.request('GET', link, undefined, { accept: 'text/html' })
    expect(page.status).toBe(200)
    expect(page.headers.get('content-type')).toContain('text/html')
    expect(String(page.body)).toContain('no longer receive')
    expect((await anon.get('/api/mail/unsubscribe?token=1.AAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAA')).status).toBe(400)
    expect((await anon.get('/api/mail/unsubscribe')).body.data.fields).toHaveProperty('token')
    const audit = (await admin.get(`/api/admin/audit?entity=Contact&entityId=${wants.id}&action=unsubscribe`)).body.rows
    expect(audit).toHaveLength(1)
    await tech.post('/api/instruments', instrument(org.id, `${tag}-D`, addDays(today, 3)))
    expect((await admin.get('/api/admin/mail/reminders/preview')).body.messages.some((m: { to: string[] }) => m.to.includes(wants.email))).toBe(false)
  })

  it('validates the run body, the outbox query and the settings', async () => {
    const admin = await signedIn('admin')
    expect((await admin.post('/api/admin/mail/reminders/run', { date: '2030-01-01' })).status).toBe(400)
    const bad = await admin.get('/api/admin/mail/outbox?status=lost')
    expect(bad.status).toBe(400)
    expect(bad.body.data.fields).toHaveProperty('status')
    expect((await admin.get('/api/admin/mail/reminders/preview?date=2027-02-29')).status).toBe(400)

    const s = (await admin.get('/api/admin/mail/settings')).body
    expect(s).toMatchObject({ sendHour: expect.any(Number), timeZone: expect.any(String), leadTimes: expect.any(Array) })
    const wrong = await admin.patch('/api/admin/mail/settings', { version: s.version, timeZone: 'Mars/Olympus', leadTimes: [30, 30], sendHour: 24 })
    expect(wrong.status).toBe(400)
    expect(Object.keys(wrong.body.data.fields).sort()).toEqual(['leadTimes', 'sendHour', 'timeZone'])
    const ok = await admin.patch('/api/admin/mail/settings', { version: s.version, sendHour: s.sendHour, leadTimes: [7, 61, 30] })
    expect(ok.status).toBe(200)
    expect(ok.body.leadTimes).toEqual([61, 30, 7])
    expect(ok.body.version).toBe(s.version + 1)
    expect((await admin.patch('/api/admin/mail/settings', { version: s.version, sendHour: 7 })).status).toBe(409)
    const audit = (await admin.get('/api/admin/audit?entity=MailSettings&action=update')).body.rows
    expect(audit[0].before.leadTimes).toEqual(s.leadTimes)
    expect(audit[0].after.leadTimes).toEqual([61, 30, 7])
    // The same values again change nothing and write no audit row.
    expect((await admin.patch('/api/admin/mail/settings', { version: ok.body.version, leadTimes: [61, 30, 7] })).body.version).toBe(ok.body.version)
    const restored = await admin.patch('/api/admin/mail/settings', { version: ok.body.version, leadTimes: s.leadTimes })
    expect(restored.body.leadTimes).toEqual(s.leadTimes)
  })

  it('is for administrators only', async () => {
    for (const role of ['technician', 'quality', 'customer'] as const) {
      const c = await signedIn(role)
      expect((await c.get('/api/admin/mail/outbox')).status).toBe(403)
      expect((await c.post('/api/admin/mail/reminders/run', {})).status).toBe(403)
    }
  })
})
