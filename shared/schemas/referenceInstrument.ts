import { z } from 'zod'
import { EQUIPMENT_STATUSES, RANGE_UNITS, REFERENCE_KINDS } from '../registers/constants'
import { text, versionSchema } from './common'
import { numberField, optionalText } from './registerQuery'

const referenceFields = z.object({
  assetTag: text(60, 'Asset tag'),
  kind: z.enum(REFERENCE_KINDS, { error: `Kind is one of ${REFERENCE_KINDS.join(', ')}` }),
  maker: text(120, 'Maker'),
  model: text(120, 'Model'),
  serial: text(80, 'Serial'),
  /** Range in `rangeUnit`: kelvin for temperature, %RH for humidity. */
  rangeMin: numberField('Range minimum'),
  rangeMax: numberField('Range maximum'),
  rangeUnit: z.enum(RANGE_UNITS, { error: `Unit is one of ${RANGE_UNITS.join(', ')}` }),
  /** Standard uncertainty (k = 1) in `uncertaintyUnit`. */
  standardUncertainty: numberField('Standard uncertainty').positive('Standard uncertainty must be above 0'),
  uncertaintyUnit: z.enum(RANGE_UNITS, { error: `Unit is one of ${RANGE_UNITS.join(', ')}` }),
  status: z.enum(EQUIPMENT_STATUSES, { error: `Status is one of ${EQUIPMENT_STATUSES.join(', ')}` }),
  notes: optionalText(4000),
})
type ReferenceShape = z.infer<typeof referenceFields>

function referenceRules(v: Partial<ReferenceShape>, ctx: z.RefinementCtx) {
  if (v.rangeMin !== undefined && v.rangeMax !== undefined && !(v.rangeMax > v.rangeMin)) {
    ctx.addIssue({ code: 'custom', path: ['rangeMax'], message: 'The maximum must be above the minimum' })
  }
  if (v.kind && v.rangeUnit) {
    if (v.kind === 'hygrometer' && v.rangeUnit !== '%RH') ctx.addIssue({ code: 'custom', path: ['rangeUnit'], message: 'A hygrometer\'s range is in %RH' })
    if ((v.kind === 'contact-thermometer' || v.kind === 'transfer-radiation-thermometer') && v.rangeUnit !== 'K') {
      ctx.addIssue({ code: 'custom', path: ['rangeUnit'], message: 'A thermometer\'s range is in K' })
    }
  }
  if (v.rangeUnit && v.uncertaintyUnit && v.rangeUnit !== v.uncertaintyUnit) {
    ctx.addIssue({ code: 'custom', path: ['uncertaintyUnit'], message: 'State the uncertainty in the unit of the range' })
  }
  if (v.rangeUnit === 'K' && v.rangeMin !== undefined && v.rangeMin <= 0) ctx.addIssue({ code: 'custom', path: ['rangeMin'], message: 'A temperature range starts above 0 K' })
  if (v.rangeUnit === '%RH') {
    if (v.rangeMin !== undefined && v.rangeMin < 0) ctx.addIssue({ code: 'custom', path: ['rangeMin'], message: 'Relative humidity is 0 %RH or more' })
    if (v.rangeMax !== undefined && v.rangeMax > 100) ctx.addIssue({ code: 'custom', path: ['rangeMax'], message: 'Relative humidity is at most 100 %RH' })
  }
}

/** POST /api/reference-instruments (also one CSV row of an import). */
export const referenceCreateSchema = referenceFields
  .extend({
    status: referenceFields.shape.status.default('in-service'),
    notes: optionalText(4000).default(null),
  })
  .superRefine(referenceRules)
export type ReferenceCreateInput = z.infer<typeof referenceCreateSchema>

/** PATCH /api/reference-instruments/[id]: any subset, with the version last seen. */
export const referenceUpdateSchema = referenceFields.partial().extend({ version: versionSchema })
export type ReferenceUpdateInput = z.infer<typeof referenceUpdateSchema>
