// Two server instances on one PostgreSQL database (scripts/test-cluster.ts starts them, with one
// mail server): what one instance does, the other sees, and what must happen once happens once.
// Organizations, people and instruments are invented.
import crypto from 'node:crypto'
import fs from 'node:fs'
import path from 'node:path'
import { beforeAll, describe, expect, it } from 'vitest'
import { addDays, labLocalDate } from '../../shared/mail/milestones'
import type { StoredMessage } from '../../scripts/lib/mailSink'
import type { OutboxMessageDTO } from '../../shared/types'
import { GOOD_RECEIPT, makeCustomer, makeInstrument, makeSource } from '../support/factories'
import { Client, DEMO_PASSWORD, signedIn, unique } from '../support/http'

const URLS = (process.env.BANDLIGHT_TEST_URLS ?? '').split(',').filter(Boolean)
const [A, B] = URLS as [string, string]
const MAILBOX = process.env.BANDLIGHT_MAILBOX_DIR ?? ''

/** The same session against each instance: [on A, on B]. */
async function both(role: Parameters<typeof signedIn>[0]): Promise<[Client, Client]> {
  const c = await signedIn(role)
  return [c.at(A), c.at(B)]
}

function received(): StoredMessage[] {
  if (!fs.existsSync(MAILBOX)) return []
  return fs.readdirSync(MAILBOX).filter(f => f.endsWith('.json')).map(f => JSON.parse(fs.readFileSync(path.join(MAILBOX, f), 'utf8')) as StoredMessage)
}

async function waitFor<T>(fn: () => Promise<T | undefined> | T | undefined, ms = 20_000): Promise<T> {
  const deadline = Date.now() + ms
  for (;;) {
    const v = await fn()
    if (v !== undefined) return v
    if (Date.now() > deadline) throw new Error('timed out waiting')
    await new Promise(r => setTimeout(r, 200))
  }
}

const sha256 = (b: Uint8Array) => crypto.createHash('sha256').update(b).digest('hex')

beforeAll(() => {
  expect(URLS, 'scripts/test-cluster.ts gives two instances').toHaveLength(2)
  expect(A).not.toBe(B)
  expect(MAILBOX, 'scripts/test-cluster.ts starts a mail server').toBeTruthy()
})

describe('two instances on one PostgreSQL', () => {
  it('16 certificates issued at once through both instances get consecutive numbers with no gap; each PDF downloads from the other instance', async () => {
    const [techA, techB] = await both('technician')
    const [qualityA, qualityB] = await both('quality')
    const org = await makeCustomer(techA)
    const instrument = await makeInstrument(techA, org.id)
    const plate = await makeSource(qualityA)
    const p = await qualityA.post('/api/procedures', {
      name: unique('Cluster procedure '), documentReference: 'CP-CLUSTER-1', decisionRule: 'simple-acceptance',
      template: [{ name: 'Reference', type: 'B', distribution: 'normal', value: 0.05, coverageFactor: 2, unit: 'K', input: 'sourceTemperature' }],
      cmc: [{ minK: 250, maxK: 450, expandedUncertaintyK: 0.4 }],
      applicability: { sourceKinds: ['flat-plate'], bandMinUm: 7, bandMaxUm: 15, minK: 250, maxK: 450 },
    })
    expect(p.status, JSON.stringify(p.body)).toBe(201)
    // Runs made alternately on each instance, then submitted and approved.
    const runs = await Promise.all(Array.from({ length: 16 }, async (_, i) => {
      const tech = i % 2 ? techB : techA
      const quality = i % 2 ? qualityA : qualityB
      const r = await tech.post('/api/runs', {
        instrumentId: instrument.id, procedureVersionId: p.body.currentVersion.id, calibrationDate: '2026-11-25',
        ambientTemperatureK: 296.15, relativeHumidityPct: 40, distanceMm: 300, emissivitySetting: 0.95, reflectedTemperatureK: 296.15, instrumentTemperatureK: 296.15,
      })
      expect(r.status, JSON.stringify(r.body)).toBe(201)
      expect((await tech.post(`/api/runs/${r.body.id}/receipt`, GOOD_RECEIPT)).status).toBe(200)
      for (const setPointK of [273.15, 373.15]) {
        const pt = await tech.post(`/api/runs/${r.body.id}/points`, { sourceId: plate.id, setPointK, sourceIndicatedK: setPointK, readingsK: [setPointK - 0.2, setPointK - 0.1] })
        expect(pt.status, JSON.stringify(pt.body)).toBe(201)
      }
      const s = await tech.post(`/api/runs/${r.body.id}/submit`, { version: (await tech.get(`/api/runs/${r.body.id}`)).body.version })
      expect(s.status, JSON.stringify(s.body)).toBe(200)
      const a = await quality.post(`/api/runs/${r.body.id}/approve`, { version: s.body.version })
      expect(a.status, JSON.stringify(a.body)).toBe(200)
      return r.body.id as number
    }))
    const sequenceOf = (number: string) => Number(/-(\d+)$/.exec(number)![1])
    const before = (await qualityA.get('/api/certificates?pageSize=1')).body.rows[0]
    const replies = await Promise.all(runs.map((runId, i) => (i % 2 ? qualityB : qualityA).post('/api/certificates', { runId, password: DEMO_PASSWORD, signatoryFunction: 'Quality manager' })))
    for (const r of replies) expect(r.status, JSON.stringify(r.body)).toBe(201)
    const seqs = replies.map(r => sequenceOf(r.body.number)).sort((x, y) => x - y)
    expect(new Set(seqs).size).toBe(16)
    expect(seqs[0]).toBe(before ? sequenceOf(before.baseNumber) + 1 : 1)
    expect(seqs[15]! - seqs[0]!).toBe(15)

    // Each PDF was stored by the instance that issued it and is read back by the other one.
    for (const [i, r] of replies.entries()) {
      const other = i % 2 ? qualityA : qualityB
      const res = await fetch(`${i % 2 ? A : B}/api/certificates/${r.body.id}/pdf`, { headers: { cookie: other.cookieHeader() } })
      expect(res.status).toBe(200)
      expect(sha256(new Uint8Array(await res.arrayBuffer()))).toBe(r.body.pdfSha256)
    }
  })

  it('a Monte Carlo job started on one instance is polled to completion on the other', async () => {
    const [techA, techB] = await both('technician')
    const band = { kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 }
    const start = await techA.post('/api/calculations/monte-carlo/jobs', {
      band,
      inputs: {
        sourceTemperatureK: { distribution: 'normal', value: 373.15, standardUncertainty: 0.1 },
        sourceEmissivity: { distribution: 'rectangular', value: 0.95, halfWidth: 0.01 },
        reflectedTemperatureK: { distribution: 'constant', value: 296 },
        instrumentTemperatureK: { distribution: 'constant', value: 296 },
        emissivitySetting: { distribution: 'constant', value: 0.95 },
      },
      trials: 1_000_000,
    })
    expect(start.status, JSON.stringify(start.body)).toBe(202)
    // Another user asking on the other instance does not see it.
    expect((await (await signedIn('quality')).at(B).get(`/api/calculations/monte-carlo/jobs/${start.body.id}`)).status).toBe(404)
    let last = start.body
    const seen = new Set<number>()
    for (let i = 0; i < 400 && last.status === 'running'; i++) {
      await new Promise(r => setTimeout(r, 50))
      const r = await techB.get(`/api/calculations/monte-carlo/jobs/${start.body.id}`)
      expect(r.status).toBe(200)
      last = r.body
      seen.add(last.done)
    }
    expect(last.status, JSON.stringify(last.error)).toBe('done')
    expect(last.result.trials).toBe(1_000_000)
    expect(last.done).toBe(1_000_000)
    // Progress was visible from the other instance while the job ran (at least one value besides the end).
    expect(seen.size).toBeGreaterThan(1)
  })

  it('the reminder job run by both instances at once sends each message once', async () => {
    const [adminA, adminB] = await both('admin')
    const [techA] = await both('technician')
    const today = labLocalDate(new Date(), 'Europe/London')
    const org = (await techA.post('/api/customers', { name: `Cinderbank Works ${unique()}`, addressLines: '9 Flue Lane', city: 'Ashcombe', postcode: 'AC1 1AA', country: 'United Kingdom' })).body
    const tag = unique('CL').toLowerCase()
    const contact = (await techA.post(`/api/customers/${org.id}/contacts`, { name: 'Wren Hallam', email: `wren.${tag}@cinderbank.example` })).body
    expect(contact.email).toBeTruthy()
    const inst = await techA.post('/api/instruments', {
      organizationId: org.id, serial: `${tag.toUpperCase()}-1`, maker: 'Quillfield Sensing', model: 'QS-12', kind: 'spot-infrared',
      bandLambda1Um: 8, bandLambda2Um: 14, distanceToSpot: 12, rangeMinK: 243.15, rangeMaxK: 773.15,
      defaultEmissivity: 0.95, resolutionK: 0.1, accuracy: { kind: 'greaterOf', a: 1, b: 1 }, calibrationIntervalMonths: 12, nextDueDate: addDays(today, 5),
    })
    expect(inst.status, JSON.stringify(inst.body)).toBe(201)

    const [ra, rb] = await Promise.all([adminA.post('/api/admin/mail/reminders/run', {}), adminB.post('/api/admin/mail/reminders/run', {})])
    expect(ra.status, JSON.stringify(ra.body)).toBe(200)
    expect(rb.status, JSON.stringify(rb.body)).toBe(200)
    // One run did the work; the other waited for the lease and found everything logged. (Both find
    // nothing new when the hourly schedule of either instance got there first.)
    expect(Math.min(ra.body.queued, rb.body.queued)).toBe(0)
    const outbox = (await adminB.get(`/api/admin/mail/outbox?kind=reminder&pageSize=100`)).body.rows as OutboxMessageDTO[]
    expect(outbox.filter(m => m.recipients.includes(contact.email))).toHaveLength(1)

    const mine = await waitFor(() => {
      const m = received().filter(x => x.to.includes(contact.email))
      return m.length ? m : undefined
    })
    // Both instances deliver the outbox: give them time to send a second copy, if they were going to.
    await new Promise(r => setTimeout(r, 2500))
    expect(received().filter(x => x.to.includes(contact.email))).toHaveLength(mine.length)
    expect(mine).toHaveLength(1)
    expect(mine[0]!.text).toContain(`${tag.toUpperCase()}-1`)
    // And no message at all, the demo laboratory's included, arrived twice.
    const keys = received().map(m => `${m.to.join(',')}\n${m.subject}\n${m.text}`)
    expect(new Set(keys).size).toBe(keys.length)
  })

  it('sign-in throttling counts failures made on both instances', async () => {
    const admin = await signedIn('admin')
    const email = `${unique('cluster-target')}@bandlight.test`
    expect((await admin.post('/api/admin/users', { email, name: 'Cluster Target', role: 'quality', password: 'correct-horse-battery' })).status).toBe(201)
    const headers = { 'x-forwarded-for': '198.51.100.77' }
    const onA = new Client(headers, A)
    const onB = new Client(headers, B)
    // Five failures, split 3 + 2 between the instances: either instance alone saw fewer than the limit (5).
    for (let i = 0; i < 3; i++) expect((await onA.login(email, `wrong-a${i}`)).status).toBe(401)
    for (let i = 0; i < 2; i++) expect((await onB.login(email, `wrong-b${i}`)).status).toBe(401)
    const blockedA = await onA.login(email, 'correct-horse-battery')
    const blockedB = await onB.login(email, 'correct-horse-battery')
    expect(blockedA.status).toBe(429)
    expect(blockedB.status).toBe(429)
    expect(Number(blockedB.headers.get('retry-after'))).toBeGreaterThan(0)
    // The owner from another address signs in on either instance.
    expect((await new Client({ 'x-forwarded-for': '198.51.100.78' }, B).login(email, 'correct-horse-battery')).status).toBe(200)
  })

  it('a file uploaded through one instance is downloaded through the other', async () => {
    const [qualityA, qualityB] = await both('quality')
    const bytes = new TextEncoder().encode(`%PDF-1.4\n% invented equipment certificate ${unique()}\n1 0 obj << >> endobj\ntrailer << >>\n%%EOF\n`)
    const form = new FormData()
    form.set('purpose', 'equipment-certificate')
    form.set('file', new Blob([bytes], { type: 'application/pdf' }), 'cluster-cert.pdf')
    const up = await fetch(`${A}/api/uploads`, { method: 'POST', headers: { cookie: qualityA.cookieHeader(), accept: 'application/json' }, body: form })
    expect(up.status).toBe(201)
    const row = await up.json() as { id: number }
    const down = await fetch(`${B}/api/uploads/${row.id}`, { headers: { cookie: qualityB.cookieHeader() } })
    expect(down.status).toBe(200)
    expect(down.headers.get('content-type')).toBe('application/pdf')
    expect(sha256(new Uint8Array(await down.arrayBuffer()))).toBe(sha256(bytes))
  })

  it('a list total cached on one instance follows writes made through the other; a user read on one is refused there at once after a revocation on the other', async () => {
    const [techA, techB] = await both('technician')
    const org = await makeCustomer(await signedIn('admin'))
    const total = async () => (await techA.get(`/api/instruments?organizationId=${org.id}&pageSize=1`)).body.total as number
    expect(await total()).toBe(0)
    expect(await total()).toBe(0)
    const made = await makeInstrument(techB, org.id)
    expect(await total()).toBe(1)
    expect((await techB.post(`/api/instruments/${made.id}/archive`, { archived: true, version: made.version })).status).toBe(200)
    expect(await total()).toBe(0)

    const adminB = (await both('admin'))[1]
    const email = `${unique('cl')}@bandlight.test`
    const user = await adminB.post('/api/admin/users', { email, name: 'Cluster Cached', role: 'technician', password: 'a-good-long-password' })
    expect(user.status).toBe(201)
    const onA = new Client({ 'x-forwarded-for': '198.51.100.79' }, A)
    expect((await onA.login(email, 'a-good-long-password')).status).toBe(200)
    for (let i = 0; i < 3; i++) expect((await onA.get('/api/auth/me')).status).toBe(200)
    expect((await adminB.post(`/api/admin/users/${user.body.id}/active`, { active: false })).status).toBe(200)
    expect((await onA.get('/api/auth/me')).status).toBe(401)
  })
})
