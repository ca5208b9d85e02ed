/**
 * Small factories for API and browser tests: each makes a fresh record through the API, with
 * invented names, so a test does not depend on what the demo scenario happens to hold.
 */
import { expect } from 'vitest'
import { type Client, unique } from './http'

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
    applicability: { sourceKinds: ['flat-plate', 'cavity'], bandMinUm: 0.5, bandMaxUm: 20, minK: 200, maxK: 2000 },
    ...over,
  }), 'procedure') as Made & { currentVersion: { id: number } }
}

/** The receipt of an item in good order (the body of POST /api/runs/[id]/receipt). */
export const GOOD_RECEIPT = { receivedOn: '2026-11-20', packaging: 'Maker’s case, intact', condition: 'No visible damage' }

/**
 * A draft run of an instrument (technician client), with measured conditions entered and the
 * item's receipt recorded (`receipt: false` leaves it out); answers the run as it then stands.
 */
export async function makeRun(tech: Client, instrumentId: number, procedureVersionId: number, over: Record<string, unknown> & { receipt?: false | Record<string, unknown> } = {}): Promise<Made> {
  const { receipt = {}, ...header } = over
  const run = created(await tech.post('/api/runs', {
    instrumentId,
    procedureVersionId,
    calibrationDate: '2026-11-25',
    ambientTemperatureK: 296.15,
    relativeHumidityPct: 40,
    distanceMm: 300,
    emissivitySetting: 0.95,
    reflectedTemperatureK: 296.15,
    instrumentTemperatureK: 296.15,
    ...header,
  }), 'run')
  if (receipt === false) return run
  const r = await tech.post(`/api/runs/${run.id}/receipt`, { ...GOOD_RECEIPT, ...receipt })
  expect(r.status, `receipt: ${JSON.stringify(r.body)}`).toBe(200)
  return r.body as Made
}

/** Asset tag → id of every source and reference instrument. */
export async function equipmentIds(c: Client): Promise<Record<string, number>> {
  const sources = (await c.get('/api/sources?pageSize=100')).body.rows as { id: number, assetTag: string }[]
  const refs = (await c.get('/api/reference-instruments?pageSize=100')).body.rows as { id: number, assetTag: string }[]
  return Object.fromEntries([...sources, ...refs].map(s => [s.assetTag, s.id]))
}
