// GET /api/overview (issue 17): the overview page's counts in one request, each equal to the total
// of the list its tile links to. The customer's figures are checked in an organization made here
// (nothing else touches it); the laboratory's against the lists read between two equal overviews
// (other tests may write in between).
import { describe, expect, it } from 'vitest'
import { Client, signedIn, unique } from '../support/http'
import { makeCustomer, makeInstrument } from '../support/factories'

const DAY = 86_400_000
const plusDays = (date: string, days: number) => new Date(Date.parse(`${date}T00:00:00Z`) + days * DAY).toISOString().slice(0, 10)

async function listTotal(c: Client, path: string): Promise<number> {
  const r = await c.get(`${path}${path.includes('?') ? '&' : '?'}pageSize=1`)
  expect(r.status, path).toBe(200)
  return r.body.total
}

describe('overview counts', () => {
  it('the laboratory\'s counts equal the totals of the lists the tiles link to', async () => {
    const tech = await signedIn('technician')
    let checked = false
    for (let attempt = 0; attempt < 5 && !checked; attempt++) {
      const o = (await tech.get('/api/overview')).body
      expect(o.today).toMatch(/^\d{4}-\d\d-\d\d$/)
      expect(o.dueSoonBefore).toBe(plusDays(o.today, 30))
      const lists = {
        overdue: await listTotal(tech, `/api/instruments?dueBefore=${o.today}`),
        dueSoon: await listTotal(tech, `/api/instruments?dueBefore=${o.dueSoonBefore}`),
        openRequests: await listTotal(tech, '/api/requests?status=open'),
        toReview: await listTotal(tech, '/api/runs?status=submitted'),
        drafts: await listTotal(tech, '/api/runs?status=draft'),
      }
      const again = (await tech.get('/api/overview')).body
      if (JSON.stringify(again) !== JSON.stringify(o)) continue // something was written meanwhile: read again
      expect(o).toMatchObject(lists)
      checked = true
    }
    expect(checked).toBe(true)
  })

  it('a customer\'s counts are its own organization\'s, without the laboratory\'s run counts, and follow new instruments', async () => {
    const admin = await signedIn('admin')
    const org = await makeCustomer(admin)
    const email = `${unique('ov')}@bandlight.test`
    expect((await admin.post('/api/admin/users', { email, name: 'Overview Customer', role: 'customer', organizationId: org.id, password: 'a-good-long-password' })).status).toBe(201)
    const customer = new Client()
    expect((await customer.login(email, 'a-good-long-password')).status).toBe(200)
    const tech = await signedIn('technician')
    const today = (await customer.get('/api/overview')).body.today as string
    await makeInstrument(tech, org.id, { nextDueDate: '2020-01-01' })
    await makeInstrument(tech, org.id, { nextDueDate: plusDays(today, -1) })
    await makeInstrument(tech, org.id, { nextDueDate: today })
    await makeInstrument(tech, org.id, { nextDueDate: plusDays(today, 29) })
    await makeInstrument(tech, org.id, { nextDueDate: plusDays(today, 30) })
    await makeInstrument(tech, org.id, { nextDueDate: null })
    const o = (await customer.get('/api/overview')).body
    // due before today: 2; before today + 30: those and the ones due today and in 29 days
    expect(o).toEqual({ today, dueSoonBefore: plusDays(today, 30), overdue: 2, dueSoon: 4, openRequests: 0, toReview: null, drafts: null })
    expect(await listTotal(customer, `/api/instruments?dueBefore=${o.today}`)).toBe(o.overdue)
    expect(await listTotal(customer, `/api/instruments?dueBefore=${o.dueSoonBefore}`)).toBe(o.dueSoon)
    expect(await listTotal(customer, '/api/requests?status=open')).toBe(o.openRequests)
  })

  it('needs a session', async () => {
    expect((await new Client().get('/api/overview')).status).toBe(401)
  })
})
