// Customers' instruments: organization scoping, validation of bands and accuracy, locking,
// archive, paging and search, past-due flag, responsivity tables, CSV import and export.
// Instruments, makers and serials are invented.
import { describe, expect, it } from 'vitest'
import { signedIn, unique } from '../support/http'
import { makeCustomer, organizationOf } from '../support/factories'

/** `own`: the demo customer account's organization; `other`: an organization made here. */
async function orgIds(): Promise<{ own: number, other: number, otherName: string }> {
  const other = await makeCustomer(await signedIn('admin'))
  return { own: await organizationOf(await signedIn('customer')), other: other.id, otherName: other.name as string }
}

function instrument(organizationId: number, serial: string, extra: Record<string, unknown> = {}) {
  return {
    organizationId, serial, maker: 'Ormsby Radiometrics', model: 'Spot 8', kind: 'spot-infrared',
    bandLambda1Um: 8, bandLambda2Um: 14, distanceToSpot: 12, rangeMinK: 243.15, rangeMaxK: 773.15,
    defaultEmissivity: 0.95, resolutionK: 0.1, accuracy: { kind: 'greaterOf', a: 1, b: 1 }, calibrationIntervalMonths: 12,
    nextDueDate: '2099-06-01', ...extra,
  }
}

describe('instruments', () => {
  it('a customer sees only its own organization\'s instruments, read-only, without audit rows', async () => {
    const { own, other, otherName } = await orgIds()
    const tech = await signedIn('technician')
    const customer = await signedIn('customer')
    const mine = (await tech.post('/api/instruments', instrument(own, unique('MINE-')))).body
    const theirs = (await tech.post('/api/instruments', instrument(other, unique('THEIRS-')))).body
    const list = await customer.get('/api/instruments?pageSize=500')
    expect(list.status).toBe(200)
    expect(list.body.total).toBeGreaterThan(0)
    expect(list.body.rows.every((r: { organizationId: number }) => r.organizationId === own)).toBe(true)
    const asked = await customer.get(`/api/instruments?organizationId=${other}&pageSize=500`)
    expect(asked.body.rows.every((r: { organizationId: number }) => r.organizationId === own)).toBe(true)
    expect((await customer.get(`/api/instruments/${theirs.id}`)).status).toBe(404)
    const d = await customer.get(`/api/instruments/${mine.id}`)
    expect(d.status).toBe(200)
    expect(d.body).not.toHaveProperty('audit')
    expect((await customer.patch(`/api/instruments/${mine.id}`, { serial: 'x', version: 0 })).status).toBe(403)
    expect((await customer.post(`/api/instruments/${mine.id}/archive`, { archived: true, version: 0 })).status).toBe(403)
    expect((await customer.get('/api/instruments/export')).status).toBe(403)
    expect((await customer.post('/api/instruments', instrument(own, unique('C-')))).status).toBe(403)
    const lab = await tech.get(`/api/instruments/${theirs.id}`)
    expect(lab.body.audit.map((a: { action: string }) => a.action)).toEqual(['create'])
    expect(lab.body.organizationName).toBe(otherName)
  })

  it('needs a band or a responsivity table, not both, and a valid accuracy specification', async () => {
    const { own } = await orgIds()
    const tech = await signedIn('technician')
    const none = await tech.post('/api/instruments', instrument(own, unique('B-'), { bandLambda1Um: null, bandLambda2Um: null }))
    expect(none.status).toBe(400)
    expect(none.body.data.fields).toHaveProperty('bandLambda1Um')
    const reversed = await tech.post('/api/instruments', instrument(own, unique('B-'), { bandLambda1Um: 14, bandLambda2Um: 8 }))
    expect(reversed.body.data.fields).toHaveProperty('bandLambda2Um')
    const both = await tech.post('/api/instruments', instrument(own, unique('B-'), { spectralResponseId: 1 }))
    expect(both.body.data.fields).toHaveProperty('spectralResponseId')
    const acc = await tech.post('/api/instruments', instrument(own, unique('B-'), { accuracy: { kind: 'greaterOf', a: 1 } }))
    expect(acc.status).toBe(400)
    expect(acc.body.data.fields).toHaveProperty('accuracy.b')
    const accKind = await tech.post('/api/instruments', instrument(own, unique('B-'), { accuracy: { kind: 'vibes' } }))
    expect(Object.keys(accKind.body.data.fields).some(f => f.startsWith('accuracy'))).toBe(true)
    const eps = await tech.post('/api/instruments', instrument(own, unique('B-'), { defaultEmissivity: 0 }))
    expect(eps.body.data.fields).toHaveProperty('defaultEmissivity')
    const org = await tech.post('/api/instruments', instrument(987654, unique('B-')))
    expect(org.status).toBe(400)
    expect(org.body.data.fields).toHaveProperty('organizationId')
    const sr = await tech.post('/api/instruments', instrument(own, unique('B-'), { bandLambda1Um: null, bandLambda2Um: null, spectralResponseId: 987654 }))
    expect(sr.body.data.fields).toHaveProperty('spectralResponseId')
    const serial = unique('DUP-')
    expect((await tech.post('/api/instruments', instrument(own, serial))).status).toBe(201)
    expect((await tech.post('/api/instruments', instrument(own, serial.toLowerCase()))).status).toBe(409)
  })

  it('updates with optimistic locking, re-checks the merged record, archives instead of deleting', async () => {
    const { own } = await orgIds()
    const tech = await signedIn('technician')
    const serial = unique('UPD-')
    const c = (await tech.post('/api/instruments', instrument(own, serial))).body
    const u = await tech.patch(`/api/instruments/${c.id}`, { status: 'out-of-service', version: c.version })
    expect(u.status).toBe(200)
    expect(u.body).toMatchObject({ status: 'out-of-service', version: c.version + 1 })
    expect((await tech.patch(`/api/instruments/${c.id}`, { status: 'active', version: c.version })).status).toBe(409)
    const merged = await tech.patch(`/api/instruments/${c.id}`, { rangeMaxK: 200, version: u.body.version })
    expect(merged.body.data.fields).toHaveProperty('rangeMaxK')
    expect((await tech.request('DELETE', `/api/instruments/${c.id}`)).status).toBeGreaterThanOrEqual(404)
    const a = await tech.post(`/api/instruments/${c.id}/archive`, { archived: true, version: u.body.version })
    expect(a.body.archived).toBe(true)
    expect((await tech.get(`/api/instruments?q=${serial}`)).body.total).toBe(0)
    expect((await tech.get(`/api/instruments?q=${serial}&archived=all`)).body.total).toBe(1)
    const audit = (await tech.get(`/api/instruments/${c.id}`)).body.audit
    expect(audit.map((x: { action: string }) => x.action)).toEqual(['create', 'update', 'archive'])
    expect(audit[1].before).toMatchObject({ status: 'active' })
  })

  it('pages, sorts, filters and searches by serial; flags past-due instruments', async () => {
    const { own, other } = await orgIds()
    const tech = await signedIn('technician')
    const prefix = unique('PG')
    for (let i = 0; i < 6; i++) {
      await tech.post('/api/instruments', instrument(i < 4 ? own : other, `${prefix}-${i}`, { nextDueDate: i === 0 ? '2020-01-01' : '2099-01-01', status: i === 5 ? 'retired' : 'active' }))
    }
    const p1 = (await tech.get(`/api/instruments?q=${prefix.toLowerCase()}&pageSize=4&sort=serial&dir=desc`)).body
    expect(p1).toMatchObject({ total: 6, page: 1, pageSize: 4 })
    expect(p1.rows.map((r: { serial: string }) => r.serial)).toEqual([5, 4, 3, 2].map(i => `${prefix}-${i}`))
    const p2 = (await tech.get(`/api/instruments?q=${prefix}&pageSize=4&page=2&sort=serial`)).body
    expect(p2.rows.map((r: { serial: string }) => r.serial)).toEqual([`${prefix}-4`, `${prefix}-5`])
    expect((await tech.get(`/api/instruments?q=${prefix}&organizationId=${other}&status=retired`)).body.total).toBe(1)
    const due = (await tech.get(`/api/instruments?q=${prefix}&dueBefore=2026-01-01`)).body.rows
    expect(due).toHaveLength(1)
    expect(due[0]).toMatchObject({ serial: `${prefix}-0`, pastDue: true })
    expect((await tech.get(`/api/instruments?q=${prefix}-1`)).body.rows[0].pastDue).toBe(false)
    // the search finds any part of a serial (issue 17; it used to find the beginning only)
    expect((await tech.get(`/api/instruments?q=${prefix.slice(3)}`)).body.total).toBe(6)
    // % and _ are matched literally
    expect((await tech.get(`/api/instruments?q=${encodeURIComponent(prefix.slice(0, 3) + '%')}`)).body.total).toBe(0)
    expect((await tech.get('/api/instruments?sort=secret')).status).toBe(400)
    expect((await tech.get('/api/instruments?pageSize=501')).status).toBe(400)
    expect((await tech.get('/api/instruments?status=broken')).body.data.fields).toHaveProperty('status')
  })

  it('a list row holds the same values as the instrument\'s own record, on either database', async () => {
    // The list reads its page as one JSON array from the database; the detail reads the model. Both must agree to the byte.
    const { own } = await orgIds()
    const tech = await signedIn('technician')
    const serial = unique('ROW-')
    const made = (await tech.post('/api/instruments', instrument(own, serial, {
      assetTag: unique('TAG-'), notes: 'Lens cap "B" & strap — kept with the item', defaultEmissivity: 0.97, resolutionK: 0.01,
      accuracy: { kind: 'greaterOf', a: 1.5, b: 0.75 }, nextDueDate: '2001-02-03',
    }))).body
    const list = await tech.get(`/api/instruments?q=${encodeURIComponent(serial)}`)
    expect(list.status).toBe(200)
    expect(list.body.total).toBe(1)
    const row = list.body.rows[0]
    const detail = (await tech.get(`/api/instruments/${made.id}`)).body
    for (const [key, value] of Object.entries(row)) expect([key, value]).toEqual([key, detail[key]])
    expect(row).toMatchObject({ serial, archived: false, pastDue: true, defaultEmissivity: 0.97, accuracy: { kind: 'greaterOf', a: 1.5, b: 0.75 } })
    expect(row.createdAt).toMatch(/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d\.\d{3}Z$/)
  })

  it('the demo has about forty instruments across the three customers and the common bands', async () => {
    const tech = await signedIn('technician')
    const all = (await tech.get('/api/instruments?pageSize=500&archived=all&q=')).body.rows as { assetTag: string | null, bandLambda1Um: number | null, spectralResponseId: number | null, organizationName: string }[]
    const demo = all.filter(r => /^(KF|PG|BF)-IR-/.test(r.assetTag ?? ''))
    expect(demo.length).toBeGreaterThanOrEqual(35)
    expect(new Set(demo.map(r => r.organizationName)).size).toBe(3)
    const bands = new Set(demo.map(r => r.bandLambda1Um))
    for (const b of [8, 3.8, 2.0, 1.5, 0.95, 0.64]) expect(bands.has(b), `band starting at ${b} µm`).toBe(true)
    expect(demo.some(r => r.spectralResponseId !== null)).toBe(true)
  })

  it('imports with a preview by line and field, all rows or none, and round-trips its export', async () => {
    const { own, other } = await orgIds()
    const tech = await signedIn('technician')
    const prefix = unique('IMP')
    const header = 'organizationId,serial,maker,model,kind,bandLambda1Um,bandLambda2Um,rangeMinK,rangeMaxK,defaultEmissivity,resolutionK,accuracy,calibrationIntervalMonths,nextDueDate'
    const good = `${own},${prefix}-1,Ormsby Radiometrics,Spot 8,spot-infrared,8,14,243.15,773.15,0.95,0.1,"{""kind"":""absolute"",""b"":2}",12,2099-02-01`
    const csv = [
      header,
      good,
      `${other},${prefix}-2,Ormsby Radiometrics,Spot 8,spot-infrared,8,14,243.15,773.15,1.2,0.1,"{""kind"":""absolute"",""b"":2}",12,2099-02-30`,
      `987654,${prefix}-3,Ormsby Radiometrics,Spot 8,spot-infrared,8,14,243.15,773.15,0.95,0.1,"{""kind"":""absolute""}",12,`,
      good,
    ].join('\n')
    const p = await tech.post('/api/instruments/import', { csv })
    expect(p.body).toMatchObject({ valid: 1, invalid: 3 })
    expect(p.body.rows[1]).toMatchObject({ line: 3, errors: { defaultEmissivity: expect.any(String), nextDueDate: expect.any(String) } })
    expect(p.body.rows[2].errors).toHaveProperty('accuracy.b')
    expect(p.body.rows[3].errors.serial).toMatch(/Repeats line 2/)
    expect((await tech.post('/api/instruments/import', { csv, commit: true })).status).toBe(400)
    expect((await tech.get(`/api/instruments?q=${prefix}&archived=all`)).body.total).toBe(0)
    const ok = await tech.post('/api/instruments/import', { csv: [header, good].join('\n'), commit: true })
    expect(ok.status).toBe(201)
    expect(ok.body).toEqual({ created: 1 })
    const created = (await tech.get(`/api/instruments?q=${prefix}`)).body.rows[0]
    expect(created).toMatchObject({ accuracy: { kind: 'absolute', b: 2 }, nextDueDate: '2099-02-01', organizationId: own })
    expect((await tech.get(`/api/instruments/${created.id}`)).body.audit[0].action).toBe('import')

    const exp = await tech.get(`/api/instruments/export?q=${prefix}`)
    expect(exp.headers.get('content-type')).toMatch(/^text\/csv/)
    expect(exp.headers.get('content-disposition')).toMatch(/filename="instruments-\d{4}-\d{2}-\d{2}\.csv"/)
    const text = String(exp.body)
    expect((await tech.post('/api/instruments/import', { csv: text })).body.rows[0].errors).toHaveProperty('serial')
    const moved = await tech.post('/api/instruments/import', { csv: text.replaceAll(prefix, `${prefix}B`), commit: true })
    expect(moved.body).toEqual({ created: 1 })
    const copy = (await tech.get(`/api/instruments?q=${prefix}B`)).body.rows[0]
    for (const k of ['maker', 'model', 'kind', 'bandLambda1Um', 'bandLambda2Um', 'rangeMinK', 'rangeMaxK', 'defaultEmissivity', 'resolutionK', 'accuracy', 'calibrationIntervalMonths', 'nextDueDate', 'organizationId']) {
      expect(copy[k], k).toEqual(created[k])
    }
  })
})

describe('responsivity tables', () => {
  it('validates, stores once by content and is usable by instruments', async () => {
    const { own } = await orgIds()
    const tech = await signedIn('technician')
    const customer = await signedIn('customer')
    const bump = Math.random().toFixed(6)
    const csv = `wavelengthUm,response\n7.5,0\n8,0.4\n11,${bump}\n14,0.5\n14.5,0`
    const name = `Test curve ${unique()}`
    const a = await tech.post('/api/responsivities', { name, csv })
    expect(a.status).toBe(201)
    expect(a.body).toMatchObject({ name, pointCount: 5, lambdaMinUm: 7.5, lambdaMaxUm: 14.5 })
    expect(Math.max(...a.body.points.map((p: number[]) => p[1]))).toBe(1)
    // the same curve at another scale, with another name and without a header: the existing row
    const scaled = csv.split('\n').slice(1).map(l => l.split(',')).map(([x, y]) => `${x};${Number(y) * 10}`).join('\n')
    const b = await tech.post('/api/responsivities', { name: `${name} again`, csv: scaled })
    expect(b.status).toBe(200)
    expect(b.body.id).toBe(a.body.id)
    expect((await tech.post('/api/responsivities', { name, csv: '8,0.1\n9,0.3\n10,0.2' })).status).toBe(409)
    for (const bad of ['8,1', '8,1\n8,2', '9,1\n8,2', '8,0\n9,0', '0,1\n8,1', '8,-1\n9,1', 'a,b\nc,d']) {
      const r = await tech.post('/api/responsivities', { name: unique('bad'), csv: bad })
      expect(r.status, bad).toBe(400)
      expect(r.body.data.fields, bad).toHaveProperty('csv')
    }
    expect((await customer.get('/api/responsivities')).status).toBe(403)
    expect((await tech.get(`/api/responsivities/${a.body.id}`)).body.points).toHaveLength(5)
    const inst = await tech.post('/api/instruments', instrument(own, unique('TAB-'), { bandLambda1Um: null, bandLambda2Um: null, spectralResponseId: a.body.id }))
    expect(inst.status).toBe(201)
    expect(inst.body.spectralResponseName).toBe(name)
    const d = (await tech.get(`/api/instruments/${inst.body.id}`)).body
    expect(d.spectralResponse).toMatchObject({ id: a.body.id, pointCount: 5 })
    const audit = (await (await signedIn('admin')).get(`/api/admin/audit?entity=SpectralResponse&entityId=${a.body.id}`)).body.rows
    expect(audit.map((r: { action: string }) => r.action)).toEqual(['create'])
  })
})
