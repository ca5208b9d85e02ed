/**
 * Inputs of the run routes (server/api/runs): run header, points, CSV import, review.
 * Temperatures in kelvin, humidity in %RH, distance in mm.
 */
import { z } from 'zod'
import { MAX_READINGS, POINT_STAGES, RUN_SORTS, RUN_STATUSES } from '../calibration/constants'
import { pageQuerySchema, versionSchema } from './common'
import { dateOnlySchema, numberField, optionalText } from './registerQuery'

const kelvin = (label: string) => numberField(label).positive(`${label} must be above 0 K`).max(5000, `${label}: at most 5000 K`)
const emissivity = (label: string) => numberField(label).gt(0, `${label} must be above 0`).max(1, `${label} cannot exceed 1`)
const id = (label: string) => z.number({ error: `${label} must be a number` }).int(`${label} must be a whole number`).positive(`${label} must be positive`)

/** Why a record changed after submission (ISO/IEC 17025 7.5.2): required then, ignored before. */
export const reasonSchema = z.string({ error: 'The reason must be text' }).trim().max(2000, 'At most 2000 characters').optional()
  .transform(v => (v ? v : undefined))

const headerFields = z.object({
  receivedDate: dateOnlySchema,
  calibrationDate: dateOnlySchema,
  ambientTemperatureK: kelvin('Ambient temperature').min(200, 'An ambient temperature below 200 K (−73.15 °C) is not a laboratory').max(350, 'An ambient temperature above 350 K (76.85 °C) is not a laboratory'),
  relativeHumidityPct: numberField('Relative humidity').min(0, 'Relative humidity is 0 to 100 %RH').max(100, 'Relative humidity is 0 to 100 %RH'),
  distanceMm: numberField('Distance').positive('The distance must be above 0 mm').max(100_000, 'The distance is at most 100 m'),
  emissivitySetting: emissivity('The emissivity setting'),
  reflectedTemperatureK: kelvin('Reflected temperature'),
  instrumentTemperatureK: kelvin('Instrument temperature'),
  adjusted: z.boolean({ error: 'Say whether the instrument was adjusted (true or false)' }),
  notes: optionalText(4000),
  procedureVersionId: id('Procedure'),
})

function dateOrder(v: { receivedDate?: string, calibrationDate?: string }, ctx: z.RefinementCtx) {
  if (v.receivedDate && v.calibrationDate && v.calibrationDate < v.receivedDate) {
    ctx.addIssue({ code: 'custom', path: ['calibrationDate'], message: 'The calibration date cannot be before the date the item was received' })
  }
}

/** POST /api/runs: the technician is the signed-in user; the emissivity setting defaults to the instrument's. */
export const runCreateSchema = headerFields
  .extend({
    instrumentId: id('Instrument'),
    emissivitySetting: headerFields.shape.emissivitySetting.optional(),
    adjusted: headerFields.shape.adjusted.default(false),
    notes: optionalText(4000).default(null),
  })
  .superRefine(dateOrder)
export type RunCreateInput = z.infer<typeof runCreateSchema>

/** PATCH /api/runs/[id]: any header subset, the version last seen, and a reason once the run was submitted. */
export const runUpdateSchema = headerFields
  .partial()
  .extend({ version: versionSchema, reason: reasonSchema })
  .superRefine(dateOrder)
export type RunUpdateInput = z.infer<typeof runUpdateSchema>

const readingsSchema = z
  .array(kelvin('Reading'), { error: 'The readings are a list of temperatures in K' })
  .min(1, 'Give at least one reading')
  .max(MAX_READINGS, `At most ${MAX_READINGS} readings`)

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
})
type PointShape = z.infer<typeof pointFields>

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
    reason: reasonSchema,
  })
  .superRefine(pointReferenceRules)
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
