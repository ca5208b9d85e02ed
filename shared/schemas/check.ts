/** Inputs of the intermediate-check routes (server/api/check-plans, server/api/check-results). */
import { z } from 'zod'
import { CHECK_ACCEPTANCES, CHECK_VERDICTS } from '../quality/constants'
import { pageQuerySchema, text, versionSchema } from './common'
import { dateOnlySchema, optionalText } from './registerQuery'
import { equipmentTypeSchema, idField, idQuery, kelvinField, uncertaintyField } from './quality'

const planFields = z.object({
  equipmentType: equipmentTypeSchema,
  equipmentId: idField('Equipment'),
  /** What is checked, e.g. "Radiance temperature at 100 °C with the check thermometer". */
  title: text(200, 'What is checked'),
  /** How it is checked. */
  method: text(4000, 'How it is checked'),
  intervalDays: z.number({ error: 'How often must be a number of days' }).int('How often: a whole number of days').min(1, 'At least every day').max(1096, 'At most every 3 years'),
  acceptance: z.enum(CHECK_ACCEPTANCES, { error: 'Acceptance is a limit or |E_n| ≤ 1 (limit, en)' }),
  acceptanceLimitK: uncertaintyField('Acceptance limit').positive('The acceptance limit must be above 0 K').nullable().optional().default(null),
  nominalsK: z.array(kelvinField('Nominal value'), { error: 'Nominal values: a list of temperatures in K' }).min(1, 'Give at least one nominal value').max(20, 'At most 20 nominal values'),
  startOn: dateOnlySchema,
})

function planRules(v: { acceptance?: string, acceptanceLimitK?: number | null }, ctx: z.RefinementCtx) {
  if (v.acceptance === 'limit' && (v.acceptanceLimitK === null || v.acceptanceLimitK === undefined)) {
    ctx.addIssue({ code: 'custom', path: ['acceptanceLimitK'], message: 'Give the acceptance limit in K for a check judged by a limit' })
  }
}

/** POST /api/check-plans */
export const checkPlanCreateSchema = planFields.superRefine(planRules)
export type CheckPlanCreateInput = z.infer<typeof checkPlanCreateSchema>

/** PATCH /api/check-plans/[id]: any of the plan's terms (not the item), `active`, and the version seen. */
export const checkPlanUpdateSchema = planFields
  .omit({ equipmentType: true, equipmentId: true })
  .partial()
  .extend({
    active: z.boolean({ error: 'active must be true or false' }).optional(),
    version: versionSchema,
  })
export type CheckPlanUpdateInput = z.infer<typeof checkPlanUpdateSchema>
/** The complete plan after an update is checked against this. */
export const checkPlanMergedSchema = planFields.omit({ equipmentType: true, equipmentId: true }).superRefine(planRules)

/** POST /api/check-plans/[id]/results: one check (who: the signed-in user unless `performedBy` names a lab user). */
export const checkResultCreateSchema = z.object({
  checkedOn: dateOnlySchema,
  nominalK: kelvinField('Nominal value'),
  nominalUncertaintyK: uncertaintyField('Uncertainty of the nominal value').nullable().optional().default(null),
  measuredK: kelvinField('Measured value'),
  expandedUncertaintyK: uncertaintyField('Uncertainty of the measured value').nullable().optional().default(null),
  performedBy: idField('Checked by').optional(),
  notes: optionalText(4000).default(null),
})
export type CheckResultCreateInput = z.infer<typeof checkResultCreateSchema>

/** GET /api/check-plans */
export const checkPlanQuerySchema = z.object({
  equipmentType: equipmentTypeSchema.optional(),
  equipmentId: idQuery('equipmentId').optional(),
  active: z.enum(['true', 'false', 'all'], { error: 'active is true, false or all' }).default('true'),
})
export type CheckPlanQuery = z.infer<typeof checkPlanQuerySchema>

/** GET /api/check-results */
export const checkResultQuerySchema = pageQuerySchema.extend({
  equipmentType: equipmentTypeSchema.optional(),
  equipmentId: idQuery('equipmentId').optional(),
  planId: idQuery('planId').optional(),
  verdict: z.enum(CHECK_VERDICTS, { error: 'verdict is pass or fail' }).optional(),
  from: dateOnlySchema.optional(),
  to: dateOnlySchema.optional(),
})
export type CheckResultQuery = z.infer<typeof checkResultQuerySchema>

/** GET /api/check-plans/[id]/chart */
export const controlChartQuerySchema = z.object({
  /** The nominal value charted (default the plan's first), K. */
  nominalK: z.coerce.number({ error: 'nominalK must be a number' }).finite('nominalK must be a number').positive('nominalK must be above 0 K').optional(),
  /** σ from the baseline's standard deviation (NIST SOP 9, default) or its mean moving range (NIST/SEMATECH 6.3.2.2). */
  method: z.enum(['standard-deviation', 'moving-range'], { error: 'method is standard-deviation or moving-range' }).default('standard-deviation'),
  /** The first N results form the baseline (default all). */
  baselineCount: z.coerce.number({ error: 'baselineCount must be a number' }).int('baselineCount must be a whole number').min(2, 'baselineCount is at least 2').optional(),
})
export type ControlChartQuery = z.infer<typeof controlChartQuerySchema>
