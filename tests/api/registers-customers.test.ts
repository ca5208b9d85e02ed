// Customers (organizations with a certificate address) and their contacts; CSV import and export.
// Organizations, people and addresses are invented.
import { describe, expect, it } from 'vitest'
import { signedIn, unique } from '../support/http'

const address = { addressLines: '7 Kilnworks Row\nUnit B', city: 'Emberton', postcode: 'EM1 2AB', country: 'United Kingdom' }

describe('customers', () => {
  it('lab roles create and edit customers with their address; customers are refused', async () => {
    const tech = await signedIn('technician')
    const customer = await signedIn('customer')
    const name = `Invented Kilns ${unique()}`
    const c = await tech.post('/api/customers', { name, ...address })
    expect(c.status).toBe(201)
    expect(c.body).toMatchObject({ name, ...address, contactCount: 0, active: true })
    const missing = await tech.post('/api/customers', { name: `No Address ${unique()}` })
    expect(missing.status).toBe(400)
    expect(missing.body.data.fields).toMatchObject({ addressLines: expect.any(String), city: expect.any(String), country: expect.any(String) })
    expect((await customer.get('/api/customers')).status).toBe(403)
    expect((await customer.post('/api/customers', { name: 'x', ...address })).status).toBe(403)
    const e = await tech.patch(`/api/customers/${c.body.id}`, { city: 'Cinderford', version: c.body.version })
    expect(e.status).toBe(200)
    expect(e.body.city).toBe('Cinderford')
    expect((await tech.patch(`/api/customers/${c.body.id}`, { city: 'Late', version: c.body.version })).status).toBe(409)
    const d = (await tech.get(`/api/customers/${c.body.id}`)).body
    expect(d.audit.map((a: { action: string }) => a.action)).toEqual(['create', 'update'])
    expect(d.audit[1].before).toMatchObject({ city: 'Emberton' })
  })

  it('adds, edits and deactivates contacts (never deletes them), counting active ones', async () => {
    const quality = await signedIn('quality')
    const org = (await quality.post('/api/customers', { name: `Contacted ${unique()}`, ...address })).body
    const bad = await quality.post(`/api/customers/${org.id}/contacts`, { name: 'A', email: 'not-mail', phone: 'call me' })
    expect(bad.status).toBe(400)
    expect(Object.keys(bad.body.data.fields).sort()).toEqual(['email', 'phone'])
    const a = await quality.post(`/api/customers/${org.id}/contacts`, { name: 'Ines Moravec', email: 'Ines@Contacted.example', phone: '+44 1632 960 000' })
    expect(a.status).toBe(201)
    expect(a.body).toMatchObject({ email: 'ines@contacted.example', receivesReminders: true, active: true })
    await quality.post(`/api/customers/${org.id}/contacts`, { name: 'Olu Benning', email: 'olu@contacted.example', receivesReminders: false })
    expect((await quality.get(`/api/customers?q=${encodeURIComponent(org.name)}`)).body.rows[0].contactCount).toBe(2)
    const off = await quality.patch(`/api/contacts/${a.body.id}`, { active: false, version: a.body.version })
    expect(off.body.active).toBe(false)
    expect((await quality.patch(`/api/contacts/${a.body.id}`, { name: 'x', version: a.body.version })).status).toBe(409)
    const d = (await quality.get(`/api/customers/${org.id}`)).body
    expect(d.contactCount).toBe(1)
    expect(d.contacts).toHaveLength(2)
    expect((await quality.post('/api/customers/987654/contacts', { name: 'N', email: 'n@x.example' })).status).toBe(404)
    const admin = await signedIn('admin')
    const audit = (await admin.get(`/api/admin/audit?entity=Contact&entityId=${a.body.id}`)).body.rows.map((r: { action: string }) => r.action)
    expect(audit.sort()).toEqual(['create', 'deactivate'])
  })

  it('the demo customers have addresses and a contact', async () => {
    const tech = await signedIn('technician')
    const r = (await tech.get('/api/customers?q=Kestrelmoor')).body.rows[0]
    expect(r).toMatchObject({ name: 'Kestrelmoor Foundry Ltd', city: 'Kestrelmoor', country: 'United Kingdom' })
    expect(r.contactCount).toBeGreaterThanOrEqual(1)
  })

  it('imports organizations with one contact per row, all or nothing, and exports them again', async () => {
    const tech = await signedIn('technician')
    const name = `Imported Glass ${unique()}`
    const rows = [
      'name,addressLines,city,postcode,country,contactName,contactEmail,contactReceivesReminders',
      `"${name}","1 Sandpit Way",Vitrea,V1,Norway,Ada Brun,ada@imported.example,true`,
      `"${name}","1 Sandpit Way",Vitrea,V1,Norway,Per Lind,per@imported.example,no`,
      `"Other ${name}","2 Sandpit Way",Vitrea,,Norway,Bad Mail,not-an-address,true`,
    ]
    const p = await tech.post('/api/customers/import', { csv: rows.join('\n') })
    expect(p.body).toMatchObject({ valid: 2, invalid: 1 })
    expect(p.body.rows[2]).toMatchObject({ line: 4, errors: { contactEmail: expect.any(String) } })
    expect((await tech.post('/api/customers/import', { csv: rows.join('\n'), commit: true })).status).toBe(400)
    expect((await tech.get(`/api/customers?q=${encodeURIComponent(name)}`)).body.total).toBe(0)
    const ok = await tech.post('/api/customers/import', { csv: rows.slice(0, 3).join('\n'), commit: true })
    expect(ok.status).toBe(201)
    expect(ok.body.created).toBe(3) // one organization and two contacts
    const org = (await tech.get(`/api/customers?q=${encodeURIComponent(name)}`)).body.rows[0]
    expect(org).toMatchObject({ name, city: 'Vitrea', contactCount: 2 })
    const exp = await tech.get(`/api/customers/export?q=${encodeURIComponent(name)}`)
    expect(exp.headers.get('content-disposition')).toMatch(/filename="customers-/)
    const text = String(exp.body)
    expect(text).toContain('ada@imported.example')
    expect(text).toContain('per@imported.example')
    // Re-importing the export: the organization exists already.
    const again = await tech.post('/api/customers/import', { csv: text })
    expect(again.body.rows[0].errors).toHaveProperty('name')
  })
})
