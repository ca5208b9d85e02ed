/** Inputs of the proficiency-test routes (server/api/proficiency-results). */
import { z } from 'zod'
import { PROFICIENCY_SCHEME_TYPES, PROFICIENCY_VERDICTS } from '../quality/constants'
import { pageQuerySchema, text } from './common'
import { dateOnlySchema, optionalText } from './registerQuery'
import { kelvinField, uncertaintyField } from './quality'

/** POST /api/proficiency-results */
export const proficiencyCreateSchema = z.object({
  schemeType: z.enum(PROFICIENCY_SCHEME_TYPES, { error: `Scheme type is one of ${PROFICIENCY_SCHEME_TYPES.join(', ')}` }),
  scheme: text(200, 'Scheme'),
  round: text(120, 'Round'),
  artefact: text(200, 'Artefact'),
  pointK: kelvinField('Point'),
  labValueK: kelvinField('Our value'),
  labUncertaintyK: uncertaintyField('Our expanded uncertainty'),
  referenceValueK: kelvinField('Reference value'),
  referenceUncertaintyK: uncertaintyField('Expanded uncertainty of the reference value'),
  /** σ_pt, when the scheme reports z scores. */
  sigmaPtK: uncertaintyField('Standard deviation for proficiency assessment').positive('The standard deviation for proficiency assessment must be above 0 K').nullable().optional().default(null),
  reportedOn: dateOnlySchema,
  notes: optionalText(4000).default(null),
}).superRefine((v, ctx) => {
  if (v.labUncertaintyK === 0 && v.referenceUncertaintyK === 0) {
    ctx.addIssue({ code: 'custom', path: ['labUncertaintyK'], message: 'E_n needs an uncertainty: give ours, the reference value\'s, or both' })
  }
  if (v.schemeType === 'proficiency-test' && v.sigmaPtK === null) {
    ctx.addIssue({ code: 'custom', path: ['sigmaPtK'], message: 'A proficiency test scheme reports z scores: give its standard deviation for proficiency assessment' })
  }
})
export type ProficiencyCreateInput = z.infer<typeof proficiencyCreateSchema>

/** GET /api/proficiency-results */
export const proficiencyQuerySchema = pageQuerySchema.extend({
  verdict: z.enum(PROFICIENCY_VERDICTS, { error: `verdict is one of ${PROFICIENCY_VERDICTS.join(', ')}` }).optional(),
})
export type ProficiencyQuery = z.infer<typeof proficiencyQuerySchema>
