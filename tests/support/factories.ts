/**
 * Small factories for API and browser tests: each makes a fresh record through the API, with
 * invented names, so a test does not depend on what the demo scenario happens to hold.
 */
import { expect } from 'vitest'
import { type Client, DEMO_PASSWORD, unique } from './http'

export interface Made { id: number, version: number, [key: string]: unknown }

function created(r: { status: number, body: unknown }, what: string): Made {
  expect(r.status, `${what}: ${JSON.stringify(r.body)}`).toBe(201)
  return r.body as Made
}

/** A customer organization (admin or lab staff client). */
export async function makeCustomer(lab: Client, over: Record<string, unknown> = {}): Promise<Made> {
  return created(await lab.post('/api/customers', {
    name: unique('Testfield Kilns '),
    addressLines: '1 Test Yard',
    city: 'Testbury',
    postcode: 'TB1 1TT',
    country: 'United Kingdom',
    ...over,
  }), 'customer')
}

/** An 8–14 µm spot instrument of an organization. */
export async function makeInstrument(lab: Client, organizationId: number, over: Record<string, unknown> = {}): Promise<Made> {
  return created(await lab.post('/api/instruments', {
    organizationId,
    serial: unique('SN-'),
    maker: 'Ormsby Radiometrics',
    model: 'Spot 8',
    kind: 'spot-infrared',
    bandLambda1Um: 8,
    bandLambda2Um: 14,
    distanceToSpot: 12,
    rangeMinK: 243.15,
    rangeMaxK: 773.15,
    defaultEmissivity: 0.95,
    resolutionK: 0.1,
    accuracy: { kind: 'greaterOf', a: 1, b: 1 },
    calibrationIntervalMonths: 12,
    ...over,
  }), 'instrument')
}

/** A procedure with one instrument-side budget line (quality client); returns the procedure with its current version. */
export async function makeProcedure(quality: Client, over: Record<string, unknown> = {}): Promise<Made & { currentVersion: { id: number } }> {
  return created(await quality.post('/api/procedures', {
    name: unique('Test procedure '),
    documentReference: 'TP-1',
    decisionRule: 'simple-acceptance',
    template: [{ name: 'Ambient', type: 'B', distribution: 'standard', value: 0.05, unit: 'K', input: 'reading' }],
    cmc: [],
    ...over,
  }), 'procedure') as Made & { currentVersion: { id: number } }
}

/** A draft run of an instrument (technician client), with measured conditions entered. */
export async function makeRun(tech: Client, instrumentId: number, procedureVersionId: number, over: Record<string, unknown> = {}): Promise<Made> {
  return created(await tech.post('/api/runs', {
    instrumentId,
    procedureVersionId,
    receivedDate: '2026-11-20',
    calibrationDate: '2026-11-25',
    ambientTemperatureK: 296.15,
    relativeHumidityPct: 40,
    distanceMm: 300,
    emissivitySetting: 0.95,
    reflectedTemperatureK: 296.15,
    instrumentTemperatureK: 296.15,
    ...over,
  }), 'run')
}

/** Asset tag → id of every source and reference instrument. */
export async function equipmentIds(c: Client): Promise<Record<string, number>> {
  const sources = (await c.get('/api/sources?pageSize=100')).body.rows as { id: number, assetTag: string }[]
  const refs = (await c.get('/api/reference-instruments?pageSize=100')).body.rows as { id: number, assetTag: string }[]
  return Object.fromEntries([...sources, ...refs].map(s => [s.assetTag, s.id]))
}

/** The id of the source or reference instrument with this asset tag. */
export async function equipmentId(c: Client, assetTag: string): Promise<number> {
  const id = (await equipmentIds(c))[assetTag]
  expect(id, `no equipment ${assetTag}`).toBeTruthy()
  return id!
}

/**
 * An approved run of an instrument (technician and quality clients): three points on the demo's
 * flat plate BB-FP-01, submitted by the technician and approved by the quality manager.
 */
export async function makeApprovedRun(tech: Client, quality: Client, instrumentId: number, procedureVersionId: number): Promise<Made> {
  const run = await makeRun(tech, instrumentId, procedureVersionId)
  const plate = await equipmentId(tech, 'BB-FP-01')
  for (const setPointK of [273.15, 323.15, 373.15]) {
    const p = await tech.post(`/api/runs/${run.id}/points`, { sourceId: plate, setPointK, sourceIndicatedK: setPointK, readingsK: [setPointK - 0.2, setPointK - 0.1, setPointK - 0.3] })
    expect(p.status, JSON.stringify(p.body)).toBe(201)
  }
  const submitted = await tech.post(`/api/runs/${run.id}/submit`, { version: run.version })
  expect(submitted.status, JSON.stringify(submitted.body)).toBe(200)
  const approved = await quality.post(`/api/runs/${run.id}/approve`, { version: submitted.body.version })
  expect(approved.status, JSON.stringify(approved.body)).toBe(200)
  return approved.body as Made
}

/** The certificate of an approved run, signed by the demo quality manager. */
export async function issueCertificate(quality: Client, runId: number): Promise<Made & { number: string }> {
  const r = await quality.post('/api/certificates', { runId, password: DEMO_PASSWORD, signatoryFunction: 'Quality manager' })
  expect(r.status, JSON.stringify(r.body)).toBe(201)
  return r.body as Made & { number: string }
}
