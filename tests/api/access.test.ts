// Access control for every route in server/api, enumerated from the files and checked against the
// route matrix (shared/routeAccess.ts) and the permission policy (shared/permissions.ts): for every
// route and every role the answer the policy says — 401 without a session, 403 for a role without
// the permission, and for a role with it neither of those. A handler that grants a role the policy
// does not, or refuses one it grants, fails here.
import { describe, expect, it } from 'vitest'
import { can } from '../../shared/permissions'
import { ROLES } from '../../shared/roles'
import { ROUTE_ACCESS, type RouteKey } from '../../shared/routeAccess'
import { Client, signedIn } from '../support/http'
import { apiRoutes } from '../support/routes'

const routes = apiRoutes()
const required = (key: string) => ROUTE_ACCESS[key as RouteKey] as string | undefined
const isOpen = (key: string) => required(key) === 'open'

describe('route matrix', () => {
  it('lists every route file, and every listed route has a file', () => {
    expect(routes.length).toBeGreaterThan(10)
    const missing = routes.filter(r => !required(r.key)).map(r => r.key)
    expect(missing, 'add these routes to shared/routeAccess.ts').toEqual([])
    const keys = new Set(routes.map(r => r.key))
    const stale = Object.keys(ROUTE_ACCESS).filter(k => !keys.has(k))
    expect(stale, 'these routes in shared/routeAccess.ts have no file').toEqual([])
  })
})

describe('anonymous callers', () => {
  const anon = new Client()
  for (const r of routes.filter(r => !isOpen(r.key))) {
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

describe('every role, every route: the answer the policy gives', () => {
  for (const role of ROLES) {
    it(`${role}: 403 exactly where the policy says so`, async () => {
      const c = await signedIn(role, { 'x-forwarded-for': `203.0.113.${10 + ROLES.indexOf(role)}` })
      for (const r of routes.filter(r => !isOpen(r.key))) {
        if (r.key === 'POST /api/auth/logout') continue
        const allowed = can(role, required(r.key) as Parameters<typeof can>[1])
        const res = await c.request(r.method, r.path, r.method === 'GET' ? undefined : {})
        if (allowed) {
          expect(res.status, `${role} ${r.method} ${r.path} (${required(r.key)}) must pass the role check`).not.toBe(401)
          expect(res.status, `${role} ${r.method} ${r.path} (${required(r.key)}) must pass the role check`).not.toBe(403)
        }
        else {
          expect(res.status, `${role} ${r.method} ${r.path} (${required(r.key)}) must be refused`).toBe(403)
        }
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
        if (r.key === 'POST /api/auth/logout' || r.key === 'POST /api/auth/login') continue
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
