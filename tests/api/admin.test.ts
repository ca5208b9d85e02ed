import { describe, expect, it } from 'vitest'
import { signedIn, unique } from '../support/http'

async function auditFor(entity: string, id: number) {
  const admin = await signedIn('admin')
  const r = await admin.get(`/api/admin/audit?entity=${entity}&entityId=${id}&pageSize=100`)
  expect(r.status).toBe(200)
  return r.body.rows as { action: string, userName: string | null, before: unknown, after: Record<string, unknown> | null }[]
}

describe('users administration', () => {
  it('creates a user with an audit row that names the admin and omits the password hash', async () => {
    const admin = await signedIn('admin')
    const email = `${unique('new')}@bandlight.test`
    const r = await admin.post('/api/admin/users', { email: email.toUpperCase(), name: '  Nia Okafor ', role: 'technician', password: 'a-good-long-password' })
    expect(r.status).toBe(201)
    expect(r.body).toMatchObject({ email, name: 'Nia Okafor', role: 'technician', active: true })
    const rows = await auditFor('User', r.body.id)
    expect(rows).toHaveLength(1)
    expect(rows[0]).toMatchObject({ action: 'create', userName: 'Ada Marwick' })
    expect(rows[0]!.after).toMatchObject({ email, role: 'technician' })
    expect(JSON.stringify(rows)).not.toContain('passwordHash')
  })

  it('answers 400 naming each field at fault, and creates nothing', async () => {
    const admin = await signedIn('admin')
    const before = (await admin.get('/api/admin/users')).body.length
    const r = await admin.post('/api/admin/users', { email: 'nope', name: '', role: 'boss', password: 'short' })
    expect(r.status).toBe(400)
    expect(r.body.data.fields).toMatchObject({
      email: expect.any(String),
      name: expect.any(String),
      role: expect.any(String),
      password: expect.stringContaining('12'),
    })
    expect((await admin.get('/api/admin/users')).body.length).toBe(before)
  })

  it('requires an organization for a customer user, and an existing one', async () => {
    const admin = await signedIn('admin')
    const base = { name: 'Cust Omer', role: 'customer', password: 'a-good-long-password' }
    const none = await admin.post('/api/admin/users', { ...base, email: `${unique('c')}@x.example` })
    expect(none.status).toBe(400)
    expect(none.body.data.fields).toHaveProperty('organizationId')
    const missing = await admin.post('/api/admin/users', { ...base, email: `${unique('c')}@x.example`, organizationId: 999999 })
    expect(missing.status).toBe(400)
    expect(missing.body.data.fields).toHaveProperty('organizationId')
  })

  it('answers 409 naming the field for a duplicate e-mail', async () => {
    const admin = await signedIn('admin')
    const r = await admin.post('/api/admin/users', { email: 'quality@bandlight.test', name: 'Dup', role: 'quality', password: 'a-good-long-password' })
    expect(r.status).toBe(409)
    expect(r.body.data.fields).toHaveProperty('email')
  })

  it('edits name and role with optimistic locking, auditing before and after', async () => {
    const admin = await signedIn('admin')
    const created = (await admin.post('/api/admin/users', { email: `${unique('e')}@bandlight.test`, name: 'First Name', role: 'technician', password: 'a-good-long-password' })).body
    const ok = await admin.patch(`/api/admin/users/${created.id}`, { name: 'Second Name', role: 'quality', version: created.version })
    expect(ok.status).toBe(200)
    expect(ok.body).toMatchObject({ name: 'Second Name', role: 'quality', version: created.version + 1 })
    const stale = await admin.patch(`/api/admin/users/${created.id}`, { name: 'Third', version: created.version })
    expect(stale.status).toBe(409)
    expect(stale.body.message).toMatch(/someone else changed/i)
    const rows = await auditFor('User', created.id)
    const update = rows.find(r => r.action === 'update')!
    expect(update.before).toMatchObject({ name: 'First Name', role: 'technician' })
    expect(update.after).toMatchObject({ name: 'Second Name', role: 'quality' })
    expect(rows.filter(r => r.action === 'update')).toHaveLength(1)
  })

  it('resets a password: the old one stops working, the new one works', async () => {
    const admin = await signedIn('admin')
    const email = `${unique('r')}@bandlight.test`
    const u = (await admin.post('/api/admin/users', { email, name: 'Reset Me', role: 'technician', password: 'old-password-123' })).body
    expect((await admin.post(`/api/admin/users/${u.id}/password`, { password: 'short' })).status).toBe(400)
    expect((await admin.post(`/api/admin/users/${u.id}/password`, { password: 'new-password-456' })).status).toBe(200)
    const { Client } = await import('../support/http')
    expect((await new Client({ 'x-forwarded-for': '198.51.100.40' }).login(email, 'old-password-123')).status).toBe(401)
    expect((await new Client({ 'x-forwarded-for': '198.51.100.40' }).login(email, 'new-password-456')).status).toBe(200)
    expect((await auditFor('User', u.id)).map(r => r.action)).toContain('reset-password')
  })

  it('never deletes users: there is no DELETE route, and deactivated users stay listed', async () => {
    const admin = await signedIn('admin')
    const u = (await admin.post('/api/admin/users', { email: `${unique('d')}@bandlight.test`, name: 'Deactivate Me', role: 'technician', password: 'a-good-long-password' })).body
    expect((await admin.request('DELETE', `/api/admin/users/${u.id}`)).status).toBeGreaterThanOrEqual(404)
    expect((await admin.post(`/api/admin/users/${u.id}/active`, { active: false })).body.active).toBe(false)
    const list = (await admin.get('/api/admin/users')).body as { id: number, active: boolean }[]
    expect(list.find(x => x.id === u.id)?.active).toBe(false)
  })

  it('an admin cannot deactivate themselves or drop their own admin role', async () => {
    const admin = await signedIn('admin')
    const me = (await admin.get('/api/auth/me')).body
    expect((await admin.post(`/api/admin/users/${me.id}/active`, { active: false })).status).toBe(400)
    const full = (await admin.get('/api/admin/users')).body.find((u: { id: number }) => u.id === me.id)
    expect((await admin.patch(`/api/admin/users/${me.id}`, { role: 'technician', version: full.version })).status).toBe(400)
  })

  it('answers 404 for a user that does not exist', async () => {
    const admin = await signedIn('admin')
    expect((await admin.patch('/api/admin/users/987654', { name: 'x', version: 0 })).status).toBe(404)
  })
})

describe('organizations administration', () => {
  it('creates, edits and deactivates an organization, each with its audit row', async () => {
    const admin = await signedIn('admin')
    const name = `Invented Optics ${unique()}`
    const c = await admin.post('/api/admin/organizations', { name, contactEmails: ['Lab@Invented-Optics.example'] })
    expect(c.status).toBe(201)
    expect(c.body.contactEmails).toEqual(['lab@invented-optics.example'])
    const e = await admin.patch(`/api/admin/organizations/${c.body.id}`, { contactEmails: ['a@io.example', 'b@io.example'], version: c.body.version })
    expect(e.status).toBe(200)
    const d = await admin.patch(`/api/admin/organizations/${c.body.id}`, { active: false, version: e.body.version })
    expect(d.body.active).toBe(false)
    expect((await auditFor('Organization', c.body.id)).map(r => r.action).reverse()).toEqual(['create', 'update', 'deactivate'])
  })

  it('names the bad contact address', async () => {
    const admin = await signedIn('admin')
    const r = await admin.post('/api/admin/organizations', { name: `Bad ${unique()}`, contactEmails: ['ok@x.example', 'not-an-email'] })
    expect(r.status).toBe(400)
    expect(r.body.data.fields).toHaveProperty(['contactEmails[1]'])
  })

  it('answers 409 for a duplicate name', async () => {
    const admin = await signedIn('admin')
    const name = `Twice Made ${unique()}`
    expect((await admin.post('/api/admin/organizations', { name })).status).toBe(201)
    const r = await admin.post('/api/admin/organizations', { name })
    expect(r.status).toBe(409)
    expect(r.body.data.fields).toHaveProperty('name')
  })

  it('a customer user cannot be attached to a deactivated organization', async () => {
    const admin = await signedIn('admin')
    const o = (await admin.post('/api/admin/organizations', { name: `Closed ${unique()}` })).body
    await admin.patch(`/api/admin/organizations/${o.id}`, { active: false, version: o.version })
    const r = await admin.post('/api/admin/users', { email: `${unique('x')}@x.example`, name: 'X', role: 'customer', organizationId: o.id, password: 'a-good-long-password' })
    expect(r.status).toBe(400)
    expect(r.body.data.fields).toHaveProperty('organizationId')
  })
})

describe('audit trail', () => {
  it('records sign-ins and cannot be changed through any route', async () => {
    const admin = await signedIn('admin')
    const r = await admin.get('/api/admin/audit?action=sign-in&pageSize=5')
    expect(r.status).toBe(200)
    expect(r.body.rows.length).toBeGreaterThan(0)
    expect(r.body.rows.every((x: { action: string }) => x.action === 'sign-in')).toBe(true)
    const id = r.body.rows[0].id
    for (const method of ['POST', 'PATCH', 'PUT', 'DELETE']) {
      const res = await admin.request(method, `/api/admin/audit/${id}`, {})
      expect(res.status, method).toBeGreaterThanOrEqual(404)
      expect(res.status, method).toBeLessThan(500)
    }
  })

  it('filters by date and validates the filter', async () => {
    const admin = await signedIn('admin')
    const future = await admin.get(`/api/admin/audit?from=${encodeURIComponent('2999-01-01T00:00:00Z')}`)
    expect(future.body.total).toBe(0)
    const bad = await admin.get('/api/admin/audit?from=yesterday')
    expect(bad.status).toBe(400)
    expect(bad.body.data.fields).toHaveProperty('from')
  })
})
