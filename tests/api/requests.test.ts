// Calibration requests: customers ask, the laboratory accepts (draft runs) or declines.
// The demo customer account asks about instruments made here in its organization; the other
// organization is made here too.
import { describe, expect, it } from 'vitest'
import { Client, DEMO_ACCOUNTS, signedIn } from '../support/http'
import { makeCustomer, makeInstrument, makeProcedure, organizationOf } from '../support/factories'

/** The demo customer account and `n` fresh instruments of its organization. */
async function ownInstruments(n: number) {
  const customer = await signedIn('customer')
  const tech = await signedIn('technician')
  const organizationId = await organizationOf(customer)
  const list: { id: number }[] = []
  for (let i = 0; i < n; i++) list.push(await makeInstrument(tech, organizationId))
  return { customer, list }
}

/** An instrument of an organization other than the demo customer's. */
async function foreignInstrument(tech: Client) {
  return makeInstrument(tech, (await makeCustomer(tech)).id)
}

describe('calibration requests', () => {
  it('a customer requests its own instruments; the lab sees it in the queue and accepts it into draft runs', async () => {
    const { customer, list } = await ownInstruments(2)
    const created = await customer.post('/api/requests', { instrumentIds: [list[0]!.id, list[1]!.id], preferredDate: '2027-02-01', notes: 'Before the spring shutdown' })
    expect(created.status).toBe(201)
    expect(created.body).toMatchObject({ status: 'open', preferredDate: '2027-02-01' })
    expect(created.body.instruments).toHaveLength(2)

    const tech = await signedIn('technician')
    const queue = (await tech.get('/api/requests?status=open&pageSize=100')).body.rows as { id: number }[]
    expect(queue.map(r => r.id)).toContain(created.body.id)

    const proc = await makeProcedure(await signedIn('quality'))
    const accepted = await tech.post(`/api/requests/${created.body.id}/accept`, { version: created.body.version, procedureVersionId: proc.currentVersion.id, receivedDate: '2026-12-01', response: 'Booked for the week of 4 January.' })
    expect(accepted.status).toBe(200)
    expect(accepted.body.status).toBe('accepted')
    expect(accepted.body.runIds).toHaveLength(2)
    const run = (await tech.get(`/api/runs/${accepted.body.runIds[0]}`)).body
    expect(run).toMatchObject({ status: 'draft', instrumentId: list[0]!.id, receivedDate: '2026-12-01' })
    expect(run.technicianName).toBe('Tomas Reyne')

    // The customer reads the lab's answer, and the request cannot be accepted twice.
    const mine = (await customer.get(`/api/requests/${created.body.id}`)).body
    expect(mine).toMatchObject({ status: 'accepted', response: 'Booked for the week of 4 January.' })
    // The customer is told by e-mail, once each: received, then accepted (queued in the outbox).
    const admin = await signedIn('admin')
    for (const kind of ['request-received', 'request-accepted']) {
      const out = (await admin.get(`/api/admin/mail/outbox?kind=${kind}&pageSize=100`)).body.rows as { subject: string, recipients: string[] }[]
      const mine = out.filter(m => m.subject.includes(`request ${created.body.id} `))
      expect(mine, kind).toHaveLength(1)
      expect(mine[0]!.recipients).toEqual([DEMO_ACCOUNTS.customer])
    }
    const again = await tech.post(`/api/requests/${created.body.id}/accept`, { version: accepted.body.version, procedureVersionId: proc.currentVersion.id, receivedDate: '2026-12-01' })
    expect(again.status).toBe(409)
  })

  it('refuses another organization\'s instrument, naming instrumentIds, and creates nothing', async () => {
    const { customer } = await ownInstruments(0)
    const tech = await signedIn('technician')
    const foreign = await foreignInstrument(tech)
    const before = (await customer.get('/api/requests?pageSize=100')).body.total
    const r = await customer.post('/api/requests', { instrumentIds: [foreign.id] })
    expect(r.status).toBe(400)
    expect(r.body.data.fields).toHaveProperty('instrumentIds')
    expect((await customer.get('/api/requests?pageSize=100')).body.total).toBe(before)
  })

  it('validates the request and the decline', async () => {
    const { customer, list } = await ownInstruments(2)
    const bad = await customer.post('/api/requests', { instrumentIds: [], preferredDate: '2027-02-30' })
    expect(bad.status).toBe(400)
    expect(Object.keys(bad.body.data.fields).sort()).toEqual(['instrumentIds', 'preferredDate'])
    const dup = await customer.post('/api/requests', { instrumentIds: [list[0]!.id, list[0]!.id] })
    expect(dup.status).toBe(400)
    const ok = (await customer.post('/api/requests', { instrumentIds: [list[1]!.id] })).body
    const tech = await signedIn('technician')
    const noReason = await tech.post(`/api/requests/${ok.id}/decline`, { version: ok.version, response: '' })
    expect(noReason.status).toBe(400)
    expect(noReason.body.data.fields).toHaveProperty('response')
    const declined = await tech.post(`/api/requests/${ok.id}/decline`, { version: ok.version, response: 'That model is outside our scope of accreditation.' })
    expect(declined.body.status).toBe('declined')
  })

  it('keeps organizations apart: lab roles cannot create requests, other customers\' requests are 404', async () => {
    const tech = await signedIn('technician')
    expect((await tech.post('/api/requests', { instrumentIds: [1] })).status).toBe(403)
    // An admin creates a customer user in another organization; it cannot read the demo customer's requests.
    const admin = await signedIn('admin')
    const other = await makeCustomer(admin)
    const email = `glass${Date.now()}@testfield-glass.example`
    expect((await admin.post('/api/admin/users', { email, name: 'Glass Buyer', role: 'customer', organizationId: other.id, password: 'a-good-long-password' })).status).toBe(201)
    const stranger = new Client()
    expect((await stranger.login(email, 'a-good-long-password')).status).toBe(200)
    const { customer, list } = await ownInstruments(1)
    const mine = (await customer.post('/api/requests', { instrumentIds: [list[0]!.id] })).body
    expect((await stranger.get(`/api/requests/${mine.id}`)).status).toBe(404)
    expect(((await stranger.get('/api/requests')).body.rows as { id: number }[]).map(r => r.id)).not.toContain(mine.id)
  })
})

describe('what customers never see', () => {
  it('the laboratory\'s notes on an instrument, and another organization\'s instrument history', async () => {
    const tech = await signedIn('technician')
    const { customer, list } = await ownInstruments(1)
    const target = (await tech.get(`/api/instruments/${list[0]!.id}`)).body
    const noted = await tech.patch(`/api/instruments/${target.id}`, { notes: 'Lab only: display cracked, handle with care', version: target.version })
    expect(noted.status).toBe(200)
    expect((await customer.get(`/api/instruments/${target.id}`)).body.notes).toBeNull()
    const row = ((await customer.get('/api/instruments?pageSize=200')).body.rows as { id: number, notes: string | null }[]).find(r => r.id === target.id)
    expect(row?.notes).toBeNull()
    expect((await tech.get(`/api/instruments/${target.id}`)).body.notes).toContain('Lab only')
    // History of an instrument of another organization: 404 for the customer, data for the lab.
    const foreign = await foreignInstrument(tech)
    expect((await customer.get(`/api/instruments/${foreign.id}/history`)).status).toBe(404)
    expect((await tech.get(`/api/instruments/${foreign.id}/history`)).status).toBe(200)
  })
})
