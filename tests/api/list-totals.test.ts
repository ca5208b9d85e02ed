// List totals are counted once per filter and kept until an instrument changes (issue 17: change
// counters moved by database triggers). These tests read a total, change instruments through
// another client (another user, another session), and read the total again: it must be right at
// once, for the filter that was read before and for the others. Works in an organization of its own.
import { describe, expect, it } from 'vitest'
import { Client, signedIn, unique } from '../support/http'
import { makeCustomer, makeInstrument } from '../support/factories'

function totalOf(c: Client, organizationId: number) {
  return async (query = ''): Promise<number> => {
    const r = await c.get(`/api/instruments?organizationId=${organizationId}&pageSize=2${query}`)
    expect(r.status).toBe(200)
    return r.body.total
  }
}

describe('list totals after writes', () => {
  it('a total read (and read again) by one client follows creations, edits and archiving by another', async () => {
    const reader = await signedIn('technician')
    const writer = await signedIn('quality')
    const org = await makeCustomer(await signedIn('admin'))
    const total = totalOf(reader, org.id)
    const tag = unique('TT').toUpperCase()
    expect(await total()).toBe(0)
    expect(await total()).toBe(0)

    const made = []
    for (let i = 0; i < 3; i++) made.push(await makeInstrument(writer, org.id, { serial: `${tag}-${i}`, nextDueDate: '2099-01-01' }))
    expect(await total()).toBe(3)
    expect(await total('&page=2')).toBe(3)
    expect(await total(`&q=${tag}`)).toBe(3)
    expect(await total('&status=retired')).toBe(0)
    expect(await total('&dueBefore=2030-01-01')).toBe(0)

    const retired = await writer.patch(`/api/instruments/${made[0]!.id}`, { status: 'retired', version: made[0]!.version })
    expect(retired.status).toBe(200)
    expect(await total('&status=retired')).toBe(1)
    expect(await total('&status=active')).toBe(2)
    expect(await total()).toBe(3)

    const redated = await writer.patch(`/api/instruments/${made[1]!.id}`, { nextDueDate: '2025-06-01', version: made[1]!.version })
    expect(redated.status).toBe(200)
    expect(await total('&dueBefore=2030-01-01')).toBe(1)

    const renamed = await writer.patch(`/api/instruments/${made[2]!.id}`, { serial: `OTHER-${tag.slice(2)}`, version: made[2]!.version })
    expect(renamed.status).toBe(200)
    expect(await total(`&q=${tag}`)).toBe(2)

    expect((await writer.post(`/api/instruments/${made[0]!.id}/archive`, { archived: true, version: retired.body.version })).status).toBe(200)
    expect(await total()).toBe(2)
    expect(await total('&archived=true')).toBe(1)
    expect(await total('&archived=all')).toBe(3)
    expect(await total('&status=retired')).toBe(0)
  })

  it('a customer\'s total follows an instrument the lab adds to its organization and one it imports', async () => {
    const admin = await signedIn('admin')
    const org = await makeCustomer(admin)
    const email = `${unique('cust')}@bandlight.test`
    expect((await admin.post('/api/admin/users', { email, name: 'Totals Customer', role: 'customer', organizationId: org.id, password: 'a-good-long-password' })).status).toBe(201)
    const customer = new Client()
    expect((await customer.login(email, 'a-good-long-password')).status).toBe(200)
    const own = async () => (await customer.get('/api/instruments?pageSize=1')).body.total as number
    expect(await own()).toBe(0)
    const tech = await signedIn('technician')
    await makeInstrument(tech, org.id)
    expect(await own()).toBe(1)
    const csv = 'organizationId,serial,maker,model,kind,bandLambda1Um,bandLambda2Um,distanceToSpot,rangeMinK,rangeMaxK,defaultEmissivity,resolutionK,accuracy,calibrationIntervalMonths,status\n'
      + `${org.id},${unique('IMP-')},Ormsby Radiometrics,Spot 8,spot-infrared,8,14,12,243.15,773.15,0.95,0.1,"{""kind"":""greaterOf"",""a"":1,""b"":1}",12,active\n`
    const imported = await tech.post('/api/instruments/import', { csv, commit: true })
    expect(imported.status, JSON.stringify(imported.body)).toBe(201)
    expect(await own()).toBe(2)
  })
})
