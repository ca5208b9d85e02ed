// Hardening: body limits enforced while the body streams in, writes that queue instead of failing,
// sessions that end on the server, request forgery refused, sign-in throttling that cannot lock a
// lab out, searches with bound parameters, security headers, no null in calculation answers,
// certificates kept to the organization they were issued to, file names without bidi controls.
import http from 'node:http'
import { describe, expect, it } from 'vitest'
import { BASE_URL, Client, DEMO_ACCOUNTS, signedIn, unique } from '../support/http'
import { makeCustomer, makeInstrument, makeProcedure, makeRun, makeSource } from '../support/factories'

const url = new URL(BASE_URL)

/** Time /api/health while something else runs; returns the slowest answer in ms. */
async function healthWhile<T>(work: Promise<T>): Promise<{ result: T, slowestMs: number, samples: number }> {
  let done = false
  let slowest = 0
  let samples = 0
  const poll = (async () => {
    while (!done) {
      const t = performance.now()
      const r = await fetch(`${BASE_URL}/api/health`)
      expect(r.status).toBe(200)
      await r.arrayBuffer()
      slowest = Math.max(slowest, performance.now() - t)
      samples++
      await new Promise(r => setTimeout(r, 50))
    }
  })()
  let result: T
  try {
    result = await work
    // At least one health answer measured while the work was in flight or right after it.
    while (samples === 0) await new Promise(r => setTimeout(r, 10))
  }
  finally {
    done = true
    await poll
  }
  return { result, slowestMs: slowest, samples }
}

/**
 * Send a large body in 1 MiB chunks (declared with Content-Length, or chunked when `length` is
 * null) and stop as soon as the server answers. Returns the status and how long the answer took.
 */
function sendLarge(path: string, totalBytes: number, headers: Record<string, string>, declareLength: boolean): Promise<{ status: number, ms: number, sentBytes: number, body: string }> {
  return new Promise((resolve, reject) => {
    const started = performance.now()
    let sent = 0
    let answered = false
    const req = http.request({
      host: url.hostname,
      port: url.port,
      path,
      method: 'POST',
      headers: { ...headers, ...(declareLength ? { 'content-length': String(totalBytes) } : { 'transfer-encoding': 'chunked' }) },
    }, (res) => {
      answered = true
      const chunks: Buffer[] = []
      res.on('data', c => chunks.push(c))
      res.on('end', () => resolve({ status: res.statusCode ?? 0, ms: performance.now() - started, sentBytes: sent, body: Buffer.concat(chunks).toString('utf8') }))
      res.on('error', reject)
    })
    req.on('error', (err) => {
      if (!answered) reject(err)
    })
    const chunk = Buffer.alloc(1024 * 1024, 0x41)
    const pump = () => {
      while (!answered && sent < totalBytes) {
        sent += chunk.length
        if (!req.write(chunk)) {
          req.once('drain', pump)
          return
        }
      }
      if (!answered) req.end()
    }
    pump()
  })
}

describe('body limits (enforced before and while the body is read)', () => {
  it('a 120 MB anonymous multipart POST to /api/verify/file answers 413 within 2 s; /api/health keeps answering fast', async () => {
    const boundary = 'bandlight-test-boundary'
    const { result, slowestMs, samples } = await healthWhile(sendLarge('/api/verify/file', 120 * 1024 * 1024, { 'content-type': `multipart/form-data; boundary=${boundary}` }, true))
    expect(result.status).toBe(413)
    expect(result.ms).toBeLessThan(2000)
    expect(JSON.parse(result.body).message).toMatch(/larger than this route accepts/)
    expect(samples).toBeGreaterThan(0)
    expect(slowestMs).toBeLessThan(200)
  })

  it('a 200 MB chunked upload (no Content-Length) answers 413 within 2 s without being read in full', async () => {
    const tech = await signedIn('technician')
    const { result, slowestMs } = await healthWhile(sendLarge('/api/uploads', 200 * 1024 * 1024, { 'content-type': 'multipart/form-data; boundary=x', 'cookie': tech.cookieHeader() }, false))
    expect(result.status).toBe(413)
    expect(result.ms).toBeLessThan(2000)
    expect(result.sentBytes).toBeLessThan(200 * 1024 * 1024)
    expect(slowestMs).toBeLessThan(200)
    // The server is unaffected.
    expect((await tech.get('/api/auth/me')).status).toBe(200)
  })

  it('the open sign-in route takes at most 8 KiB; JSON routes 1 MiB', async () => {
    const big = await new Client().request('POST', '/api/auth/login', JSON.stringify({ email: 'a@b.test', password: 'x'.repeat(20_000) }))
    expect(big.status).toBe(413)
    const admin = await signedIn('admin')
    const huge = await admin.request('POST', '/api/admin/organizations', JSON.stringify({ name: 'x'.repeat(2 * 1024 * 1024) }))
    expect(huge.status).toBe(413)
  })
})

describe('concurrent writes queue instead of failing', () => {
  it('64 concurrent mixed writes (creations, patches, run points) all answer 2xx', async () => {
    const admin = await signedIn('admin')
    const tech = await signedIn('technician')
    const quality = await signedIn('quality')
    const org = await makeCustomer(admin)
    const patched = await Promise.all(Array.from({ length: 8 }, () => makeInstrument(tech, org.id)))
    const procedure = await makeProcedure(quality)
    const runs = await Promise.all(Array.from({ length: 4 }, async () => makeRun(tech, (await makeInstrument(tech, org.id)).id, procedure.currentVersion.id)))
    const plate = await makeSource(quality)
    const jobs: Promise<{ status: number, body: unknown }>[] = []
    for (let i = 0; i < 64; i++) {
      const kind = i % 3
      if (kind === 0) jobs.push(tech.post('/api/instruments', { ...(await instrumentBody(org.id)) }))
      else if (kind === 1) {
        const inst = patched[i % patched.length]!
        jobs.push((async () => {
          // Each patch reads the current version first; a lost race is a 409 (stale), never a 500.
          for (let attempt = 0; ; attempt++) {
            const cur = await tech.get(`/api/instruments/${inst.id}`)
            const r = await tech.patch(`/api/instruments/${inst.id}`, { notes: `patch ${i}`, version: cur.body.version })
            if (r.status !== 409 || attempt > 20) return r
          }
        })())
      }
      else {
        const run = runs[i % runs.length]!
        jobs.push(tech.post(`/api/runs/${run.id}/points`, { stage: 'as-found', sourceId: plate.id, setPointK: 373.15, sourceIndicatedK: 373.15, readingsK: [373.2, 373.3] }))
      }
    }
    const results = await Promise.all(jobs)
    const statuses = results.map(r => r.status)
    expect(statuses.filter(s => s >= 500)).toEqual([])
    expect(statuses.every(s => s >= 200 && s < 300), JSON.stringify(results.filter(r => r.status >= 300).slice(0, 3))).toBe(true)
  })
})

async function instrumentBody(organizationId: number) {
  return {
    organizationId, serial: unique('CW-'), maker: 'Ormsby Radiometrics', model: 'Spot 8', kind: 'spot-infrared',
    bandLambda1Um: 8, bandLambda2Um: 14, distanceToSpot: 12, rangeMinK: 243.15, rangeMaxK: 773.15,
    defaultEmissivity: 0.95, resolutionK: 0.1, accuracy: { kind: 'greaterOf', a: 1, b: 1 }, calibrationIntervalMonths: 12,
  }
}

describe('sessions end on the server', () => {
  async function newUser(admin: Client) {
    const email = `${unique('session')}@bandlight.test`
    const r = await admin.post('/api/admin/users', { email, name: 'Session Tester', role: 'technician', password: 'long-enough-password' })
    expect(r.status).toBe(201)
    const c = new Client()
    expect((await c.login(email, 'long-enough-password')).status).toBe(200)
    return { id: r.body.id as number, email, client: c }
  }

  it('the old cookie answers 401 after sign-out', async () => {
    const admin = await signedIn('admin')
    const { client } = await newUser(admin)
    const cookie = client.cookieHeader()
    expect((await Client.withCookies(cookie).get('/api/certificates')).status).toBe(200)
    expect((await client.post('/api/auth/logout')).status).toBe(200)
    expect((await Client.withCookies(cookie).get('/api/auth/me')).status).toBe(401)
    expect((await Client.withCookies(cookie).get('/api/certificates')).status).toBe(401)
    expect((await Client.withCookies(cookie).get('/api/_auth/session')).status).toBe(401)
  })

  it('the old cookie answers 401 after an administrator resets the password', async () => {
    const admin = await signedIn('admin')
    const { id, client } = await newUser(admin)
    const cookie = client.cookieHeader()
    expect((await admin.post(`/api/admin/users/${id}/password`, { password: 'another-long-password' })).status).toBe(200)
    expect((await Client.withCookies(cookie).get('/api/auth/me')).status).toBe(401)
  })

  it('a cookie from before a deactivation stays dead after reactivation', async () => {
    const admin = await signedIn('admin')
    const { id, email, client } = await newUser(admin)
    const cookie = client.cookieHeader()
    expect((await admin.post(`/api/admin/users/${id}/active`, { active: false })).status).toBe(200)
    expect((await admin.post(`/api/admin/users/${id}/active`, { active: true })).status).toBe(200)
    expect((await Client.withCookies(cookie).get('/api/auth/me')).status).toBe(401)
    expect((await new Client().login(email, 'long-enough-password')).status).toBe(200)
  })

  it('a change of role ends the sessions the user had', async () => {
    const admin = await signedIn('admin')
    const { id, client } = await newUser(admin)
    const cookie = client.cookieHeader()
    const cur = await admin.get('/api/admin/users')
    const version = (cur.body as { id: number, version: number }[]).find(u => u.id === id)!.version
    expect((await admin.patch(`/api/admin/users/${id}`, { role: 'quality', version })).status).toBe(200)
    expect((await Client.withCookies(cookie).get('/api/auth/me')).status).toBe(401)
  })
})

describe('request forgery', () => {
  it('a form-encoded POST is refused (415) and changes nothing', async () => {
    const admin = await signedIn('admin')
    const name = unique('Forged Org ')
    const r = await admin.request('POST', '/api/admin/organizations', `name=${encodeURIComponent(name)}`, { 'content-type': 'application/x-www-form-urlencoded' })
    expect(r.status).toBe(415)
    const plain = await admin.request('POST', '/api/admin/organizations', JSON.stringify({ name }), { 'content-type': 'text/plain' })
    expect(plain.status).toBe(415)
    const list = await admin.get('/api/admin/organizations')
    expect((list.body as { name: string }[]).some(o => o.name === name)).toBe(false)
  })

  it('a JSON POST with a foreign Origin (another port of the same host) is refused (403) and changes nothing', async () => {
    const admin = await signedIn('admin')
    const email = `${unique('forged')}@bandlight.test`
    const foreign = `${url.protocol}//${url.hostname}:${Number(url.port) + 1}`
    const r = await admin.request('POST', '/api/admin/users', { email, name: 'Forged Admin', role: 'admin', password: 'long-enough-password' }, { origin: foreign })
    expect(r.status).toBe(403)
    const site = await admin.request('POST', '/api/admin/users', { email, name: 'Forged Admin', role: 'admin', password: 'long-enough-password' }, { 'sec-fetch-site': 'same-site' })
    expect(site.status).toBe(403)
    const users = await admin.get('/api/admin/users')
    expect((users.body as { email: string }[]).some(u => u.email === email)).toBe(false)
    // The same request from this site's own origin is accepted.
    const own = await admin.request('POST', '/api/admin/organizations', { name: unique('Own Origin Org ') }, { 'origin': url.origin, 'sec-fetch-site': 'same-origin' })
    expect(own.status).toBe(201)
  })
})

describe('sign-in throttling cannot lock a lab out', () => {
  it('30 failed sign-ins with random e-mails from one address do not stop a correct sign-in of a known user from it', async () => {
    const address = '198.51.100.60'
    for (let i = 0; i < 30; i++) {
      const r = await new Client({ 'x-forwarded-for': address }).login(`${unique('spray')}@bandlight.test`, 'x')
      expect([401, 429]).toContain(r.status)
    }
    expect((await new Client({ 'x-forwarded-for': address }).login(DEMO_ACCOUNTS.technician)).status).toBe(200)
  })

  it('failed sign-ins and refused requests are audited with address and user agent', async () => {
    const email = `${unique('audited')}@bandlight.test`
    await new Client({ 'x-forwarded-for': '198.51.100.61', 'user-agent': 'forgery-probe/1.0' }).login(email, 'nope')
    const tech = new Client({ 'x-forwarded-for': '198.51.100.62', 'user-agent': 'curious-tech/2.0' })
    expect((await tech.login(DEMO_ACCOUNTS.technician)).status).toBe(200)
    expect((await tech.get('/api/admin/users')).status).toBe(403)
    const admin = await signedIn('admin')
    const failed = await admin.get('/api/admin/audit?action=sign-in-failed&pageSize=100')
    expect((failed.body.rows as { after: { email: string, address: string, userAgent: string } }[]).some(r => r.after?.email === email && r.after.address === '198.51.100.61' && r.after.userAgent === 'forgery-probe/1.0')).toBe(true)
    const refused = await admin.get('/api/admin/audit?action=refused&pageSize=100')
    expect((refused.body.rows as { after: { path: string, address: string, userAgent: string } }[]).some(r => r.after?.path === '/api/admin/users' && r.after.address === '198.51.100.62' && r.after.userAgent === 'curious-tech/2.0')).toBe(true)
  })
})

describe('searches take their text as data', () => {
  const SEARCHES = ['/api/instruments', '/api/customers', '/api/certificates', '/api/runs', '/api/sources', '/api/reference-instruments']
  it('%00 answers 400 naming q in every search and in /api/verify; % and _ match literally', async () => {
    const admin = await signedIn('admin')
    for (const path of SEARCHES) {
      const nul = await admin.get(`${path}?q=ab%00cd`)
      expect(nul.status, path).toBe(400)
      expect(nul.body.data.fields, path).toHaveProperty('q')
      for (const q of ['%25', '_', '%25%25', '%5C']) {
        const r = await admin.get(`${path}?q=${q}&pageSize=5`)
        expect(r.status, `${path}?q=${q}`).toBe(200)
        expect(r.body.total, `${path}?q=${q}`).toBe(0)
      }
    }
    const verify = await new Client({ 'x-forwarded-for': '198.51.100.70' }).get('/api/verify?number=BL%00&code=ABCD')
    expect(verify.status).toBe(400)
  })

  it('a serial with _ is found by itself, not by any character in its place', async () => {
    const tech = await signedIn('technician')
    const org = await makeCustomer(await signedIn('admin'))
    const tag = unique('US').toUpperCase()
    await makeInstrument(tech, org.id, { serial: `${tag}_9` })
    await makeInstrument(tech, org.id, { serial: `${tag}X9` })
    const found = await tech.get(`/api/instruments?q=${tag}_&pageSize=10`)
    expect(found.body.rows.map((r: { serial: string }) => r.serial)).toEqual([`${tag}_9`])
  })

  it('a NUL in a CSV import is refused with 400 naming the field', async () => {
    const admin = await signedIn('admin')
    const r = await admin.post('/api/customers/import', { csv: 'name,city\nNul\u0000Works,Town\n' })
    expect(r.status).toBe(400)
    expect(Object.keys(r.body.data.fields)).toContain('csv')
  })
})

describe('security headers', () => {
  it('pages carry a CSP with a nonce and without unsafe-eval; API answers cannot be framed or sniffed; no x-powered-by', async () => {
    const page = await fetch(`${BASE_URL}/login`)
    const csp = page.headers.get('content-security-policy') ?? ''
    const html = await page.text()
    expect(csp).toMatch(/script-src 'self' 'nonce-[A-Za-z0-9+/=]+'/)
    expect(csp).not.toMatch(/unsafe-eval/)
    expect(csp).toMatch(/frame-ancestors 'none'/)
    const nonce = /'nonce-([^']+)'/.exec(csp)![1]
    expect(html).toContain(`<script nonce="${nonce}"`)
    expect(page.headers.get('x-content-type-options')).toBe('nosniff')
    expect(page.headers.get('referrer-policy')).toBe('same-origin')
    expect(page.headers.get('x-powered-by')).toBe(null)
    const api = await fetch(`${BASE_URL}/api/health`)
    expect(api.headers.get('content-security-policy')).toMatch(/frame-ancestors 'none'/)
    expect(api.headers.get('x-content-type-options')).toBe('nosniff')
    expect(api.headers.get('x-powered-by')).toBe(null)
  })
})

describe('calculation answers never hold null', () => {
  it('an overflowing budget is a 400 naming the component; an overflowing band radiance names the temperature', async () => {
    const tech = await signedIn('technician')
    const budget = await tech.post('/api/calculations/budget', { components: [{ name: 'huge', standardUncertainty: 1e308, sensitivity: 10 }, { name: 'small', standardUncertainty: 0.1, sensitivity: 1 }] })
    expect(budget.status).toBe(400)
    expect(Object.keys(budget.body.data.fields)[0]).toMatch(/^components\[0\]\./)
    const radiance = await tech.post('/api/calculations/band-radiance', { band: { kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 }, temperatureK: 1e300 })
    expect(radiance.status).toBe(400)
    expect(radiance.body.data.fields).toHaveProperty('temperatureK')
  })
})

describe('uploads', () => {
  it('a file name loses its bidirectional-text controls', async () => {
    const tech = await signedIn('technician')
    const form = new FormData()
    form.set('purpose', 'responsivity')
    form.set('file', new Blob(['wavelengthUm,response\n8,0.1\n14,0.2\n'], { type: 'text/csv' }), 'curve\u202Evsc.exe')
    const res = await fetch(`${BASE_URL}/api/uploads`, { method: 'POST', headers: { cookie: tech.cookieHeader(), accept: 'application/json' }, body: form })
    expect(res.status).toBe(201)
    const body = await res.json() as { originalName: string }
    expect(body.originalName).toBe('curvevsc.exe')
  })
})
