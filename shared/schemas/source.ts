import { z } from 'zod'
import { EQUIPMENT_STATUSES, SOURCE_KINDS } from '../registers/constants'
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
  corrections: correctionTableSchema,
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
}

/** POST /api/sources (also one CSV row of an import). */
export const sourceCreateSchema = sourceFields
  .extend({
    emissivityBandLambda1Um: sourceFields.shape.emissivityBandLambda1Um.optional().default(null),
    emissivityBandLambda2Um: sourceFields.shape.emissivityBandLambda2Um.optional().default(null),
    corrections: correctionTableSchema.default([]),
    status: sourceFields.shape.status.default('in-service'),
    notes: optionalText(4000).default(null),
  })
  .superRefine(sourceRules)
export type SourceCreateInput = z.infer<typeof sourceCreateSchema>

/** PATCH /api/sources/[id]: any subset, with the version last seen. The server re-checks the merged record. */
export const sourceUpdateSchema = sourceFields.partial().extend({ version: versionSchema })
export type SourceUpdateInput = z.infer<typeof sourceUpdateSchema>

/** GET /api/sources/[id]/correction?setPointK= */
export const correctionQuerySchema = z.object({
  setPointK: z.coerce.number({ error: 'setPointK must be a number' }).finite('setPointK must be a number').positive('setPointK must be above 0 K'),
})
