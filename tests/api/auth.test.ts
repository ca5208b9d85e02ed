import { describe, expect, it } from 'vitest'
import { ROLES } from '../../shared/roles'
import { Client, DEMO_ACCOUNTS, signedIn, unique } from '../support/http'

describe('sign-in', () => {
  for (const role of ROLES) {
    it(`demo ${role} signs in, sees itself, signs out`, async () => {
      const c = new Client()
      const login = await c.login(DEMO_ACCOUNTS[role])
      expect(login.status).toBe(200)
      expect(login.body).toMatchObject({ email: DEMO_ACCOUNTS[role], role })
      expect(login.body).not.toHaveProperty('passwordHash')
      if (role === 'customer') expect(login.body.organizationId).toEqual(expect.any(Number))
      else expect(login.body.organizationId).toBeNull()

      const me = await c.get('/api/auth/me')
      expect(me.status).toBe(200)
      expect(me.body).toEqual(login.body)

      expect((await c.post('/api/auth/logout')).status).toBe(200)
      expect((await c.get('/api/auth/me')).status).toBe(401)
    })
  }

  it('answers 401 with one generic message for a wrong password and an unknown e-mail', async () => {
    const a = await new Client({ 'x-forwarded-for': '198.51.100.10' }).login(DEMO_ACCOUNTS.quality, 'not-the-password')
    const b = await new Client({ 'x-forwarded-for': '198.51.100.10' }).login(`${unique('nobody')}@bandlight.test`, 'whatever')
    expect(a.status).toBe(401)
    expect(b.status).toBe(401)
    expect(a.body.message).toBe(b.body.message)
    expect(a.body.message).not.toMatch(/unknown|exist|found/i)
  })

  it('answers 400 naming the fields for a bad body', async () => {
    const r = await new Client().request('POST', '/api/auth/login', { email: 'not-an-address' })
    expect(r.status).toBe(400)
    expect(Object.keys(r.body.data.fields).sort()).toEqual(['email', 'password'])
  })

  it('refuses a deactivated user, and ends the session they already had', async () => {
    const admin = await signedIn('admin')
    const email = `${unique('leaver')}@bandlight.test`
    const created = await admin.post('/api/admin/users', { email, name: 'Leaving Soon', role: 'technician', password: 'long-enough-password' })
    expect(created.status).toBe(201)
    const user = new Client()
    expect((await user.login(email, 'long-enough-password')).status).toBe(200)

    expect((await admin.post(`/api/admin/users/${created.body.id}/active`, { active: false })).status).toBe(200)
    expect((await user.get('/api/auth/me')).status).toBe(401)
    const again = await new Client({ 'x-forwarded-for': '198.51.100.11' }).login(email, 'long-enough-password')
    expect(again.status).toBe(401)
  })
})

describe('throttling of failed sign-ins', () => {
  it('after 5 failures for one e-mail from one address answers 429 with Retry-After there, even to the right password', async () => {
    const admin = await signedIn('admin')
    const email = `${unique('target')}@bandlight.test`
    expect((await admin.post('/api/admin/users', { email, name: 'Throttle Target', role: 'quality', password: 'correct-horse-battery' })).status).toBe(201)
    const c = new Client({ 'x-forwarded-for': '198.51.100.20' })
    for (let i = 0; i < 5; i++) expect((await c.login(email, `wrong-${i}`)).status).toBe(401)
    const blocked = await c.login(email, 'correct-horse-battery')
    expect(blocked.status).toBe(429)
    const retry = Number(blocked.headers.get('retry-after'))
    expect(retry).toBeGreaterThan(0)
    expect(retry).toBeLessThanOrEqual(15 * 60)
    // The owner elsewhere is not locked out by failures from one address.
    expect((await new Client({ 'x-forwarded-for': '198.51.100.21' }).login(email, 'correct-horse-battery')).status).toBe(200)
  })

  it('past 100 failures on unknown accounts from one address, further failures from it answer 429 while a known user still signs in', async () => {
    const c = new Client({ 'x-forwarded-for': '198.51.100.30' })
    for (let i = 0; i < 100; i++) expect((await c.login(`${unique('spray')}@bandlight.test`, 'x')).status).toBe(401)
    const r = await c.login(`${unique('spray')}@bandlight.test`, 'x')
    expect(r.status).toBe(429)
    expect(Number(r.headers.get('retry-after'))).toBeGreaterThan(0)
    expect((await c.login(DEMO_ACCOUNTS.technician)).status).toBe(200)
  })
})
