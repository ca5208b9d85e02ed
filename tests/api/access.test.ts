// Access control for every route in server/api, enumerated from the files.
import { describe, expect, it } from 'vitest'
import { ROLES } from '../../shared/roles'
import { Client, signedIn } from '../support/http'
import { apiRoutes } from '../support/routes'

const OPEN = ['/api/auth/login', '/api/health', '/api/verify', '/api/verify/file', '/api/mail/unsubscribe']
const routes = apiRoutes()

describe('route enumeration', () => {
  it('finds the routes, and every route calls requireRole unless it is open', () => {
    expect(routes.length).toBeGreaterThan(10)
    for (const r of routes) {
      if (OPEN.includes(r.path)) continue
      expect(r.checksRole, `${r.file} must call requireRole(event, …) first`).toBe(true)
    }
  })
})

describe('anonymous callers', () => {
  const anon = new Client()
  for (const r of routes.filter(r => !OPEN.includes(r.path))) {
    it(`${r.method} ${r.path} → 401`, async () => {
      const res = await anon.request(r.method, r.path, r.method === 'GET' ? undefined : {})
      expect(res.status).toBe(401)
    })
  }
  it('GET /api/health is open and runs a real query', async () => {
    const res = await anon.get('/api/health')
    expect(res.status).toBe(200)
    expect(res.body).toEqual({ status: 'ok', db: 'ok' })
  })
})

describe('wrong roles', () => {
  for (const role of ROLES) {
    const forbidden = routes.filter(r => r.roles.length > 0 && !r.roles.includes(role))
    if (!forbidden.length) continue
    it(`${role} gets 403 on ${forbidden.length} routes`, async () => {
      const c = await signedIn(role)
      for (const r of forbidden) {
        const res = await c.request(r.method, r.path, r.method === 'GET' ? undefined : {})
        expect(res.status, `${role} ${r.method} ${r.path}`).toBe(403)
      }
    })
  }
})

describe('no route answers 500 to any input', () => {
  const garbage: unknown[] = ['"text"', '[]', 'null', '{"a":{"b":{"c":[1,2,{"d":null}]}}}', '{"email":1e400,"name":[],"role":{},"version":"x","active":"yes"}', '{"id":-1,"page":"NaN"}', '{']
  it('as admin, for every mutating route and every garbage body', async () => {
    const admin = await signedIn('admin')
    for (const r of routes.filter(r => r.method !== 'GET')) {
      if (r.path === '/api/auth/logout' || r.path === '/api/auth/login') continue
      for (const body of garbage) {
        const res = await admin.request(r.method, r.path, body)
        expect(res.status, `${r.method} ${r.path} with ${body}`).toBeGreaterThanOrEqual(400)
        expect(res.status, `${r.method} ${r.path} with ${body}`).toBeLessThan(500)
      }
    }
  })
  it('as admin, for every GET route with odd query strings and ids', async () => {
    const admin = await signedIn('admin')
    for (const r of routes.filter(r => r.method === 'GET')) {
      for (const suffix of ['?page=0', '?page=abc&pageSize=99999', '?from=yesterday', '?entityId=-3', '?q=' + '%27'.repeat(50)]) {
        const res = await admin.get(r.path + suffix)
        expect(res.status, `GET ${r.path}${suffix}`).toBeLessThan(500)
      }
      const withBadId = r.path.replace('/1', '/0x1z')
      if (withBadId !== r.path) expect((await admin.get(withBadId)).status).toBe(400)
    }
  })
})
