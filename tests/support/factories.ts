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

/** The calibration certificate recorded for a factory-made source or reference instrument. */
export interface MadeCalibration { calibrationDate: string, dueDate: string, certificateNumber: string, provider: string }

/**
 * Default calibration of factory equipment: current on the factories' run date (2026-11-25) and on
 * every date the API tests use. Pass `calibration: null` for equipment with no calibration at all.
 */
const CURRENT_CALIBRATION = { calibrationDate: '2026-01-15', dueDate: '2028-01-15' }

async function addCalibration(quality: Client, path: string, cal: Partial<MadeCalibration>): Promise<MadeCalibration> {
  const body = { provider: 'Testwick Thermal Standards', certificateNumber: unique('TC-'), ...CURRENT_CALIBRATION, ...cal }
  const r = await quality.post(path, body)
  expect(r.status, `calibration: ${JSON.stringify(r.body)}`).toBe(201)
  return body
}

/**
 * An 8–14 µm flat-plate blackbody source, −20 °C to 150 °C, ε = 0.95, with a certificate correction table
 * and one calibration current on 2026-11-25 (quality or admin client). `calibration` overrides the
 * calibration's dates or number, or is `null` for none.
 */
export async function makeSource(
  quality: Client,
  over: Record<string, unknown> & { calibration?: Partial<MadeCalibration> | null } = {},
): Promise<Made & { assetTag: string, calibration: MadeCalibration | null }> {
  const { calibration, ...fields } = over
  const assetTag = unique('BB-T-')
  const source = created(await quality.post('/api/sources', {
    assetTag,
    kind: 'flat-plate',
    maker: 'Ormsby Radiometrics',
    model: 'Plate 150',
    serial: `S-${assetTag}`,
    apertureMm: 150,
    minTemperatureK: 253.15,
    maxTemperatureK: 423.15,
    emissivity: 0.95,
    emissivityU: 0.005,
    emissivityBandLambda1Um: 8,
    emissivityBandLambda2Um: 14,
    uniformityK: 0.2,
    stabilityK: 0.05,
    corrections: [[253.15, 0.3], [323.15, 0.1], [423.15, -0.2]],
    ...fields,
  }), 'source') as Made & { assetTag: string }
  const cal = calibration === null ? null : await addCalibration(quality, `/api/sources/${source.id}/calibrations`, calibration ?? {})
  return { ...source, calibration: cal }
}

/** A contact thermometer (−40 °C to 420 °C, u = 0.02 K) with one current calibration (quality or admin client). */
export async function makeReference(
  quality: Client,
  over: Record<string, unknown> & { calibration?: Partial<MadeCalibration> | null } = {},
): Promise<Made & { assetTag: string, calibration: MadeCalibration | null }> {
  const { calibration, ...fields } = over
  const assetTag = unique('REF-T-')
  const ref = created(await quality.post('/api/reference-instruments', {
    assetTag,
    kind: 'contact-thermometer',
    maker: 'Vellmar Sensorik',
    model: 'Probe 7',
    serial: `P-${assetTag}`,
    rangeMin: 233.15,
    rangeMax: 693.15,
    rangeUnit: 'K',
    standardUncertainty: 0.02,
    uncertaintyUnit: 'K',
    ...fields,
  }), 'reference instrument') as Made & { assetTag: string }
  const cal = calibration === null ? null : await addCalibration(quality, `/api/reference-instruments/${ref.id}/calibrations`, calibration ?? {})
  return { ...ref, calibration: cal }
}

/** The organization of a signed-in customer user (the demo customer account belongs to one). */
export async function organizationOf(customer: Client): Promise<number> {
  const me = await customer.get('/api/auth/me')
  expect(me.status).toBe(200)
  expect(me.body.organizationId, 'a customer user has an organization').toEqual(expect.any(Number))
  return me.body.organizationId as number
}

/** The id of the source or reference instrument with this asset tag. */
export async function equipmentId(c: Client, assetTag: string): Promise<number> {
  const sources = (await c.get('/api/sources?pageSize=200')).body.rows as { id: number, assetTag: string }[]
  const refs = (await c.get('/api/reference-instruments?pageSize=200')).body.rows as { id: number, assetTag: string }[]
  const id = [...sources, ...refs].find(e => e.assetTag === assetTag)?.id
  expect(id, `no equipment ${assetTag}`).toBeTruthy()
  return id!
}

/** The body of a point taken on a source at a set-point (its indicated temperature the set-point), with three readings `offsetK` off it. */
export function pointOn(sourceId: number, setPointK: number, offsetK = -0.2): Record<string, unknown> {
  return { sourceId, setPointK, sourceIndicatedK: setPointK, readingsK: [setPointK + offsetK, setPointK + offsetK + 0.1, setPointK + offsetK - 0.1] }
}

/**
 * A run with its receipt and the given points (default: three on BB-FP-01), submitted by the technician and approved by the
 * quality client; answers the run's id. `header` overrides the run header (e.g. its calibration date).
 */
export async function makeApprovedRun(tech: Client, quality: Client, instrumentId: number, procedureVersionId: number, points?: Record<string, unknown>[], header: Record<string, unknown> & { receipt?: false | Record<string, unknown> } = {}): Promise<number> {
  const run = await makeRun(tech, instrumentId, procedureVersionId, header)
  // By default three points on the demo's flat plate BB-FP-01.
  if (!points) {
    const plate = await equipmentId(tech, 'BB-FP-01')
    points = [273.15, 323.15, 373.15].map(k => pointOn(plate, k))
  }
  for (const p of points) {
    const r = await tech.post(`/api/runs/${run.id}/points`, p)
    expect(r.status, `point: ${JSON.stringify(r.body)}`).toBe(201)
  }
  const s = await tech.post(`/api/runs/${run.id}/submit`, { version: (await tech.get(`/api/runs/${run.id}`)).body.version })
  expect(s.status, `submit: ${JSON.stringify(s.body)}`).toBe(200)
  const a = await quality.post(`/api/runs/${run.id}/approve`, { version: s.body.version })
  expect(a.status, `approve: ${JSON.stringify(a.body)}`).toBe(200)
  return run.id
}

/** Sign and issue the certificate of an approved run (the demo quality manager's password). */
export async function issueCertificate(quality: Client, runId: number): Promise<{ status: number, body: Made & { number: string, organizationId: number } }> {
  return quality.post('/api/certificates', { runId, password: DEMO_PASSWORD, signatoryFunction: 'Quality manager' })
}
