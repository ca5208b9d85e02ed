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

// Each role probes from its own address, so the public routes' throttles (per address) do not
// spill over into the other test files.
const PROBE_ADDRESS: Record<string, string> = { admin: '203.0.113.1', technician: '203.0.113.2', quality: '203.0.113.3', customer: '203.0.113.4' }

describe('no route answers 500 to any input', () => {
  const garbage: unknown[] = ['"text"', '[]', 'null', '{"a":{"b":{"c":[1,2,{"d":null}]}}}', '{"email":1e400,"name":[],"role":{},"version":"x","active":"yes"}', '{"id":-1,"page":"NaN"}', '{']
  for (const role of ROLES) {
    it(`as ${role}, for every mutating route and every garbage body`, async () => {
      const c = await signedIn(role, { 'x-forwarded-for': PROBE_ADDRESS[role]! })
      for (const r of routes.filter(r => r.method !== 'GET')) {
        if (r.path === '/api/auth/logout' || r.path === '/api/auth/login') continue
        for (const body of garbage) {
          const res = await c.request(r.method, r.path, body)
          expect(res.status, `${role} ${r.method} ${r.path} with ${body}`).toBeGreaterThanOrEqual(400)
          expect(res.status, `${role} ${r.method} ${r.path} with ${body}`).toBeLessThan(500)
        }
        // A body of another kind than the route takes, and a NUL in a field.
        for (const [type, body] of [['application/x-www-form-urlencoded', 'a=1'], ['text/plain', '{}'], ['application/json', '{"name":"a\\u0000b","q":"x"}']] as const) {
          const res = await c.request(r.method, r.path, body, { 'content-type': type })
          expect(res.status, `${role} ${r.method} ${r.path} as ${type}`).toBeGreaterThanOrEqual(400)
          expect(res.status, `${role} ${r.method} ${r.path} as ${type}`).toBeLessThan(500)
        }
      }
    })
    it(`as ${role}, for every GET route with odd query strings and ids`, async () => {
      const c = await signedIn(role, { 'x-forwarded-for': PROBE_ADDRESS[role]! })
      for (const r of routes.filter(r => r.method === 'GET')) {
        for (const suffix of ['?page=0', '?page=abc&pageSize=99999', '?from=yesterday', '?entityId=-3', '?q=' + '%27'.repeat(50), '?q=%00', '?q=%25_%5C', '?id=1e999&page=-1']) {
          const res = await c.get(r.path + suffix)
          expect(res.status, `${role} GET ${r.path}${suffix}`).toBeLessThan(500)
        }
        const withBadId = r.path.replace('/1', '/0x1z')
        if (withBadId !== r.path) expect((await c.get(withBadId)).status, `${role} GET ${withBadId}`).toBeLessThan(500)
        if (withBadId !== r.path && role === 'admin') expect((await c.get(withBadId)).status).toBe(400)
      }
    })
  }
})
