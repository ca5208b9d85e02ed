// Blackbody sources and reference instruments: roles, validation, optimistic locking, archive,
// calibration history and due dates, certificate corrections, CSV import and export.
// All equipment, makers and certificate numbers are invented.
import Papa from 'papaparse'
import { describe, expect, it } from 'vitest'
import { signedIn, unique } from '../support/http'
import { makeReference, makeSource } from '../support/factories'

function source(tag: string, extra: Record<string, unknown> = {}) {
  return {
    assetTag: tag, kind: 'flat-plate', maker: 'Ormsby Radiometrics', model: 'Plate 90', serial: `S-${tag}`,
    apertureMm: 90, minTemperatureK: 263.15, maxTemperatureK: 423.15, emissivity: 0.96, emissivityU: 0.004,
    emissivityBandLambda1Um: 8, emissivityBandLambda2Um: 14, uniformityK: 0.15, stabilityK: 0.04,
    corrections: [[273.15, 0.2], [323.15, 0.1], [373.15, -0.05]], ...extra,
  }
}

describe('blackbody sources', () => {
  it('quality creates, technicians read, customers are refused, each change audited', async () => {
    const quality = await signedIn('quality')
    const tech = await signedIn('technician')
    const customer = await signedIn('customer')
    const tag = unique('BB-')
    const c = await quality.post('/api/sources', source(tag))
    expect(c.status).toBe(201)
    expect(c.body).toMatchObject({ assetTag: tag, status: 'in-service', archived: false, dueDate: null, pastDue: false, version: 0 })
    expect((await tech.post('/api/sources', source(unique('BB-')))).status).toBe(403)
    const detail = await tech.get(`/api/sources/${c.body.id}`)
    expect(detail.status).toBe(200)
    expect(detail.body.calibrations).toEqual([])
    expect(detail.body.audit.map((a: { action: string }) => a.action)).toEqual(['create'])
    expect(detail.body.audit[0]).toMatchObject({ userName: 'Quinn Halvorsen', entity: 'BlackbodySource' })
    expect((await customer.get('/api/sources')).status).toBe(403)
    expect((await customer.get(`/api/sources/${c.body.id}`)).status).toBe(403)
  })

  it('names the fields at fault, including cross-field rules and the correction table', async () => {
    const quality = await signedIn('quality')
    const r = await quality.post('/api/sources', source(unique('BB-'), { maxTemperatureK: 200, emissivity: 1.2, kind: 'sphere', emissivityBandLambda2Um: null }))
    expect(r.status).toBe(400)
    expect(r.body.data.fields).toMatchObject({ emissivity: expect.any(String), kind: expect.any(String) })
    const r2 = await quality.post('/api/sources', source(unique('BB-'), { maxTemperatureK: 200 }))
    expect(r2.body.data.fields).toHaveProperty('maxTemperatureK')
    const r3 = await quality.post('/api/sources', source(unique('BB-'), { corrections: [[373.15, 0], [273.15, 0]] }))
    expect(r3.status).toBe(400)
    expect(r3.body.data.fields).toHaveProperty('corrections')
    const r4 = await quality.post('/api/sources', source(unique('BB-'), { emissivityBandLambda2Um: null }))
    expect(r4.body.data.fields).toHaveProperty('emissivityBandLambda2Um')
    const existing = await makeSource(quality)
    const dup = await quality.post('/api/sources', source(existing.assetTag))
    expect(dup.status).toBe(409)
    expect(dup.body.data.fields).toHaveProperty('assetTag')
  })

  it('updates with the version seen (stale → 409), re-checks the merged record, audits before and after', async () => {
    const admin = await signedIn('admin')
    const c = (await admin.post('/api/sources', source(unique('BB-')))).body
    const ok = await admin.patch(`/api/sources/${c.id}`, { stabilityK: 0.08, version: c.version })
    expect(ok.status).toBe(200)
    expect(ok.body).toMatchObject({ stabilityK: 0.08, version: c.version + 1 })
    const stale = await admin.patch(`/api/sources/${c.id}`, { stabilityK: 0.09, version: c.version })
    expect(stale.status).toBe(409)
    const merged = await admin.patch(`/api/sources/${c.id}`, { maxTemperatureK: 250, version: ok.body.version })
    expect(merged.status).toBe(400)
    expect(merged.body.data.fields).toHaveProperty('maxTemperatureK')
    const audit = (await admin.get(`/api/sources/${c.id}`)).body.audit
    expect(audit.map((a: { action: string }) => a.action)).toEqual(['create', 'update'])
    expect(audit[1].before).toMatchObject({ stabilityK: 0.04 })
    expect(audit[1].after).toMatchObject({ stabilityK: 0.08 })
    expect((await admin.patch('/api/sources/987654', { stabilityK: 1, version: 0 })).status).toBe(404)
  })

  it('archives instead of deleting: hidden from the default list, still readable, restorable', async () => {
    const admin = await signedIn('admin')
    const tag = unique('BBA-')
    const c = (await admin.post('/api/sources', source(tag))).body
    expect((await admin.request('DELETE', `/api/sources/${c.id}`)).status).toBeGreaterThanOrEqual(404)
    const a = await admin.post(`/api/sources/${c.id}/archive`, { archived: true, version: c.version })
    expect(a.status).toBe(200)
    expect(a.body.archived).toBe(true)
    expect((await admin.post(`/api/sources/${c.id}/archive`, { archived: false, version: c.version })).status).toBe(409)
    expect((await admin.get(`/api/sources?q=${tag}`)).body.total).toBe(0)
    expect((await admin.get(`/api/sources?q=${tag}&archived=all`)).body.total).toBe(1)
    expect((await admin.get(`/api/sources?q=${tag}&archived=true`)).body.rows[0].id).toBe(c.id)
    expect((await admin.get(`/api/sources/${c.id}`)).status).toBe(200)
    const r = await admin.post(`/api/sources/${c.id}/archive`, { archived: false, version: a.body.version })
    expect(r.body.archived).toBe(false)
    const actions = (await admin.get(`/api/sources/${c.id}`)).body.audit.map((x: { action: string }) => x.action)
    expect(actions).toEqual(['create', 'archive', 'restore'])
  })

  it('records calibrations: the latest gives the due date and the past-due flag', async () => {
    const quality = await signedIn('quality')
    const tech = await signedIn('technician')
    const c = (await quality.post('/api/sources', source(unique('BB-')))).body
    const cal = { provider: 'Invented Standards Lab', certificateNumber: unique('C-'), calibrationDate: '2019-05-01', dueDate: '2020-05-01', results: 'As tabulated' }
    expect((await tech.post(`/api/sources/${c.id}/calibrations`, cal)).status).toBe(403)
    const bad = await quality.post(`/api/sources/${c.id}/calibrations`, { ...cal, dueDate: '2019-04-01' })
    expect(bad.status).toBe(400)
    expect(bad.body.data.fields).toHaveProperty('dueDate')
    expect((await quality.post(`/api/sources/${c.id}/calibrations`, { ...cal, calibrationDate: '2019-02-30' })).body.data.fields).toHaveProperty('calibrationDate')
    const first = await quality.post(`/api/sources/${c.id}/calibrations`, cal)
    expect(first.status).toBe(201)
    expect((await quality.post(`/api/sources/${c.id}/calibrations`, cal)).status).toBe(409)
    let d = (await tech.get(`/api/sources/${c.id}`)).body
    expect(d).toMatchObject({ dueDate: '2020-05-01', lastCalibrationDate: '2019-05-01', pastDue: true })
    await quality.post(`/api/sources/${c.id}/calibrations`, { ...cal, certificateNumber: unique('C-'), calibrationDate: '2098-01-10', dueDate: '2099-01-10' })
    d = (await tech.get(`/api/sources/${c.id}`)).body
    expect(d).toMatchObject({ dueDate: '2099-01-10', pastDue: false })
    expect(d.calibrations.map((x: { calibrationDate: string }) => x.calibrationDate)).toEqual(['2098-01-10', '2019-05-01'])
    expect(d.audit.map((x: { action: string }) => x.action)).toEqual(['create', 'add-calibration', 'add-calibration'])
    expect((await quality.post('/api/sources/987654/calibrations', cal)).status).toBe(404)
  })

  it('the demo high-temperature cavity is past due (due 2026-10-15)', async () => {
    // a check of the demo scenario itself, which keeps its high-temperature cavity BB-CV-03 overdue
    const tech = await signedIn('technician')
    const r = await tech.get('/api/sources?q=BB-CV-03')
    expect(r.body.rows[0]).toMatchObject({ assetTag: 'BB-CV-03', dueDate: '2026-10-15', pastDue: true })
  })

  it('a source past due is flagged, sortable and filterable by due date', async () => {
    const quality = await signedIn('quality')
    const tech = await signedIn('technician')
    const overdue = await makeSource(quality, { calibration: { calibrationDate: '2025-10-15', dueDate: '2026-10-15' } })
    const current = await makeSource(quality, { calibration: { calibrationDate: '2026-03-10', dueDate: '2027-03-10' } })
    expect((await tech.get(`/api/sources?q=${overdue.assetTag}`)).body.rows[0]).toMatchObject({ assetTag: overdue.assetTag, dueDate: '2026-10-15', pastDue: true })
    const due = await tech.get('/api/sources?dueBefore=2026-11-01&pageSize=500')
    expect(due.body.rows.map((s: { assetTag: string }) => s.assetTag)).toContain(overdue.assetTag)
    expect(due.body.rows.map((s: { assetTag: string }) => s.assetTag)).not.toContain(current.assetTag)
    const sorted = (await tech.get('/api/sources?sort=dueDate&pageSize=500')).body.rows.map((s: { dueDate: string | null }) => s.dueDate).filter(Boolean)
    expect(sorted).toEqual([...sorted].sort())
    expect((await tech.get('/api/sources?sort=password')).status).toBe(400)
  })

  it('interpolates the certificate correction and refuses extrapolation', async () => {
    const quality = await signedIn('quality')
    const tech = await signedIn('technician')
    const c = (await quality.post('/api/sources', source(unique('BB-')))).body
    // Hand calculation: half-way between 0.2 K at 273.15 K and 0.1 K at 323.15 K is 0.15 K.
    const mid = await tech.get(`/api/sources/${c.id}/correction?setPointK=298.15`)
    expect(mid.status).toBe(200)
    expect(Math.abs(mid.body.correctionK - 0.15)).toBeLessThan(1e-9)
    const out = await tech.get(`/api/sources/${c.id}/correction?setPointK=400`)
    expect(out.status).toBe(400)
    expect(out.body.data.fields.setPointK).toMatch(/not extrapolated/)
  })

  it('exports CSV with a filename and formula cells escaped, and the export imports again', async () => {
    const quality = await signedIn('quality')
    const prefix = unique('BBX')
    await quality.post('/api/sources', source(`${prefix}-1`, { notes: '=HYPERLINK("http://evil.example")', model: '-Plate', serial: '-12.5' }))
    await quality.post('/api/sources', source(`${prefix}-2`, { kind: 'cavity', corrections: [] }))
    const r = await quality.get(`/api/sources/export?q=${prefix}`)
    expect(r.status).toBe(200)
    expect(r.headers.get('content-type')).toMatch(/^text\/csv/)
    expect(r.headers.get('content-disposition')).toMatch(/^attachment; filename="blackbody-sources-\d{4}-\d{2}-\d{2}\.csv"$/)
    const text = String(r.body)
    const parsed = Papa.parse<Record<string, string>>(text.replace(/^\uFEFF/, ''), { header: true, skipEmptyLines: true })
    expect(parsed.data).toHaveLength(2)
    const row1 = parsed.data.find(x => x.assetTag === `${prefix}-1`)!
    expect(row1.notes).toBe('\'=HYPERLINK("http://evil.example")')
    expect(row1.model).toBe('\'-Plate')
    expect(row1.serial).toBe('-12.5')
    expect(row1.corrections).toBe('[[273.15,0.2],[323.15,0.1],[373.15,-0.05]]')

    const again = text.replaceAll(prefix, `${prefix}R`)
    const preview = await quality.post('/api/sources/import', { csv: again })
    expect(preview.status).toBe(200)
    expect(preview.body).toMatchObject({ valid: 2, invalid: 0 })
    const commit = await quality.post('/api/sources/import', { csv: again, commit: true })
    expect(commit.status).toBe(201)
    expect(commit.body).toEqual({ created: 2 })
    const copy = (await quality.get(`/api/sources?q=${prefix}R-1`)).body.rows[0]
    expect(copy).toMatchObject({ notes: '=HYPERLINK("http://evil.example")', model: '-Plate', serial: '-12.5', corrections: [[273.15, 0.2], [323.15, 0.1], [373.15, -0.05]] })
    const audit = (await quality.get(`/api/sources/${copy.id}`)).body.audit
    expect(audit.map((a: { action: string }) => a.action)).toEqual(['import'])
    // Importing the original export again clashes with the rows it came from.
    const clash = await quality.post('/api/sources/import', { csv: text })
    expect(clash.body.invalid).toBe(2)
    expect(clash.body.rows[0].errors).toHaveProperty('assetTag')
  })

  it('previews errors by line and field, and commits all rows or none', async () => {
    const quality = await signedIn('quality')
    const tag = unique('BBI')
    const existing = await makeSource(quality)
    const header = 'assetTag,kind,maker,model,serial,apertureMm,minTemperatureK,maxTemperatureK,emissivity,emissivityU,uniformityK,stabilityK'
    const csv = [
      header,
      `${tag}-ok,cavity,Ormsby Radiometrics,C1,1,30,300,600,0.995,0.001,0.1,0.02`,
      `${tag}-bad,cavity,Ormsby Radiometrics,C1,2,30,300,600,1.5,0.001,0.1,0.02`,
      '',
      `${tag}-ok,cavity,Ormsby Radiometrics,C1,3,thirty,300,600,0.99,0.001,0.1,0.02`,
      `${existing.assetTag},cavity,Ormsby Radiometrics,C1,4,30,300,600,0.99,0.001,0.1,0.02`,
    ].join('\n')
    const p = await quality.post('/api/sources/import', { csv })
    expect(p.status).toBe(200)
    expect(p.body).toMatchObject({ valid: 1, invalid: 3 })
    expect(p.body.rows.map((r: { line: number }) => r.line)).toEqual([2, 3, 5, 6])
    expect(p.body.rows[0].errors).toEqual({})
    expect(Object.keys(p.body.rows[1].errors)).toEqual(['emissivity'])
    expect(p.body.rows[2].errors).toHaveProperty('apertureMm')
    expect(p.body.rows[3].errors).toHaveProperty('assetTag')
    const c = await quality.post('/api/sources/import', { csv, commit: true })
    expect(c.status).toBe(400)
    expect(c.body.data.rows.map((r: { line: number }) => r.line)).toEqual([3, 5, 6])
    expect((await quality.get(`/api/sources?q=${tag}&archived=all`)).body.total).toBe(0)
    expect((await quality.post('/api/sources/import', { csv: 'nothing,known\n1,2' })).body.data.fields).toHaveProperty('csv')
    expect((await (await signedIn('technician')).post('/api/sources/import', { csv })).status).toBe(403)
  })
})

describe('reference instruments', () => {
  const prt = (tag: string, extra: Record<string, unknown> = {}) => ({
    assetTag: tag, kind: 'contact-thermometer', maker: 'Vellmar Sensorik', model: 'Probe 7', serial: `P-${tag}`,
    rangeMin: 233.15, rangeMax: 693.15, rangeUnit: 'K', standardUncertainty: 0.02, uncertaintyUnit: 'K', ...extra,
  })

  it('creates with unit rules, records calibrations, archives, and is read-only for technicians', async () => {
    const admin = await signedIn('admin')
    const tech = await signedIn('technician')
    const bad = await admin.post('/api/reference-instruments', prt(unique('R-'), { kind: 'hygrometer' }))
    expect(bad.status).toBe(400)
    expect(bad.body.data.fields).toHaveProperty('rangeUnit')
    const rh = await admin.post('/api/reference-instruments', prt(unique('R-'), { kind: 'hygrometer', rangeMin: 5, rangeMax: 120, rangeUnit: '%RH', uncertaintyUnit: '%RH' }))
    expect(rh.body.data.fields).toHaveProperty('rangeMax')
    const c = await admin.post('/api/reference-instruments', prt(unique('R-')))
    expect(c.status).toBe(201)
    expect((await tech.patch(`/api/reference-instruments/${c.body.id}`, { serial: 'x', version: 0 })).status).toBe(403)
    const cal = await admin.post(`/api/reference-instruments/${c.body.id}/calibrations`, { provider: 'Invented Standards Lab', certificateNumber: unique('P-'), calibrationDate: '2026-01-05', dueDate: '2099-01-05' })
    expect(cal.status).toBe(201)
    expect(cal.body).toMatchObject({ equipmentType: 'reference', equipmentId: c.body.id })
    const d = await tech.get(`/api/reference-instruments/${c.body.id}`)
    expect(d.body).toMatchObject({ dueDate: '2099-01-05', pastDue: false })
    expect(d.body.calibrations).toHaveLength(1)
    const upd = await admin.patch(`/api/reference-instruments/${c.body.id}`, { standardUncertainty: 0.025, version: c.body.version })
    expect(upd.body.version).toBe(c.body.version + 1)
    expect((await admin.patch(`/api/reference-instruments/${c.body.id}`, { standardUncertainty: 0.03, version: c.body.version })).status).toBe(409)
    const a = await admin.post(`/api/reference-instruments/${c.body.id}/archive`, { archived: true, version: upd.body.version })
    expect(a.body.archived).toBe(true)
  })

  it('lists references with search and filters, and round-trips through CSV', async () => {
    const quality = await signedIn('quality')
    const hygrometer = await makeReference(quality, { kind: 'hygrometer', rangeMin: 5, rangeMax: 95, rangeUnit: '%RH', standardUncertainty: 1.5, uncertaintyUnit: '%RH' })
    const list = await quality.get('/api/reference-instruments?kind=hygrometer&pageSize=500')
    expect(list.body.rows.every((r: { kind: string }) => r.kind === 'hygrometer')).toBe(true)
    expect(list.body.rows.map((r: { assetTag: string }) => r.assetTag)).toContain(hygrometer.assetTag)
    const prefix = unique('RX')
    await quality.post('/api/reference-instruments', prt(`${prefix}-1`))
    const csv = String((await quality.get(`/api/reference-instruments/export?q=${prefix}`)).body).replaceAll(prefix, `${prefix}B`)
    const commit = await quality.post('/api/reference-instruments/import', { csv, commit: true })
    expect(commit.status).toBe(201)
    expect(commit.body.created).toBe(1)
    expect((await quality.get(`/api/reference-instruments?q=${prefix}B`)).body.rows[0]).toMatchObject({ kind: 'contact-thermometer', rangeMin: 233.15, standardUncertainty: 0.02 })
  })
})
