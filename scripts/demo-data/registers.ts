/**
 * The registers of the invented demo laboratory: its blackbody sources and reference
 * instruments with their calibrations, addresses and contacts for the three demo customers,
 * one tabulated responsivity and about forty customer instruments across the common bands.
 * Makers, models, serials, providers and certificate numbers are all invented.
 * Idempotent by natural keys (asset tag, certificate number, content hash, maker + model + serial).
 * The demo's "today" is 2026-12-01: the high-temperature cavity is past its due date.
 *
 * The sources' certified data say what their certificates state. The flat plate's certificate states
 * radiance temperatures in 8–14 µm (emissivity setting 1) with the surroundings at 23.0 °C and
 * U = 0.30 K (k = 2): its basis is 'radiance-temperature', so the engine finds the plate's surface
 * temperature from each radiance temperature before the reading model (its emissivity is not applied
 * twice). The cavities' certificates state cavity temperatures; a cavity certificate that states U over
 * a range of set-points is recorded with its largest U. The 8–14 µm cavity's register also holds the
 * maker's spectral emissivity down to 1.5 µm, so the 2.2 µm demo pyrometer can use it; the plate's
 * table covers 7–15 µm, the span of the tabulated 8–14 µm responsivity.
 *
 * The ratio (two-colour) pyrometers have two bands, 0.95–1.00 µm and 1.00–1.05 µm, and the
 * emissivity-ratio setting 1; a demo database made before they were recorded gets them on the next seed
 * (once, with an audit row).
 */
import crypto from 'node:crypto'
import type { Transaction } from 'sequelize'
import { canonicalResponsivityText, normalizeResponsivity } from '#shared/registers/responsivity'
import type { AccuracySpec } from '#shared/schemas/instrument'
import type { EquipmentType, InstrumentKind, InstrumentStatus } from '#shared/registers/constants'
import { BlackbodySource } from '#server/models/BlackbodySource'
import { Contact } from '#server/models/Contact'
import { EquipmentCalibration } from '#server/models/EquipmentCalibration'
import { Instrument } from '#server/models/Instrument'
import { Organization } from '#server/models/Organization'
import { ReferenceInstrument } from '#server/models/ReferenceInstrument'
import { SpectralResponse } from '#server/models/SpectralResponse'
import { recordAudit, snapshot } from '#server/utils/audit'

const C = (celsius: number) => Math.round((celsius + 273.15) * 100) / 100

const PROVIDER = 'Hallbeck Thermal Standards Laboratory'

const SOURCES = [
  {
    assetTag: 'BB-FP-01', kind: 'flat-plate', maker: 'Norrvik Instruments', model: 'FP-150 Plate', serial: 'NV-FP150-0412',
    apertureMm: 150, minTemperatureK: C(-20), maxTemperatureK: C(150), emissivity: 0.95, emissivityU: 0.005,
    emissivityBandLambda1Um: 8, emissivityBandLambda2Um: 14, uniformityK: 0.2, stabilityK: 0.05,
    // invented: the coating's emissivity measured from 7 to 15 µm, lower and less certain at the ends
    emissivityTable: [[7, 0.94, 0.01], [8, 0.95, 0.005], [14, 0.95, 0.005], [15, 0.94, 0.01]],
    corrections: [[C(-20), 0.35], [C(0), 0.22], [C(50), 0.1], [C(100), -0.05], [C(150), -0.18]],
    certifiedBasis: 'radiance-temperature', certifiedBandLambda1Um: 8, certifiedBandLambda2Um: 14, certifiedBandMedium: 'vacuum',
    certifiedReflectedTemperatureK: C(23), certifiedExpandedUncertaintyK: 0.3, certifiedCoverageFactor: 2,
    notes: 'Low-temperature plate for 8–14 µm instruments.',
    calibration: { certificateNumber: 'HTS-26-0311', calibrationDate: '2026-03-10', dueDate: '2027-03-10', results: 'Radiance temperature (8–14 µm, emissivity setting 1, surroundings at 23.0 °C) at five set-points; corrections as tabulated, U = 0.30 K (k = 2).' },
  },
  {
    assetTag: 'BB-CV-02', kind: 'cavity', maker: 'Calderon Optics', model: 'CV-500', serial: 'CO-CV5-1187',
    apertureMm: 50, minTemperatureK: C(50), maxTemperatureK: C(500), emissivity: 0.995, emissivityU: 0.001,
    emissivityBandLambda1Um: 8, emissivityBandLambda2Um: 14, uniformityK: 0.1, stabilityK: 0.03,
    // invented: the maker's spectral emissivity of the cavity, 1.5–14 µm
    emissivityTable: [[1.5, 0.998, 0.001], [5, 0.997, 0.001], [8, 0.995, 0.001], [14, 0.995, 0.001]],
    corrections: [[C(50), 0.05], [C(150), 0.08], [C(300), 0.15], [C(500), 0.3]],
    certifiedBasis: 'cavity-temperature', certifiedBandLambda1Um: null, certifiedBandLambda2Um: null, certifiedBandMedium: null,
    certifiedReflectedTemperatureK: null, certifiedExpandedUncertaintyK: 0.6, certifiedCoverageFactor: 2,
    notes: null,
    calibration: { certificateNumber: 'HTS-26-0520', calibrationDate: '2026-05-20', dueDate: '2027-05-20', results: 'Cavity temperature at four set-points, U = 0.25 K to 0.60 K (k = 2); the register holds the largest.' },
  },
  {
    assetTag: 'BB-CV-03', kind: 'cavity', maker: 'Calderon Optics', model: 'CV-1500H', serial: 'CO-CVH-0093',
    apertureMm: 25, minTemperatureK: C(400), maxTemperatureK: C(1500), emissivity: 0.999, emissivityU: 0.0005,
    emissivityBandLambda1Um: 0.6, emissivityBandLambda2Um: 5, uniformityK: 0.5, stabilityK: 0.1,
    emissivityTable: null,
    corrections: [[C(400), 0.2], [C(800), 0.5], [C(1200), 0.9], [C(1500), 1.4]],
    certifiedBasis: 'cavity-temperature', certifiedBandLambda1Um: null, certifiedBandLambda2Um: null, certifiedBandMedium: null,
    certifiedReflectedTemperatureK: null, certifiedExpandedUncertaintyK: 2.1, certifiedCoverageFactor: 2,
    notes: 'Recalibration overdue: do not use until the new certificate is recorded.',
    calibration: { certificateNumber: 'HTS-25-1015', calibrationDate: '2025-10-15', dueDate: '2026-10-15', results: 'Cavity temperature at four set-points, U = 0.8 K to 2.1 K (k = 2); the register holds the largest.' },
  },
] as const

const REFERENCES = [
  {
    assetTag: 'REF-PRT-01', kind: 'contact-thermometer', maker: 'Vellmar Sensorik', model: 'PT100-S4 probe', serial: 'VS-4471',
    rangeMin: C(-40), rangeMax: C(450), rangeUnit: 'K', standardUncertainty: 0.015, uncertaintyUnit: 'K',
    calibration: { certificateNumber: 'HTS-26-0201', calibrationDate: '2026-02-01', dueDate: '2027-02-01', results: 'ITS-90 deviation coefficients a4, b4 (subrange to the zinc point).' },
  },
  {
    assetTag: 'REF-PRT-02', kind: 'contact-thermometer', maker: 'Vellmar Sensorik', model: 'PT100-HT probe', serial: 'VS-5208',
    rangeMin: C(0), rangeMax: C(660), rangeUnit: 'K', standardUncertainty: 0.03, uncertaintyUnit: 'K',
    calibration: { certificateNumber: 'HTS-26-0611', calibrationDate: '2026-06-11', dueDate: '2027-06-11', results: 'ITS-90 deviation coefficients (subrange to the aluminium point).' },
  },
  {
    assetTag: 'REF-TRT-01', kind: 'transfer-radiation-thermometer', maker: 'Calderon Optics', model: 'TR-1.6 transfer standard', serial: 'CO-TR16-0021',
    rangeMin: C(400), rangeMax: C(1500), rangeUnit: 'K', standardUncertainty: 0.25, uncertaintyUnit: 'K',
    calibration: { certificateNumber: 'HTS-26-0401', calibrationDate: '2026-04-01', dueDate: '2027-04-01', results: 'Sakuma–Hattori coefficients A, B, C fitted at five cavity temperatures.' },
  },
  {
    assetTag: 'REF-HYG-01', kind: 'hygrometer', maker: 'Brisk Meteor Devices', model: 'HM-20', serial: 'BMD-20-3390',
    rangeMin: 10, rangeMax: 90, rangeUnit: '%RH', standardUncertainty: 1, uncertaintyUnit: '%RH',
    calibration: { certificateNumber: 'HTS-26-0115', calibrationDate: '2026-01-15', dueDate: '2027-01-15', results: 'Five humidity points at 23 °C.' },
  },
  {
    assetTag: 'REF-AMB-01', kind: 'ambient-sensor', maker: 'Brisk Meteor Devices', model: 'TA-5 room sensor', serial: 'BMD-TA5-1102',
    rangeMin: C(-10), rangeMax: C(50), rangeUnit: 'K', standardUncertainty: 0.1, uncertaintyUnit: 'K',
    calibration: { certificateNumber: 'HTS-26-0116', calibrationDate: '2026-01-16', dueDate: '2027-01-16', results: 'Three points, 15 °C to 30 °C.' },
  },
] as const

/** Certificate addresses and one contact of the three demo customers (names from seed.ts). */
const CUSTOMERS = [
  { name: 'Kestrelmoor Foundry Ltd', addressLines: 'Unit 4, Slagmoor Industrial Estate\nFurnace Lane', city: 'Kestrelmoor', postcode: 'KM4 7QT', country: 'United Kingdom', contact: { name: 'Hollis Carraway', email: 'metrology@kestrelmoor.example', phone: '+44 1632 960 418' } },
  { name: 'Pellucid Float Glass', addressLines: 'Glasshaven Works\nQuay Road 12', city: 'Lumen Bay', postcode: 'LB 2204', country: 'Netherlands', contact: { name: 'Maren Oosterveld', email: 'instruments@pellucid-glass.example', phone: '+31 20 555 0143' } },
  { name: 'Brackenridge Food Processing', addressLines: '88 Millrace Lane', city: 'Brackenridge', postcode: 'BR9 3DF', country: 'Ireland', contact: { name: 'Niamh Ferrity', email: 'qa@brackenridge-foods.example', phone: null } },
] as const

/** An invented 8–14 µm thermopile response: filter edges near 8 and 14 µm on a gently rising detector curve. */
function inventedThermopileCurve(): [number, number][] {
  const points: [number, number][] = []
  for (let l = 7.0; l <= 15.0001; l += 0.25) {
    const rise = 1 / (1 + Math.exp(-(l - 8) / 0.18))
    const fall = 1 / (1 + Math.exp((l - 14) / 0.22))
    const slope = 0.82 + 0.18 * (l - 7) / 8
    points.push([Math.round(l * 100) / 100, Math.round(rise * fall * slope * 10000) / 10000])
  }
  return points
}

interface InstrumentModel {
  maker: string
  model: string
  kind: InstrumentKind
  band: [number, number] | 'table'
  rangeK: [number, number]
  emissivity: number
  resolutionK: number
  accuracy: AccuracySpec
  distanceToSpot: number | null
  intervalMonths: number
  prefix: string
  /** A ratio pyrometer's second band (µm) and its emissivity-ratio setting. */
  band2?: [number, number]
  ratioSetting?: number
}

const MODELS: Record<string, InstrumentModel> = {
  handheld814: { maker: 'Norrvik Instruments', model: 'NIR-814 Handheld', kind: 'spot-infrared', band: [8, 14], rangeK: [C(-30), C(550)], emissivity: 0.95, resolutionK: 0.1, accuracy: { kind: 'greaterOf', a: 1, b: 1 }, distanceToSpot: 12, intervalMonths: 12, prefix: 'NV814' },
  tabulated814: { maker: 'Norrvik Instruments', model: 'NIR-814T Reference', kind: 'spot-infrared', band: 'table', rangeK: [C(-30), C(500)], emissivity: 0.95, resolutionK: 0.1, accuracy: { kind: 'greaterOf', a: 0.75, b: 0.75 }, distanceToSpot: 30, intervalMonths: 12, prefix: 'NV814T' },
  imager: { maker: 'Quillfield Sensing', model: 'QI-320 Imager', kind: 'thermal-imager', band: [8, 14], rangeK: [C(-20), C(350)], emissivity: 0.95, resolutionK: 0.1, accuracy: { kind: 'greaterOf', a: 2, b: 2 }, distanceToSpot: null, intervalMonths: 12, prefix: 'QF320' },
  flame39: { maker: 'Tessaly Thermal', model: 'TX-39 Flame', kind: 'fixed-pyrometer', band: [3.8, 4.0], rangeK: [C(300), C(1300)], emissivity: 1, resolutionK: 1, accuracy: { kind: 'percentPlus', a: 0.5, b: 2 }, distanceToSpot: 50, intervalMonths: 12, prefix: 'TT39' },
  fixed22: { maker: 'Ardent Pyrometry', model: 'AP-22', kind: 'fixed-pyrometer', band: [2.0, 2.4], rangeK: [C(250), C(1000)], emissivity: 1, resolutionK: 0.5, accuracy: { kind: 'greaterOf', a: 0.5, b: 2 }, distanceToSpot: 80, intervalMonths: 12, prefix: 'AP22' },
  fibre16: { maker: 'Ardent Pyrometry', model: 'AP-16F Fibre', kind: 'fibre-optic-pyrometer', band: [1.5, 1.7], rangeK: [C(300), C(1600)], emissivity: 1, resolutionK: 1, accuracy: { kind: 'percentOfReading', a: 0.4 }, distanceToSpot: 100, intervalMonths: 24, prefix: 'AP16' },
  ratio10: { maker: 'Calderon Optics', model: 'CR-10 Ratio', kind: 'ratio-pyrometer', band: [0.95, 1.0], band2: [1.0, 1.05], ratioSetting: 1, rangeK: [C(700), C(2000)], emissivity: 1, resolutionK: 1, accuracy: { kind: 'percentPlus', a: 0.5, b: 3 }, distanceToSpot: 150, intervalMonths: 24, prefix: 'CR10' },
  optical065: { maker: 'Calderon Optics', model: 'CP-065 Optical', kind: 'fixed-pyrometer', band: [0.64, 0.66], rangeK: [C(700), C(2500)], emissivity: 1, resolutionK: 1, accuracy: { kind: 'absolute', b: 5 }, distanceToSpot: 200, intervalMonths: 24, prefix: 'CP065' },
}

/** Which models each customer has, how many, and the tag prefix. */
const FLEETS: { organization: string, tag: string, models: [keyof typeof MODELS, number][] }[] = [
  { organization: 'Kestrelmoor Foundry Ltd', tag: 'KF', models: [['fibre16', 3], ['fixed22', 3], ['ratio10', 2], ['optical065', 2], ['flame39', 2], ['handheld814', 3], ['tabulated814', 1]] },
  { organization: 'Pellucid Float Glass', tag: 'PG', models: [['flame39', 4], ['fixed22', 3], ['handheld814', 3], ['imager', 2]] },
  { organization: 'Brackenridge Food Processing', tag: 'BF', models: [['handheld814', 8], ['imager', 4]] },
]

async function ensureCalibration(t: Transaction, equipmentType: EquipmentType, equipmentId: number, c: { certificateNumber: string, calibrationDate: string, dueDate: string, results: string }): Promise<number> {
  const found = await EquipmentCalibration.findOne({ where: { equipmentType, equipmentId, certificateNumber: c.certificateNumber }, transaction: t })
  if (found) return 0
  const row = await EquipmentCalibration.create({ equipmentType, equipmentId, provider: PROVIDER, ...c, uploadId: null, createdBy: null }, { transaction: t })
  await recordAudit(t, { userId: null, action: 'seed', entity: 'EquipmentCalibration', entityId: row.id, after: snapshot(row) })
  return 1
}

/** Make sure the demo registers exist; returns the number of rows created. */
export async function seedRegisters(t: Transaction): Promise<number> {
  let created = 0

  for (const { calibration, ...spec } of SOURCES) {
    let row = await BlackbodySource.findOne({ where: { assetTag: spec.assetTag }, transaction: t })
    if (!row) {
      row = await BlackbodySource.create({
        ...spec,
        corrections: spec.corrections.map(([a, b]) => [a, b] as [number, number]),
        emissivityTable: spec.emissivityTable ? spec.emissivityTable.map(([l, e, u]) => [l, e, u] as [number, number, number]) : null,
        status: 'in-service',
      }, { transaction: t })
      await recordAudit(t, { userId: null, action: 'seed', entity: 'BlackbodySource', entityId: row.id, after: snapshot(row) })
      created++
    }
    created += await ensureCalibration(t, 'source', row.id, calibration)
  }

  for (const { calibration, ...spec } of REFERENCES) {
    let row = await ReferenceInstrument.findOne({ where: { assetTag: spec.assetTag }, transaction: t })
    if (!row) {
      row = await ReferenceInstrument.create({ ...spec, status: 'in-service', notes: null }, { transaction: t })
      await recordAudit(t, { userId: null, action: 'seed', entity: 'ReferenceInstrument', entityId: row.id, after: snapshot(row) })
      created++
    }
    created += await ensureCalibration(t, 'reference', row.id, calibration)
  }

  const orgs = new Map<string, Organization>()
  for (const spec of CUSTOMERS) {
    const org = await Organization.findOne({ where: { name: spec.name }, transaction: t })
    if (!org) continue
    orgs.set(spec.name, org)
    if (!org.addressLines) {
      const before = snapshot(org)
      org.set({ addressLines: spec.addressLines, city: spec.city, postcode: spec.postcode, country: spec.country })
      await org.save({ transaction: t })
      await recordAudit(t, { userId: null, action: 'seed', entity: 'Organization', entityId: org.id, before, after: snapshot(org) })
    }
    if (!(await Contact.findOne({ where: { organizationId: org.id, email: spec.contact.email }, transaction: t }))) {
      const c = await Contact.create({ organizationId: org.id, ...spec.contact, receivesReminders: true }, { transaction: t })
      await recordAudit(t, { userId: null, action: 'seed', entity: 'Contact', entityId: c.id, after: snapshot(c) })
      created++
    }
  }

  const curve = inventedThermopileCurve()
  const sha256 = crypto.createHash('sha256').update(canonicalResponsivityText(curve)).digest('hex')
  let table = await SpectralResponse.findOne({ where: { sha256 }, transaction: t })
  if (!table) {
    table = await SpectralResponse.create({ name: 'NIR-814T thermopile response (maker data)', sha256, points: normalizeResponsivity(curve) }, { transaction: t })
    await recordAudit(t, { userId: null, action: 'seed', entity: 'SpectralResponse', entityId: table.id, after: snapshot(table) })
    created++
  }

  let n = 0
  for (const fleet of FLEETS) {
    const org = orgs.get(fleet.organization)
    if (!org) continue
    let k = 0
    for (const [key, count] of fleet.models) {
      const m = MODELS[key]!
      for (let i = 1; i <= count; i++) {
        n++
        k++
        const serial = `${m.prefix}-${fleet.tag}${String(1000 + n * 37).padStart(5, '0')}`
        const exists = await Instrument.findOne({ where: { organizationId: org.id, maker: m.maker, model: m.model, serial }, transaction: t })
        if (exists) {
          // a ratio pyrometer recorded with one band before the second was recorded: give it both
          if (m.band2 && exists.band2Lambda1Um == null && exists.band2SpectralResponseId == null && m.band !== 'table') {
            const before = snapshot(exists)
            exists.set({ bandLambda1Um: m.band[0], bandLambda2Um: m.band[1], band2Lambda1Um: m.band2[0], band2Lambda2Um: m.band2[1], emissivityRatioSetting: m.ratioSetting ?? 1 })
            await exists.save({ transaction: t })
            await recordAudit(t, { userId: null, action: 'seed', entity: 'Instrument', entityId: exists.id, before, after: snapshot(exists) })
            created++
          }
          continue
        }
        // Due dates spread over the year after the demo's today (2026-12-01); two are overdue.
        const month = (n * 5) % 12
        const year = month === 11 ? 2026 : 2027
        const nextDueDate = n === 7 || n === 23 ? `2026-${n === 7 ? '10' : '11'}-1${n % 9}` : `${year}-${String(month + 1).padStart(2, '0')}-${String(1 + (n * 3) % 28).padStart(2, '0')}`
        const status: InstrumentStatus = n === 19 ? 'out-of-service' : n === 31 ? 'retired' : 'active'
        const row = await Instrument.create({
          organizationId: org.id,
          serial,
          assetTag: `${fleet.tag}-IR-${String(k).padStart(3, '0')}`,
          maker: m.maker,
          model: m.model,
          kind: m.kind,
          bandLambda1Um: m.band === 'table' ? null : m.band[0],
          bandLambda2Um: m.band === 'table' ? null : m.band[1],
          spectralResponseId: m.band === 'table' ? table.id : null,
          band2Lambda1Um: m.band2?.[0] ?? null,
          band2Lambda2Um: m.band2?.[1] ?? null,
          band2SpectralResponseId: null,
          emissivityRatioSetting: m.band2 ? (m.ratioSetting ?? 1) : null,
          distanceToSpot: m.distanceToSpot,
          rangeMinK: m.rangeK[0],
          rangeMaxK: m.rangeK[1],
          defaultEmissivity: m.emissivity,
          resolutionK: m.resolutionK,
          accuracy: m.accuracy,
          calibrationIntervalMonths: m.intervalMonths,
          status,
          nextDueDate,
          photoUploadId: null,
          notes: null,
        }, { transaction: t })
        await recordAudit(t, { userId: null, action: 'seed', entity: 'Instrument', entityId: row.id, after: snapshot(row) })
        created++
      }
    }
  }
  return created
}
