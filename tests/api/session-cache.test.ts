// The signed-in user is cached per session for a short time (issue 17), but every request checks a
// change counter that revocations and user changes move in their own transaction: a revocation
// still takes effect on the very next request. Each test first makes several requests, so that the
// user is in the cache when the change happens.
import { describe, expect, it } from 'vitest'
import { Client, signedIn, unique } from '../support/http'

const PASSWORD = 'a-good-long-password'

async function newUser(role: 'technician' | 'quality' = 'technician'): Promise<{ id: number, version: number, email: string }> {
  const admin = await signedIn('admin')
  const email = `${unique('sc')}@bandlight.test`
  const r = await admin.post('/api/admin/users', { email, name: 'Cached Person', role, password: PASSWORD })
  expect(r.status).toBe(201)
  return { id: r.body.id, version: r.body.version, email }
}

async function session(email: string, address: string): Promise<Client> {
  const c = new Client({ 'x-forwarded-for': address })
  expect((await c.login(email, PASSWORD)).status).toBe(200)
  for (let i = 0; i < 3; i++) expect((await c.get('/api/instruments?pageSize=1')).status).toBe(200)
  return c
}

describe('the per-session user cache', () => {
  it('a deactivation refuses the user\'s cached sessions on their next request', async () => {
    const u = await newUser()
    const a = await session(u.email, '198.51.100.171')
    const b = await session(u.email, '198.51.100.172')
    expect((await (await signedIn('admin')).post(`/api/admin/users/${u.id}/active`, { active: false })).status).toBe(200)
    expect((await a.get('/api/instruments?pageSize=1')).status).toBe(401)
    expect((await b.get('/api/auth/me')).status).toBe(401)
  })

  it('a password reset ends every session at once', async () => {
    const u = await newUser()
    const a = await session(u.email, '198.51.100.173')
    expect((await (await signedIn('admin')).post(`/api/admin/users/${u.id}/password`, { password: 'another-long-password' })).status).toBe(200)
    expect((await a.get('/api/instruments?pageSize=1')).status).toBe(401)
  })

  it('a new role ends the sessions; a new name shows on the next request', async () => {
    const admin = await signedIn('admin')
    const u = await newUser('quality')
    const a = await session(u.email, '198.51.100.174')
    expect((await a.get('/api/auth/me')).body).toMatchObject({ name: 'Cached Person', role: 'quality' })
    const renamed = await admin.patch(`/api/admin/users/${u.id}`, { name: 'Renamed Person', version: u.version })
    expect(renamed.status).toBe(200)
    expect((await a.get('/api/auth/me')).body).toMatchObject({ name: 'Renamed Person', role: 'quality' })
    expect((await admin.patch(`/api/admin/users/${u.id}`, { role: 'technician', version: renamed.body.version })).status).toBe(200)
    expect((await a.get('/api/auth/me')).status).toBe(401)
  })

  it('signing out ends that session only: its cookie replayed is refused, the user\'s other session goes on', async () => {
    const u = await newUser()
    const a = await session(u.email, '198.51.100.175')
    const b = await session(u.email, '198.51.100.176')
    const old = a.cookieHeader()
    expect((await a.post('/api/auth/logout')).status).toBeLessThan(300)
    expect((await Client.withCookies(old).get('/api/instruments?pageSize=1')).status).toBe(401)
    expect((await b.get('/api/instruments?pageSize=1')).status).toBe(200)
  })
})
