// Complaints (ISO/IEC 17025:2017 7.9): a customer submits them in the portal only about its own
// organization's certificates and instruments (another's is 404), gets the acknowledgement and the
// closing notice through the outbox, and sees neither the laboratory's investigation nor another
// organization's complaints. The outcome is approved only by someone not involved in the work
// complained about (403 otherwise: here the demo quality manager approved the run and signed its
// certificate); a second quality manager, made here, approves it.
import { beforeAll, describe, expect, it } from 'vitest'
import { issueCertificate, makeApprovedRun, makeCustomer, makeInstrument, makeProcedure, makeSource, organizationOf, pointOn } from '../support/factories'
import { Client, DEMO_ACCOUNTS, signedIn, unique } from '../support/http'

let tech: Client
let quality: Client
let admin: Client
let customer: Client
let ownCertificate: { id: number, number: string }
let ownInstrument: number
let otherCertificate: number
let otherInstrument: number
let otherOrg: number

beforeAll(async () => {
  ;[tech, quality, admin, customer] = await Promise.all([signedIn('technician'), signedIn('quality'), signedIn('admin'), signedIn('customer')])
  const source = await makeSource(quality)
  const versionId = (await makeProcedure(quality)).currentVersion.id
  ownInstrument = (await makeInstrument(tech, await organizationOf(customer))).id
  otherOrg = (await makeCustomer(admin)).id
  otherInstrument = (await makeInstrument(tech, otherOrg)).id
  const own = await makeApprovedRun(tech, quality, ownInstrument, versionId, [pointOn(source.id, 323.15)])
  const other = await makeApprovedRun(tech, quality, otherInstrument, versionId, [pointOn(source.id, 323.15)])
  ownCertificate = (await issueCertificate(quality, own)).body
  otherCertificate = (await issueCertificate(quality, other)).body.id
})

async function outboxFor(email: string, kind: string): Promise<{ subject: string, text: string }[]> {
  const rows = (await admin.get(`/api/admin/mail/outbox?kind=${kind}&pageSize=100`)).body.rows as { recipients: string[], subject: string, text: string }[]
  return rows.filter(m => m.recipients.includes(email))
}

describe('complaints in the portal', () => {
  let complaint: { id: number, number: string, version: number }

  it('a customer complains about its own certificate: received, acknowledged by mail', async () => {
    const r = await customer.post('/api/complaints', { subject: 'The 50 °C error looks too large', description: 'Our own check disagrees by 0.4 K.', certificateId: ownCertificate.id })
    expect(r.status, JSON.stringify(r.body)).toBe(201)
    expect(r.body).toMatchObject({ channel: 'portal', status: 'received', certificateId: ownCertificate.id, certificateNumber: ownCertificate.number, investigation: null, involvedUserIds: null })
    expect(r.body.number).toMatch(/^CP-\d{4}-\d{3}$/)
    expect(r.body.acknowledgedAt).toEqual(expect.any(String))
    complaint = r.body
    const acks = (await outboxFor(DEMO_ACCOUNTS.customer, 'complaint-received')).filter(m => m.subject.includes(complaint.number))
    expect(acks).toHaveLength(1)
    expect(acks[0]!.text).toContain(ownCertificate.number)
  })

  it('another organization’s certificate or instrument is 404, and nothing is recorded', async () => {
    const before = (await customer.get('/api/complaints?pageSize=1')).body.total
    expect((await customer.post('/api/complaints', { subject: 'x', description: 'y', certificateId: otherCertificate })).status).toBe(404)
    expect((await customer.post('/api/complaints', { subject: 'x', description: 'y', instrumentId: otherInstrument })).status).toBe(404)
    expect((await customer.post('/api/complaints', { subject: 'x', description: 'y', certificateId: 987654 })).status).toBe(404)
    expect((await customer.get('/api/complaints?pageSize=1')).body.total).toBe(before)
    const ownInstrumentComplaint = await customer.post('/api/complaints', { subject: 'Display flickers after calibration', description: 'Since it came back.', instrumentId: ownInstrument })
    expect(ownInstrumentComplaint.status).toBe(201)
    const bad = await customer.post('/api/complaints', { subject: '', description: 'y' })
    expect(bad.status).toBe(400)
    expect(bad.body.data.fields).toHaveProperty('subject')
  })

  it('the customer sees only its organization’s complaints, without the laboratory’s notes', async () => {
    const labRecorded = await tech.post('/api/complaints', { subject: 'Phoned in: late delivery', description: 'Recorded from a call.', organizationId: otherOrg })
    expect(labRecorded.status, JSON.stringify(labRecorded.body)).toBe(201)
    expect(labRecorded.body.channel).toBe('laboratory')
    expect((await customer.get(`/api/complaints/${labRecorded.body.id}`)).status).toBe(404)
    const mine = (await customer.get('/api/complaints?pageSize=200')).body.rows as { id: number, organizationId: number }[]
    expect(mine.some(c => c.id === labRecorded.body.id)).toBe(false)
    expect(new Set(mine.map(c => c.organizationId))).toEqual(new Set([await organizationOf(customer)]))
    expect((await customer.patch(`/api/complaints/${complaint.id}`, { investigation: 'x', version: 0 })).status).toBe(403)
  })

  it('investigated and proposed by the laboratory; the outcome is only proposed after an investigation (409)', async () => {
    const early = await quality.post(`/api/complaints/${complaint.id}/outcome`, { outcome: 'Too soon', version: complaint.version })
    expect(early.status).toBe(409)
    const inv = await quality.patch(`/api/complaints/${complaint.id}`, { investigation: 'One reading was transcribed from the wrong line.', version: complaint.version })
    expect(inv.status, JSON.stringify(inv.body)).toBe(200)
    expect(inv.body.status).toBe('investigating')
    expect(inv.body.involvedUserIds).toEqual(expect.arrayContaining([(await tech.get('/api/auth/me')).body.id, (await quality.get('/api/auth/me')).body.id]))
    const out = await quality.post(`/api/complaints/${complaint.id}/outcome`, { outcome: 'Upheld: the certificate will be amended.', version: inv.body.version })
    expect(out.status, JSON.stringify(out.body)).toBe(200)
    expect(out.body.status).toBe('outcome-proposed')
    complaint = out.body
    const seen = (await customer.get(`/api/complaints/${complaint.id}`)).body
    expect(seen).toMatchObject({ status: 'outcome-proposed', investigation: null, outcome: null })
  })

  it('someone involved may not approve (403); a quality manager who was not involved approves and closes; the closing notice is mailed', async () => {
    const refused = await quality.post(`/api/complaints/${complaint.id}/approve`, { version: complaint.version })
    expect(refused.status).toBe(403)
    expect(refused.body.message).toMatch(/involved/)
    expect((await tech.post(`/api/complaints/${complaint.id}/approve`, { version: complaint.version })).status).toBe(403)
    expect((await quality.get(`/api/complaints/${complaint.id}`)).body.status).toBe('outcome-proposed')

    const email = `${unique('q2')}@bandlight.test`
    expect((await admin.post('/api/admin/users', { email, name: 'Rosa Quenby', role: 'quality', password: 'a-good-long-password' })).status).toBe(201)
    const other = new Client()
    expect((await other.login(email, 'a-good-long-password')).status).toBe(200)
    const ok = await other.post(`/api/complaints/${complaint.id}/approve`, { version: complaint.version })
    expect(ok.status, JSON.stringify(ok.body)).toBe(200)
    expect(ok.body).toMatchObject({ status: 'closed', approvedByName: 'Rosa Quenby' })
    const closing = (await outboxFor(DEMO_ACCOUNTS.customer, 'complaint-closed')).filter(m => m.subject.includes(complaint.number))
    expect(closing).toHaveLength(1)
    expect(closing[0]!.text).toContain('Upheld: the certificate will be amended.')
    expect((await customer.get(`/api/complaints/${complaint.id}`)).body).toMatchObject({ status: 'closed', outcome: 'Upheld: the certificate will be amended.' })
    expect((await other.post(`/api/complaints/${complaint.id}/approve`, { version: ok.body.version })).status).toBe(409)
  })

  it('the demo complaint waits for approval by someone not involved: the demo quality manager signed that certificate', async () => {
    const demo = (await quality.get('/api/complaints?status=outcome-proposed&pageSize=100')).body.rows.find((c: { subject: string }) => c.subject === 'The 50 °C result looks wrong')
    expect(demo, 'the demo complaint').toBeTruthy()
    expect(demo.channel).toBe('portal')
    expect((await quality.post(`/api/complaints/${demo.id}/approve`, { version: demo.version })).status).toBe(403)
  })
})
