import { z } from 'zod'
import { CERTIFIED_BASES, CERTIFIED_BASIS_LABELS, DEFAULT_CERTIFIED_BASIS, EQUIPMENT_STATUSES, SOURCE_KINDS, WAVELENGTH_MEDIA } from '../registers/constants'
import { tableProblems } from '../registers/correction'
import { text, versionSchema } from './common'
import { numberField, optionalText } from './registerQuery'

const kelvin = (label: string) => numberField(label).positive(`${label} must be above 0 K`).max(4000, `${label}: at most 4000 K`)

/** A certificate's set-point corrections: rows `[setPointK, correctionK]`, set-points increasing. */
export const correctionTableSchema = z
  .array(z.tuple([kelvin('Set-point'), numberField('Correction').min(-100).max(100)], { error: 'Each row is [setPointK, correctionK]' }), { error: 'corrections is a list of [setPointK, correctionK]' })
  .max(500, 'At most 500 rows')
  .superRefine((rows, ctx) => {
    if (rows.length === 0) return
    const problem = tableProblems(rows)[0]
    if (problem) ctx.addIssue({ code: 'custom', message: problem })
  })

/**
 * The source's emissivity over wavelength: rows `[λ µm, ε, u(ε) k = 1]`, wavelengths increasing (2 to 50
 * rows). A point uses it when the instrument's band lies inside the table (shared/calibration/setup.ts).
 */
export const emissivityTableSchema = z
  .array(
    z.tuple([
      numberField('Wavelength').positive('A wavelength is above 0 µm').max(1000, 'At most 1000 µm'),
      numberField('Emissivity').gt(0, 'Emissivity is above 0').max(1, 'Emissivity is at most 1'),
      numberField('Uncertainty').min(0, 'An uncertainty is 0 or more').max(0.5, 'At most 0.5'),
    ], { error: 'Each row is [wavelength µm, emissivity, standard uncertainty]' }),
    { error: 'emissivityTable is a list of [wavelength µm, emissivity, standard uncertainty]' },
  )
  .min(2, 'An emissivity table needs at least two wavelengths')
  .max(50, 'At most 50 rows')
  .superRefine((rows, ctx) => {
    for (let i = 1; i < rows.length; i++) {
      if (!(rows[i]![0] > rows[i - 1]![0])) {
        ctx.addIssue({ code: 'custom', path: [i, 0], message: `Wavelengths must increase: row ${i + 1} (${rows[i]![0]} µm) is not above row ${i}` })
        return
      }
    }
  })

const sourceFields = z.object({
  assetTag: text(60, 'Asset tag'),
  kind: z.enum(SOURCE_KINDS, { error: `Kind is one of ${SOURCE_KINDS.join(', ')}` }),
  maker: text(120, 'Maker'),
  model: text(120, 'Model'),
  serial: text(80, 'Serial'),
  /** Aperture (cavity) or plate diameter, mm. */
  apertureMm: numberField('Aperture').positive('Aperture must be above 0 mm').max(2000),
  minTemperatureK: kelvin('Minimum temperature'),
  maxTemperatureK: kelvin('Maximum temperature'),
  emissivity: numberField('Emissivity').gt(0, 'Emissivity is above 0').max(1, 'Emissivity is at most 1'),
  /** Standard uncertainty of the emissivity (k = 1). */
  emissivityU: numberField('Emissivity uncertainty').min(0).max(0.5),
  emissivityBandLambda1Um: numberField('Band start').positive().max(1000).nullable(),
  emissivityBandLambda2Um: numberField('Band end').positive().max(1000).nullable(),
  uniformityK: numberField('Uniformity').min(0).max(100),
  stabilityK: numberField('Stability').min(0).max(100),
  emissivityTable: emissivityTableSchema.nullable(),
  corrections: correctionTableSchema,
  /** What the corrected value of the current certificate is (shared/registers/constants.ts CERTIFIED_BASES). */
  certifiedBasis: z.enum(CERTIFIED_BASES, { error: `The certified value is one of ${CERTIFIED_BASES.join(', ')}` }),
  /** A radiance temperature's band, µm, its wavelengths in vacuum or in air. */
  certifiedBandLambda1Um: numberField('Band start').positive('A wavelength is above 0 µm').max(1000).nullable(),
  certifiedBandLambda2Um: numberField('Band end').positive('A wavelength is above 0 µm').max(1000).nullable(),
  certifiedBandMedium: z.enum(WAVELENGTH_MEDIA, { error: 'The wavelengths are in vacuum or in air' }).nullable(),
  /** The surroundings' temperature when the radiance temperature was certified (T_w0). */
  certifiedReflectedTemperatureK: kelvin('Surroundings’ temperature at calibration').nullable(),
  /** The certificate's expanded uncertainty U of the corrected value and its coverage factor k. */
  certifiedExpandedUncertaintyK: numberField('Certified uncertainty').positive('The certified uncertainty is above 0 K').max(100, 'At most 100 K').nullable(),
  certifiedCoverageFactor: numberField('Coverage factor').positive('The coverage factor is above 0').max(10, 'The coverage factor is at most 10').nullable(),
  status: z.enum(EQUIPMENT_STATUSES, { error: `Status is one of ${EQUIPMENT_STATUSES.join(', ')}` }),
  notes: optionalText(4000),
})

type SourceShape = z.infer<typeof sourceFields>

function sourceRules(v: Partial<SourceShape>, ctx: z.RefinementCtx) {
  if (v.minTemperatureK !== undefined && v.maxTemperatureK !== undefined && !(v.maxTemperatureK > v.minTemperatureK)) {
    ctx.addIssue({ code: 'custom', path: ['maxTemperatureK'], message: 'The maximum must be above the minimum' })
  }
  const l1 = v.emissivityBandLambda1Um
  const l2 = v.emissivityBandLambda2Um
  if ((l1 == null) !== (l2 == null)) {
    ctx.addIssue({ code: 'custom', path: [l1 == null ? 'emissivityBandLambda1Um' : 'emissivityBandLambda2Um'], message: 'Give both ends of the band, or neither' })
  }
  else if (l1 != null && l2 != null && !(l2 > l1)) {
    ctx.addIssue({ code: 'custom', path: ['emissivityBandLambda2Um'], message: 'The band end must be above its start' })
  }
  const rows = v.corrections ?? []
  if (rows.length && v.minTemperatureK !== undefined && v.maxTemperatureK !== undefined) {
    const out = rows.findIndex(([t]) => t < v.minTemperatureK! - 1e-9 || t > v.maxTemperatureK! + 1e-9)
    if (out >= 0) ctx.addIssue({ code: 'custom', path: ['corrections', out, 0], message: 'Set-point outside the usable temperature range' })
  }
  certifiedRules(v, ctx)
}

/** The certified data must say what their basis needs, and only that. */
function certifiedRules(v: Partial<SourceShape>, ctx: z.RefinementCtx) {
  const basis = v.certifiedBasis ?? (v.kind ? DEFAULT_CERTIFIED_BASIS[v.kind] : undefined)
  if (v.kind === 'flat-plate' && basis === 'cavity-temperature') ctx.addIssue({ code: 'custom', path: ['certifiedBasis'], message: 'A flat plate’s certificate states a surface temperature or a radiance temperature' })
  if (v.kind === 'cavity' && basis === 'surface-temperature') ctx.addIssue({ code: 'custom', path: ['certifiedBasis'], message: 'A cavity’s certificate states a cavity temperature or a radiance temperature' })
  const radianceOnly = ['certifiedBandLambda1Um', 'certifiedBandLambda2Um', 'certifiedBandMedium', 'certifiedReflectedTemperatureK'] as const
  if (basis === 'radiance-temperature') {
    for (const f of radianceOnly) {
      if (f !== 'certifiedBandMedium' && v[f] == null) {
        ctx.addIssue({ code: 'custom', path: [f], message: f === 'certifiedReflectedTemperatureK'
          ? 'A radiance temperature includes the surroundings’ reflected radiation: give their temperature when it was certified'
          : 'A radiance temperature belongs to its band: give both ends of the band it was certified in' })
      }
    }
    const l1 = v.certifiedBandLambda1Um
    const l2 = v.certifiedBandLambda2Um
    if (l1 != null && l2 != null && !(l2 > l1)) ctx.addIssue({ code: 'custom', path: ['certifiedBandLambda2Um'], message: 'The band end must be above its start' })
  }
  else if (basis !== undefined) {
    for (const f of radianceOnly) {
      if (v[f] != null) ctx.addIssue({ code: 'custom', path: [f], message: `Only a radiance temperature has a band and a surroundings’ temperature; this certificate states a ${CERTIFIED_BASIS_LABELS[basis].toLowerCase()}` })
    }
  }
  if ((v.certifiedExpandedUncertaintyK == null) !== (v.certifiedCoverageFactor == null)) {
    ctx.addIssue({ code: 'custom', path: [v.certifiedExpandedUncertaintyK == null ? 'certifiedExpandedUncertaintyK' : 'certifiedCoverageFactor'], message: 'Give the certified expanded uncertainty with its coverage factor k, or neither' })
  }
}

/**
 * POST /api/sources (also one CSV row of an import). Without `certifiedBasis` the source's kind decides
 * (DEFAULT_CERTIFIED_BASIS: a cavity's temperature, a plate's surface temperature).
 */
export const sourceCreateSchema = sourceFields
  .extend({
    emissivityBandLambda1Um: sourceFields.shape.emissivityBandLambda1Um.optional().default(null),
    emissivityBandLambda2Um: sourceFields.shape.emissivityBandLambda2Um.optional().default(null),
    emissivityTable: sourceFields.shape.emissivityTable.optional().default(null),
    corrections: correctionTableSchema.default([]),
    certifiedBasis: sourceFields.shape.certifiedBasis.optional(),
    certifiedBandLambda1Um: sourceFields.shape.certifiedBandLambda1Um.optional().default(null),
    certifiedBandLambda2Um: sourceFields.shape.certifiedBandLambda2Um.optional().default(null),
    certifiedBandMedium: sourceFields.shape.certifiedBandMedium.optional().default(null),
    certifiedReflectedTemperatureK: sourceFields.shape.certifiedReflectedTemperatureK.optional().default(null),
    certifiedExpandedUncertaintyK: sourceFields.shape.certifiedExpandedUncertaintyK.optional().default(null),
    certifiedCoverageFactor: sourceFields.shape.certifiedCoverageFactor.optional().default(null),
    status: sourceFields.shape.status.default('in-service'),
    notes: optionalText(4000).default(null),
  })
  .superRefine(sourceRules)
  .transform(v => ({ ...v, certifiedBasis: v.certifiedBasis ?? DEFAULT_CERTIFIED_BASIS[v.kind] }))
export type SourceCreateInput = z.infer<typeof sourceCreateSchema>

/** PATCH /api/sources/[id]: any subset, with the version last seen. The server re-checks the merged record. */
export const sourceUpdateSchema = sourceFields.partial().extend({ version: versionSchema })
export type SourceUpdateInput = z.infer<typeof sourceUpdateSchema>

/** GET /api/sources/[id]/correction?setPointK= */
export const correctionQuerySchema = z.object({
  setPointK: z.coerce.number({ error: 'setPointK must be a number' }).finite('setPointK must be a number').positive('setPointK must be above 0 K'),
})
