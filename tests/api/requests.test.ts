// Calibration requests: customers ask; the laboratory reviews (terms and capability); the customer
// agrees (or the lab records how); the lab accepts into draft runs, or declines.
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

describe('calibration requests and their contract review (ISO/IEC 17025 7.1)', () => {
  it('customer asks with a specification; the lab reviews with a capability check; the customer agrees in the portal; only then runs, with nothing measured pre-filled', async () => {
    // Two 8–14 µm instruments (factory defaults: −30 °C to 500 °C).
    const { customer, list: wideband } = await ownInstruments(2)
    const spec = { kind: 'greaterOf', a: 1, b: 1 }
    const created = await customer.post('/api/requests', {
      instrumentIds: [wideband[0]!.id, wideband[1]!.id], preferredDate: '2027-02-01', notes: 'Before the spring shutdown',
      requirements: 'At 0, 50 and 100 °C, at 300 mm, emissivity setting 0.95', specification: spec,
    })
    expect(created.status, JSON.stringify(created.body)).toBe(201)
    expect(created.body).toMatchObject({ status: 'open', preferredDate: '2027-02-01', requirements: 'At 0, 50 and 100 °C, at 300 mm, emissivity setting 0.95', specification: spec, terms: null })
    expect(created.body.instruments).toHaveLength(2)

    const tech = await signedIn('technician')
    const queue = (await tech.get('/api/requests?status=open&pageSize=100')).body.rows as { id: number }[]
    expect(queue.map(r => r.id)).toContain(created.body.id)
    // Nothing is accepted into work before terms are reviewed and agreed.
    const early = await tech.post(`/api/requests/${created.body.id}/accept`, { version: created.body.version, calibrationDate: '2027-01-05' })
    expect(early.status).toBe(409)
    expect(early.body.message).toMatch(/Review the request/)

    const quality = await signedIn('quality')
    const plate = await makeProcedure(quality, { cmc: [{ minK: 253.15, maxK: 423.15, expandedUncertaintyK: 0.6 }], applicability: { sourceKinds: ['flat-plate'], bandMinUm: 7, bandMaxUm: 15, minK: 253.15, maxK: 423.15 } })
    const cavity = await makeProcedure(quality, { cmc: [{ minK: 323.15, maxK: 1773.15, expandedUncertaintyK: 2 }], applicability: { sourceKinds: ['cavity'], bandMinUm: 0.6, bandMaxUm: 5, minK: 323.15, maxK: 1773.15 } })
    const terms = { procedureVersionId: plate.currentVersion.id, pointsK: [273.15, 323.15, 373.15], distanceMm: 300, emissivitySetting: 0.95, specification: spec, decisionRule: 'guard-band', guardBandFactor: 1 }
    // The capability check refuses, naming why: a short-wave procedure for 8–14 µm instruments; a point no CMC covers.
    const wrongProcedure = await tech.post(`/api/requests/${created.body.id}/review`, { version: created.body.version, terms: { ...terms, procedureVersionId: cavity.currentVersion.id, pointsK: [373.15] } })
    expect(wrongProcedure.status).toBe(400)
    expect(JSON.stringify(wrongProcedure.body.data.fields)).toMatch(/band 8–14 µm is outside the procedure's 0\.6–5 µm/)
    const tooHot = await tech.post(`/api/requests/${created.body.id}/review`, { version: created.body.version, terms: { ...terms, pointsK: [273.15, 473.15] } })
    expect(tooHot.status).toBe(400)
    expect(tooHot.body.data.fields['terms.pointsK']).toMatch(/200 °C is outside the procedure's range/)
    const noGuard = await tech.post(`/api/requests/${created.body.id}/review`, { version: created.body.version, terms: { ...terms, guardBandFactor: null } })
    expect(noGuard.body.data.fields['terms.guardBandFactor']).toBeTruthy()

    const reviewed = await tech.post(`/api/requests/${created.body.id}/review`, { version: created.body.version, terms: { ...terms, message: 'We can do this in the week of 4 January.' } })
    expect(reviewed.status, JSON.stringify(reviewed.body)).toBe(200)
    expect(reviewed.body).toMatchObject({ status: 'reviewed', termsVersion: 1, reviewedByName: 'Tomas Reyne', agreedTermsVersion: null })
    expect(reviewed.body.terms).toMatchObject({ procedureName: plate.name as string, decisionRule: 'guard-band', guardBandFactor: 1, pointsK: [273.15, 323.15, 373.15] })
    expect(reviewed.body.terms.capability.every((f: { ok: boolean }) => f.ok)).toBe(true)
    expect((await tech.post(`/api/requests/${created.body.id}/accept`, { version: reviewed.body.version, calibrationDate: '2027-01-05' })).status).toBe(409)
    // Only the customer agrees in the portal; stale terms are refused.
    expect((await tech.post(`/api/requests/${created.body.id}/agree`, { version: reviewed.body.version, termsVersion: 1 })).status).toBe(403)
    expect((await customer.post(`/api/requests/${created.body.id}/agree`, { version: reviewed.body.version, termsVersion: 2 })).status).toBe(409)
    const agreed = await customer.post(`/api/requests/${created.body.id}/agree`, { version: reviewed.body.version, termsVersion: 1 })
    expect(agreed.status, JSON.stringify(agreed.body)).toBe(200)
    expect(agreed.body).toMatchObject({ status: 'agreed', agreedTermsVersion: 1, agreementMethod: 'portal', agreedByName: 'Cora Lindqvist' })

    const accepted = await tech.post(`/api/requests/${created.body.id}/accept`, { version: agreed.body.version, calibrationDate: '2027-01-05', response: 'Booked for the week of 4 January.' })
    expect(accepted.status, JSON.stringify(accepted.body)).toBe(200)
    expect(accepted.body.status).toBe('accepted')
    expect(accepted.body.runIds).toHaveLength(2)
    const run = (await tech.get(`/api/runs/${accepted.body.runIds[0]}`)).body
    expect(run).toMatchObject({ status: 'draft', instrumentId: wideband[0]!.id, requestId: created.body.id, emissivitySetting: 0.95, placeOfCalibration: 'laboratory' })
    // A run from a request has no measured conditions until they are entered, and no receipt until it is recorded.
    for (const f of ['ambientTemperatureK', 'relativeHumidityPct', 'distanceMm', 'reflectedTemperatureK', 'instrumentTemperatureK', 'receivedDate', 'receipt']) expect(run[f], f).toBeNull()
    expect(run.agreement).toMatchObject({ requestId: created.body.id, termsVersion: 1, decisionRule: 'guard-band', specification: spec, current: true })
    expect(run.technicianName).toBe('Tomas Reyne')

    // The customer reads the lab's answer, and the request cannot be accepted twice.
    const mine = (await customer.get(`/api/requests/${created.body.id}`)).body
    expect(mine).toMatchObject({ status: 'accepted', response: 'Booked for the week of 4 January.' })
    // The customer is told by e-mail, once each: received, terms offered, accepted (queued in the outbox).
    const admin = await signedIn('admin')
    for (const kind of ['request-received', 'request-reviewed', 'request-accepted']) {
      const out = (await admin.get(`/api/admin/mail/outbox?kind=${kind}&pageSize=100`)).body.rows as { subject: string, recipients: string[] }[]
      const mine = out.filter(m => m.subject.includes(`request ${created.body.id} `))
      expect(mine, kind).toHaveLength(1)
      expect(mine[0]!.recipients).toEqual([DEMO_ACCOUNTS.customer])
    }
    const again = await tech.post(`/api/requests/${created.body.id}/accept`, { version: accepted.body.version, calibrationDate: '2027-01-05' })
    expect(again.status).toBe(409)

    // New terms after acceptance are reviewed again: the runs' agreement no longer stands until the customer agrees.
    const revised = await tech.post(`/api/requests/${created.body.id}/review`, { version: accepted.body.version, terms: { ...terms, decisionRule: 'simple-acceptance', guardBandFactor: null } })
    expect(revised.status, JSON.stringify(revised.body)).toBe(200)
    expect(revised.body).toMatchObject({ status: 'accepted', termsVersion: 2, agreedTermsVersion: 1 })
    expect((await tech.get(`/api/runs/${run.id}`)).body.agreement.current).toBe(false)
    const recorded = await tech.post(`/api/requests/${created.body.id}/record-agreement`, { version: revised.body.version, termsVersion: 2, note: 'Agreed by telephone with C. Lindqvist, 3 December' })
    expect(recorded.status, JSON.stringify(recorded.body)).toBe(200)
    expect(recorded.body).toMatchObject({ agreedTermsVersion: 2, agreementMethod: 'recorded', agreementNote: 'Agreed by telephone with C. Lindqvist, 3 December' })
    expect((await tech.get(`/api/runs/${run.id}`)).body.agreement).toMatchObject({ current: true, decisionRule: 'simple-acceptance', method: 'recorded' })
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
