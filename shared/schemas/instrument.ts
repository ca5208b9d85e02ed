import { z } from 'zod'
import { INSTRUMENT_KINDS, INSTRUMENT_STATUSES, isRatioKind } from '../registers/constants'
import { text, versionSchema } from './common'
import { dateOnlySchema, numberField, optionalText } from './registerQuery'

const percent = numberField('a (% of reading)').positive('a must be above 0 %').max(100, 'a is at most 100 %')
const kelvinTerm = numberField('b (K)').positive('b must be above 0 K').max(1000, 'b is at most 1000 K')

/**
 * A maker's accuracy specification (a in % of reading, b in kelvin):
 * - `absolute`: ± b
 * - `percentOfReading`: ± a % of the reading
 * - `greaterOf`: ± a % of the reading or ± b, whichever is greater
 * - `percentPlus`: ± (a % of the reading + b)
 */
export const accuracySpecSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('absolute'), b: kelvinTerm }),
  z.object({ kind: z.literal('percentOfReading'), a: percent }),
  z.object({ kind: z.literal('greaterOf'), a: percent, b: kelvinTerm }),
  z.object({ kind: z.literal('percentPlus'), a: percent, b: kelvinTerm }),
], { error: 'Accuracy kind is absolute, percentOfReading, greaterOf or percentPlus' })
export type AccuracySpec = z.infer<typeof accuracySpecSchema>

const kelvin = (label: string) => numberField(label).positive(`${label} must be above 0 K`).max(5000, `${label}: at most 5000 K`)
const micrometres = (label: string) => numberField(label).positive(`${label} must be above 0 µm`).max(1000, `${label}: at most 1000 µm`)
const ref = (label: string) => z.number({ error: `${label} must be a number` }).int().positive().nullable()

const instrumentFields = z.object({
  organizationId: z.number({ error: 'Choose the customer' }).int().positive('Choose the customer'),
  serial: text(80, 'Serial'),
  assetTag: optionalText(60),
  maker: text(120, 'Maker'),
  model: text(120, 'Model'),
  kind: z.enum(INSTRUMENT_KINDS, { error: `Kind is one of ${INSTRUMENT_KINDS.join(', ')}` }),
  /** A rectangular band λ1–λ2 in µm … */
  bandLambda1Um: micrometres('Band start').nullable(),
  bandLambda2Um: micrometres('Band end').nullable(),
  /** … or a stored tabulated responsivity. */
  spectralResponseId: ref('The responsivity table'),
  /** A ratio pyrometer's second (long-wavelength) band: a rectangular λ1–λ2 in µm … */
  band2Lambda1Um: micrometres('Band 2 start').nullable(),
  band2Lambda2Um: micrometres('Band 2 end').nullable(),
  /** … or a stored tabulated responsivity. */
  band2SpectralResponseId: ref('The responsivity table of band 2'),
  /** A ratio pyrometer's emissivity-ratio ("slope") setting k, nominally ε₁/ε₂ (1 for a grey source). */
  emissivityRatioSetting: numberField('Emissivity-ratio setting').positive('The emissivity-ratio setting is above 0').max(10, 'The emissivity-ratio setting is at most 10').nullable(),
  /** Distance-to-spot ratio D:S (12 for 12:1). */
  distanceToSpot: numberField('Distance-to-spot ratio').positive('Must be above 0').max(10000).nullable(),
  rangeMinK: kelvin('Range minimum'),
  rangeMaxK: kelvin('Range maximum'),
  defaultEmissivity: numberField('Emissivity setting').gt(0, 'The emissivity setting is above 0').max(1, 'The emissivity setting is at most 1'),
  resolutionK: numberField('Display resolution').positive('Resolution must be above 0 K').max(100),
  accuracy: accuracySpecSchema,
  calibrationIntervalMonths: z.number({ error: 'Interval must be a number of months' }).int('Whole months').min(1, 'At least 1 month').max(120, 'At most 120 months'),
  status: z.enum(INSTRUMENT_STATUSES, { error: `Status is one of ${INSTRUMENT_STATUSES.join(', ')}` }),
  nextDueDate: dateOnlySchema.nullable(),
  /** An upload with purpose `instrument-photo` of the same organization. */
  photoUploadId: ref('The label photo'),
  notes: optionalText(4000),
})
type InstrumentShape = z.infer<typeof instrumentFields>

function instrumentRules(v: Partial<InstrumentShape>, ctx: z.RefinementCtx) {
  if (v.rangeMinK !== undefined && v.rangeMaxK !== undefined && !(v.rangeMaxK > v.rangeMinK)) {
    ctx.addIssue({ code: 'custom', path: ['rangeMaxK'], message: 'The maximum must be above the minimum' })
  }
  const l1 = v.bandLambda1Um ?? null
  const l2 = v.bandLambda2Um ?? null
  const table = v.spectralResponseId ?? null
  if ((l1 === null) !== (l2 === null)) {
    ctx.addIssue({ code: 'custom', path: [l1 === null ? 'bandLambda1Um' : 'bandLambda2Um'], message: 'Give both ends of the band' })
  }
  else if (l1 !== null && l2 !== null) {
    if (!(l2 > l1)) ctx.addIssue({ code: 'custom', path: ['bandLambda2Um'], message: 'The band end must be above its start' })
    if (table !== null) ctx.addIssue({ code: 'custom', path: ['spectralResponseId'], message: 'Give either a rectangular band or a responsivity table, not both' })
  }
  else if (table === null) {
    ctx.addIssue({ code: 'custom', path: ['bandLambda1Um'], message: 'Give the spectral band (λ1 and λ2) or a responsivity table' })
  }
  ratioRules(v, ctx)
}

/**
 * A ratio (two-colour) pyrometer has a second band (rectangular or a table, like the first) at longer
 * wavelengths than the first, and its emissivity-ratio setting; no other kind has either.
 */
function ratioRules(v: Partial<InstrumentShape>, ctx: z.RefinementCtx) {
  const m1 = v.band2Lambda1Um ?? null
  const m2 = v.band2Lambda2Um ?? null
  const table2 = v.band2SpectralResponseId ?? null
  const k = v.emissivityRatioSetting ?? null
  if (v.kind === undefined) return
  if (!isRatioKind(v.kind)) {
    if (m1 !== null || m2 !== null || table2 !== null) ctx.addIssue({ code: 'custom', path: [table2 !== null ? 'band2SpectralResponseId' : m1 !== null ? 'band2Lambda1Um' : 'band2Lambda2Um'], message: 'Only a ratio pyrometer has a second band' })
    if (k !== null) ctx.addIssue({ code: 'custom', path: ['emissivityRatioSetting'], message: 'Only a ratio pyrometer has an emissivity-ratio setting' })
    return
  }
  if ((m1 === null) !== (m2 === null)) {
    ctx.addIssue({ code: 'custom', path: [m1 === null ? 'band2Lambda1Um' : 'band2Lambda2Um'], message: 'Give both ends of band 2' })
  }
  else if (m1 !== null && m2 !== null) {
    if (!(m2 > m1)) ctx.addIssue({ code: 'custom', path: ['band2Lambda2Um'], message: 'The end of band 2 must be above its start' })
    if (table2 !== null) ctx.addIssue({ code: 'custom', path: ['band2SpectralResponseId'], message: 'Give band 2 either as a rectangular band or as a responsivity table, not both' })
    const l2 = v.bandLambda2Um ?? null
    if (l2 !== null && m1 < l2) ctx.addIssue({ code: 'custom', path: ['band2Lambda1Um'], message: `Band 2 must lie at longer wavelengths than band 1 (band 1 ends at ${l2} µm)` })
  }
  else if (table2 === null) {
    ctx.addIssue({ code: 'custom', path: ['band2Lambda1Um'], message: 'A ratio pyrometer needs its second band (λ1 and λ2) or a responsivity table for it' })
  }
  if (k === null) ctx.addIssue({ code: 'custom', path: ['emissivityRatioSetting'], message: 'Give the emissivity-ratio (slope) setting, 1 for a grey source' })
}

/** POST /api/instruments (also one CSV row of an import). */
export const instrumentCreateSchema = instrumentFields
  .extend({
    assetTag: optionalText(60).default(null),
    bandLambda1Um: instrumentFields.shape.bandLambda1Um.optional().default(null),
    bandLambda2Um: instrumentFields.shape.bandLambda2Um.optional().default(null),
    spectralResponseId: instrumentFields.shape.spectralResponseId.optional().default(null),
    distanceToSpot: instrumentFields.shape.distanceToSpot.optional().default(null),
    band2Lambda1Um: instrumentFields.shape.band2Lambda1Um.optional().default(null),
    band2Lambda2Um: instrumentFields.shape.band2Lambda2Um.optional().default(null),
    band2SpectralResponseId: instrumentFields.shape.band2SpectralResponseId.optional().default(null),
    emissivityRatioSetting: instrumentFields.shape.emissivityRatioSetting.optional().default(null),
    status: instrumentFields.shape.status.default('active'),
    nextDueDate: instrumentFields.shape.nextDueDate.optional().default(null),
    photoUploadId: instrumentFields.shape.photoUploadId.optional().default(null),
    notes: optionalText(4000).default(null),
  })
  .superRefine(instrumentRules)
export type InstrumentCreateInput = z.infer<typeof instrumentCreateSchema>

/** PATCH /api/instruments/[id]: any subset, with the version last seen. The server re-checks the merged record. */
export const instrumentUpdateSchema = instrumentFields.partial().extend({ version: versionSchema })
export type InstrumentUpdateInput = z.infer<typeof instrumentUpdateSchema>

/** POST /api/responsivities: a name and the CSV text of the table (wavelength µm, relative response). */
export const responsivityCreateSchema = z.object({
  name: text(120, 'Name'),
  csv: z.string({ error: 'Choose the CSV file of the table' }).min(1, 'Choose the CSV file of the table').max(2_000_000, 'At most 2 MB'),
})
export type ResponsivityCreateInput = z.infer<typeof responsivityCreateSchema>
