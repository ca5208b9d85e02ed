/**
 * Inputs of the run routes (server/api/runs): run header, points, CSV import, review.
 * Temperatures in kelvin, humidity in %RH, distance in mm.
 */
import { z } from 'zod'
import { MAX_READINGS, PLACES_OF_CALIBRATION, POINT_STAGES, RUN_SORTS, RUN_STATUSES } from '../calibration/constants'
import { pageQuerySchema, versionSchema } from './common'
import { dateOnlySchema, numberField, optionalText } from './registerQuery'

const kelvin = (label: string) => numberField(label).positive(`${label} must be above 0 K`).max(5000, `${label}: at most 5000 K`)
const emissivity = (label: string) => numberField(label).gt(0, `${label} must be above 0`).max(1, `${label} cannot exceed 1`)
const id = (label: string) => z.number({ error: `${label} must be a number` }).int(`${label} must be a whole number`).positive(`${label} must be positive`)

/** Why a record changed after submission (ISO/IEC 17025 7.5.2): required then, ignored before. */
export const reasonSchema = z.string({ error: 'The reason must be text' }).trim().max(2000, 'At most 2000 characters').optional()
  .transform(v => (v ? v : undefined))

/** A measured condition: a number when entered, null when not (yet); never a default. */
const measured = <T extends z.ZodNumber>(n: T) => n.nullable()

/** The name of the region of interest whose readings are a thermal imager's point readings. */
export const CENTRE_ROI = 'centre'
/** Most regions of interest per point, and most frames per ROI in a NETD series. */
export const MAX_ROIS = 25
export const MAX_NETD_FRAMES = 1000

const pixels = (label: string, min: number) => z.number({ error: `${label} must be a number of pixels` }).int(`${label} is a whole number of pixels`).min(min, `${label} is at least ${min} px`).max(100_000, `${label} is at most 100000 px`)
const roiName = z.string({ error: 'Name the region of interest' }).trim().min(1, 'Name the region of interest').max(40, 'At most 40 characters')

/** A thermal imager's settings in the run: lens and field of view, range setting, non-uniformity correction (IEC TS 63144-1, VDI/VDE 5585 list them for a certificate). */
export const imagerSettingsSchema = z.object({
  lens: z.string({ error: 'Describe the lens' }).trim().min(1, 'Describe the lens (e.g. "standard 24° lens")').max(200, 'At most 200 characters'),
  fieldOfView: z.string({ error: 'Give the field of view' }).trim().min(1, 'Give the field of view (e.g. "24° × 18°")').max(200, 'At most 200 characters'),
  rangeSetting: z.string({ error: 'Give the range setting' }).trim().min(1, 'Give the range setting (e.g. "−20 °C to 150 °C")').max(200, 'At most 200 characters'),
  nonUniformityCorrection: z.boolean({ error: 'Say whether a non-uniformity correction (NUC) was done (true or false)' }),
}, { error: 'imagerSettings is { lens, fieldOfView, rangeSetting, nonUniformityCorrection }' })
export type ImagerSettings = z.infer<typeof imagerSettingsSchema>

/**
 * The calibration equation a certificate states (spot and reference pyrometers): the reference
 * temperatures of its table (K, strictly increasing, inside the calibrated range when the points are
 * in) and the correlation coefficient between the points' errors (0: independent; a shared reference
 * makes them correlated), r in [0, 1).
 */
export const calibrationEquationSettingsSchema = z.object({
  temperaturesK: z.array(kelvin('Table temperature'), { error: 'temperaturesK is a list of temperatures in K' }).min(1, 'Give at least one temperature for the table').max(40, 'At most 40 temperatures'),
  pointCorrelation: numberField('The correlation between the points').min(0, 'The correlation between the points is from 0 to below 1').lt(1, 'The correlation between the points is below 1').default(0),
}, { error: 'calibrationEquation is { temperaturesK, pointCorrelation }' }).superRefine((v, ctx) => {
  for (let i = 1; i < v.temperaturesK.length; i++) {
    if (!(v.temperaturesK[i]! > v.temperaturesK[i - 1]!)) {
      ctx.addIssue({ code: 'custom', path: ['temperaturesK', i], message: 'The table temperatures must increase' })
      return
    }
  }
})
export type CalibrationEquationSettings = z.infer<typeof calibrationEquationSettingsSchema>

const headerFields = z.object({
  calibrationDate: dateOnlySchema,
  ambientTemperatureK: measured(kelvin('Ambient temperature').min(200, 'An ambient temperature below 200 K (−73.15 °C) is not a laboratory').max(350, 'An ambient temperature above 350 K (76.85 °C) is not a laboratory')),
  relativeHumidityPct: measured(numberField('Relative humidity').min(0, 'Relative humidity is 0 to 100 %RH').max(100, 'Relative humidity is 0 to 100 %RH')),
  distanceMm: measured(numberField('Distance').positive('The distance must be above 0 mm').max(100_000, 'The distance is at most 100 m')),
  /** The spot diameter at the measuring distance, mm, when the maker states one (fixed-focus instruments); null: from the instrument's D:S. */
  spotDiameterMm: numberField('Spot diameter').positive('The spot diameter is above 0 mm').max(10_000, 'The spot diameter is at most 10000 mm').nullable(),
  emissivitySetting: measured(emissivity('The emissivity setting')),
  reflectedTemperatureK: measured(kelvin('Reflected temperature')),
  instrumentTemperatureK: measured(kelvin('Instrument temperature')),
  /** A ratio pyrometer's emissivity-ratio ("slope") setting k during the run. */
  emissivityRatioSetting: measured(numberField('The emissivity-ratio setting').positive('The emissivity-ratio setting is above 0').max(10, 'The emissivity-ratio setting is at most 10')),
  /** A thermal imager's lens, field of view, range setting and NUC; null until entered. */
  imagerSettings: imagerSettingsSchema.nullable(),
  /** The calibration equation's table for the certificate (spot and reference pyrometers); null: none. */
  calibrationEquation: calibrationEquationSettingsSchema.nullable(),
  /** The reference instrument (thermometer, hygrometer) that measured the ambient conditions. */
  ambientInstrumentId: id('Ambient conditions instrument').nullable(),
  adjusted: z.boolean({ error: 'Say whether the instrument was adjusted (true or false)' }),
  /** The laboratory's own notes: never printed, never shown to the customer. */
  internalNotes: optionalText(4000),
  /** Printed on the certificate as its remarks. */
  certificateRemarks: optionalText(2000),
  /** Deviations from the method (printed on the certificate). */
  methodDeviations: optionalText(2000),
  placeOfCalibration: z.enum(PLACES_OF_CALIBRATION, { error: 'In the laboratory or on site' }),
  siteAddress: optionalText(600),
  procedureVersionId: id('Procedure'),
})

/** POST /api/runs: the technician is the signed-in user. Conditions are entered when measured. */
export const runCreateSchema = headerFields
  .extend({
    instrumentId: id('Instrument'),
    ambientTemperatureK: headerFields.shape.ambientTemperatureK.optional().default(null),
    relativeHumidityPct: headerFields.shape.relativeHumidityPct.optional().default(null),
    distanceMm: headerFields.shape.distanceMm.optional().default(null),
    spotDiameterMm: headerFields.shape.spotDiameterMm.optional().default(null),
    emissivitySetting: headerFields.shape.emissivitySetting.optional().default(null),
    reflectedTemperatureK: headerFields.shape.reflectedTemperatureK.optional().default(null),
    instrumentTemperatureK: headerFields.shape.instrumentTemperatureK.optional().default(null),
    emissivityRatioSetting: headerFields.shape.emissivityRatioSetting.optional().default(null),
    imagerSettings: headerFields.shape.imagerSettings.optional().default(null),
    calibrationEquation: headerFields.shape.calibrationEquation.optional().default(null),
    ambientInstrumentId: headerFields.shape.ambientInstrumentId.optional().default(null),
    adjusted: headerFields.shape.adjusted.default(false),
    internalNotes: optionalText(4000).default(null),
    certificateRemarks: optionalText(2000).default(null),
    methodDeviations: optionalText(2000).default(null),
    placeOfCalibration: headerFields.shape.placeOfCalibration.default('laboratory'),
    siteAddress: optionalText(600).default(null),
  })
  .superRefine(siteRule)
export type RunCreateInput = z.infer<typeof runCreateSchema>

function siteRule(v: { placeOfCalibration?: string, siteAddress?: string | null }, ctx: z.RefinementCtx) {
  if (v.placeOfCalibration === 'on-site' && v.siteAddress === null) ctx.addIssue({ code: 'custom', path: ['siteAddress'], message: 'Give the address of the site' })
}

/** PATCH /api/runs/[id]: any header subset, the version last seen, and a reason once the run was submitted. */
export const runUpdateSchema = headerFields
  .partial()
  .extend({ version: versionSchema, reason: reasonSchema })
  .superRefine(siteRule)
export type RunUpdateInput = z.infer<typeof runUpdateSchema>

/** POST /api/runs/[id]/void and …/points/[pointId]/void: why the run or point is set aside. */
export const voidSchema = z.object({
  version: versionSchema,
  reason: z.string({ error: 'Say why' }).trim().min(3, 'Say why it is voided').max(2000, 'At most 2000 characters'),
})
export type VoidInput = z.infer<typeof voidSchema>

/** POST /api/runs/[id]/receipt: the receipt of the item (ISO/IEC 17025 7.4); `version` when it replaces one. */
export const receiptSchema = z.object({
  receivedOn: dateOnlySchema,
  packaging: z.string({ error: 'Describe the packaging' }).trim().min(1, 'Describe the packaging (e.g. "Maker\'s case, intact")').max(1000),
  condition: z.string({ error: 'Describe the condition' }).trim().min(1, 'Describe the physical condition as received').max(2000),
  accessories: optionalText(1000).default(null),
  deviations: optionalText(2000).default(null),
  customerConsulted: z.boolean({ error: 'Was the customer consulted?' }).default(false),
  customerDecision: optionalText(2000).default(null),
  version: versionSchema.optional(),
  reason: reasonSchema,
}).superRefine((v, ctx) => {
  if (v.customerConsulted && !v.customerDecision) ctx.addIssue({ code: 'custom', path: ['customerDecision'], message: 'Record what the customer decided' })
  if (v.deviations && !v.customerConsulted) ctx.addIssue({ code: 'custom', path: ['customerConsulted'], message: 'A deviation found on receipt is referred to the customer (ISO/IEC 17025 7.4.3): record that they were consulted' })
})
export type ReceiptInput = z.infer<typeof receiptSchema>

const readingsSchema = z
  .array(kelvin('Reading'), { error: 'The readings are a list of temperatures in K' })
  .min(1, 'Give at least one reading')
  .max(MAX_READINGS, `At most ${MAX_READINGS} readings`)

/** One region of interest at a point: name, top-left corner and size in pixels, its readings (K). */
export const roiSchema = z.object({
  name: roiName,
  xPx: pixels('x', 0),
  yPx: pixels('y', 0),
  widthPx: pixels('Width', 1),
  heightPx: pixels('Height', 1),
  readingsK: readingsSchema,
}, { error: 'Each region of interest is { name, xPx, yPx, widthPx, heightPx, readingsK }' })
export type RoiInput = z.infer<typeof roiSchema>

/** One ROI's frame series on a uniform source (K), for the NETD. */
export const roiFramesSchema = z.object({
  name: roiName,
  framesK: z.array(kelvin('Frame'), { error: 'framesK is a list of temperatures in K' }).min(2, 'At least two frames').max(MAX_NETD_FRAMES, `At most ${MAX_NETD_FRAMES} frames`),
}, { error: 'Each frame series is { name, framesK }' })
export type RoiFramesInput = z.infer<typeof roiFramesSchema>

function uniqueNames(list: readonly { name: string }[], field: string, ctx: z.RefinementCtx) {
  const seen = new Set<string>()
  list.forEach((r, i) => {
    if (seen.has(r.name)) ctx.addIssue({ code: 'custom', path: [field, i, 'name'], message: `'${r.name}' is used by another region of interest` })
    seen.add(r.name)
  })
}

const roisSchema = z.array(roiSchema, { error: 'rois is a list of regions of interest' }).min(1, `Give the regions of interest, '${CENTRE_ROI}' among them`).max(MAX_ROIS, `At most ${MAX_ROIS} regions of interest`)
const netdFramesSchema = z.array(roiFramesSchema, { error: 'netdFrames is a list of { name, framesK }' }).min(1, 'Give at least one frame series').max(MAX_ROIS, `At most ${MAX_ROIS} frame series`)

const pointFields = z.object({
  stage: z.enum(POINT_STAGES, { error: 'The stage is as found or as left' }),
  sourceId: id('Source'),
  setPointK: kelvin('Set-point'),
  /** The source's indicated temperature; the certificate's correction is added to it … */
  sourceIndicatedK: kelvin('Source indicated temperature').nullable(),
  /** … or a reference thermometer in (or viewing) the source gives the reference temperature. */
  referenceInstrumentId: id('Reference thermometer').nullable(),
  referenceReadingK: kelvin('Reference reading').nullable(),
  readingsK: readingsSchema,
  /** A thermal imager's regions of interest; the centre ROI's readings are the point's readings. */
  rois: roisSchema.nullable(),
  /** A thermal imager's frame series on the uniform source, per ROI, for the NETD. */
  netdFrames: netdFramesSchema.nullable(),
})
type PointShape = z.infer<typeof pointFields>

/**
 * A thermal imager's point: the ROIs have unique names and one is the centre, whose readings are the
 * point's readings (sent or not); a frame series belongs to a point with ROIs.
 */
export function pointRoiRules(v: Partial<Omit<PointShape, 'readingsK'>> & { readingsK?: number[] }, ctx: z.RefinementCtx) {
  const rois = v.rois ?? null
  if (rois) {
    uniqueNames(rois, 'rois', ctx)
    const centre = rois.find(r => r.name === CENTRE_ROI)
    if (!centre) ctx.addIssue({ code: 'custom', path: ['rois'], message: `One region of interest must be named '${CENTRE_ROI}': its readings are the point's readings` })
    else if (v.readingsK !== undefined && (v.readingsK.length !== centre.readingsK.length || v.readingsK.some((r, i) => r !== centre.readingsK[i]))) {
      ctx.addIssue({ code: 'custom', path: ['readingsK'], message: `A thermal imager's readings are those of its '${CENTRE_ROI}' region of interest: leave them out or send the same` })
    }
  }
  else if (v.readingsK === undefined) {
    ctx.addIssue({ code: 'custom', path: ['readingsK'], message: 'Give at least one reading' })
  }
  if (v.netdFrames) {
    if (!rois) ctx.addIssue({ code: 'custom', path: ['netdFrames'], message: 'A frame series for the NETD belongs to a thermal imager\'s point with regions of interest' })
    uniqueNames(v.netdFrames, 'netdFrames', ctx)
  }
}

/** Exactly one way to the reference temperature. */
export function pointReferenceRules(v: Partial<PointShape>, ctx: z.RefinementCtx) {
  const viaSource = v.sourceIndicatedK != null
  const viaRef = v.referenceInstrumentId != null || v.referenceReadingK != null
  if (!viaSource && !viaRef) {
    ctx.addIssue({ code: 'custom', path: ['sourceIndicatedK'], message: "Give the source's indicated temperature, or a reference thermometer and its reading" })
  }
  else if (viaSource && viaRef) {
    ctx.addIssue({ code: 'custom', path: ['referenceInstrumentId'], message: "Give either the source's indicated temperature or a reference thermometer reading, not both" })
  }
  else if (viaRef) {
    if (v.referenceInstrumentId == null) ctx.addIssue({ code: 'custom', path: ['referenceInstrumentId'], message: 'Name the reference thermometer that gave the reading' })
    if (v.referenceReadingK == null) ctx.addIssue({ code: 'custom', path: ['referenceReadingK'], message: "Give the reference thermometer's reading" })
  }
}

/** POST /api/runs/[id]/points (also one CSV row of an import, after asset tags are resolved). */
export const pointCreateSchema = pointFields
  .extend({
    stage: pointFields.shape.stage.default('as-found'),
    sourceIndicatedK: pointFields.shape.sourceIndicatedK.optional().default(null),
    referenceInstrumentId: pointFields.shape.referenceInstrumentId.optional().default(null),
    referenceReadingK: pointFields.shape.referenceReadingK.optional().default(null),
    readingsK: readingsSchema.optional(),
    rois: pointFields.shape.rois.optional().default(null),
    netdFrames: pointFields.shape.netdFrames.optional().default(null),
    reason: reasonSchema,
  })
  .superRefine(pointReferenceRules)
  .superRefine(pointRoiRules)
  // a thermal imager's point reads at its centre ROI
  .transform(v => ({ ...v, readingsK: v.readingsK ?? v.rois?.find(r => r.name === CENTRE_ROI)?.readingsK ?? [] }))
export type PointCreateInput = z.infer<typeof pointCreateSchema>

/** PATCH /api/runs/[id]/points/[pointId]: any subset, the point's version, a reason once the run was submitted. */
export const pointUpdateSchema = pointFields.partial().extend({ version: versionSchema, reason: reasonSchema })
export type PointUpdateInput = z.infer<typeof pointUpdateSchema>

/** Route parameters of a point. */
export const pointParamSchema = z.object({
  id: z.coerce.number({ error: 'Must be a number' }).int('Must be a whole number').positive('Must be positive'),
  pointId: z.coerce.number({ error: 'Must be a number' }).int('Must be a whole number').positive('Must be positive'),
})

/** POST /api/runs/[id]/points/import: without `commit` a preview; with it every row or none. */
export const pointImportSchema = z.object({
  csv: z.string({ error: 'csv is required' }).min(1, 'The file is empty').max(1_000_000, 'At most 1 MB of CSV'),
  commit: z.boolean({ error: 'commit must be true or false' }).default(false),
  reason: reasonSchema,
})
export type PointImportInput = z.infer<typeof pointImportSchema>

/** POST /api/runs/[id]/submit and /approve: the version last seen. */
export const runActionSchema = z.object({ version: versionSchema })
export type RunActionInput = z.infer<typeof runActionSchema>

/** POST /api/runs/[id]/return */
export const runReturnSchema = z.object({
  version: versionSchema,
  comments: z.string({ error: 'Comments are required' }).trim().min(1, 'Say what must be corrected').max(4000, 'At most 4000 characters'),
})
export type RunReturnInput = z.infer<typeof runReturnSchema>

/** POST /api/runs/[id]/points/[pointId]/monte-carlo */
export const pointMonteCarloSchema = z.object({
  trials: z.number({ error: 'trials must be a number' }).int('trials must be a whole number').min(10_000, 'At least 10000 trials').max(2_000_000, 'At most 2000000 trials').default(200_000),
  seed: z.number({ error: 'seed must be a number' }).int().min(0).max(0xffffffff).default(1),
  /**
   * The adaptive procedure of JCGM 101 7.9 instead of a fixed number of trials: batches of 10⁴ trials
   * until the mean, u and the interval ends are stable to the numerical tolerance of u (n_dig significant
   * digits, default 2); at most 2 × 10⁶ trials. `true` or `{ significantDigits }`; `trials` is then ignored.
   */
  adaptive: z.union([
    z.boolean({ error: 'adaptive is true, false or { significantDigits }' }),
    z.object({ significantDigits: z.number({ error: 'significantDigits must be a number' }).int('significantDigits is 1 or 2').min(1, 'significantDigits is 1 or 2').max(2, 'significantDigits is 1 or 2') }, { error: 'adaptive is true, false or { significantDigits }' }),
  ], { error: 'adaptive is true, false or { significantDigits }' }).optional().default(false),
})
export type PointMonteCarloInput = z.infer<typeof pointMonteCarloSchema>

/** GET /api/runs */
export const runQuerySchema = pageQuerySchema.extend({
  status: z.enum(RUN_STATUSES, { error: `status is one of ${RUN_STATUSES.join(', ')}` }).optional(),
  instrumentId: z.coerce.number({ error: 'Must be a number' }).int().positive().optional(),
  technicianId: z.coerce.number({ error: 'Must be a number' }).int().positive().optional(),
  sort: z.enum(RUN_SORTS, { error: `sort is one of ${RUN_SORTS.join(', ')}` }).default('calibrationDate'),
  dir: z.enum(['asc', 'desc'], { error: 'dir is asc or desc' }).default('desc'),
})
export type RunQuery = z.infer<typeof runQuerySchema>
