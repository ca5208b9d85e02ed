/**
 * Inputs of the procedure routes (server/api/procedures): name, document reference, decision rule,
 * the uncertainty-budget template and the CMC table. Units: kelvin; see shared/calibration/constants.ts.
 */
import { z } from 'zod'
import {
  COMPONENT_TYPES,
  COMPONENT_UNITS,
  DECISION_RULES,
  EMISSIVITY_INPUTS,
  MODEL_INPUTS,
  MODEL_INPUT_LABELS,
  TEMPLATE_DISTRIBUTIONS,
  UNITS_FOR_EMISSIVITY,
  UNITS_FOR_TEMPERATURE,
} from '../calibration/constants'
import { text, versionSchema } from './common'
import { numberField, optionalText } from './registerQuery'

const kelvin = (label: string) => numberField(label).positive(`${label} must be above 0 K`).max(5000, `${label}: at most 5000 K`)

/** One line of an uncertainty-budget template. */
export const templateComponentSchema = z
  .object({
    name: text(120, 'Name'),
    type: z.enum(COMPONENT_TYPES, { error: 'The type is A or B' }),
    distribution: z.enum(TEMPLATE_DISTRIBUTIONS, { error: `The distribution is one of ${TEMPLATE_DISTRIBUTIONS.join(', ')}` }),
    value: numberField('Value').min(0, 'The value cannot be negative').max(1e4, 'The value is out of range'),
    coverageFactor: numberField('The coverage factor k').positive('The coverage factor k must be above 0').max(100, 'The coverage factor k is at most 100').nullable().optional().default(null),
    unit: z.enum(COMPONENT_UNITS, { error: `The unit is one of ${COMPONENT_UNITS.join(', ')}` }),
    input: z.enum(MODEL_INPUTS, { error: `The model input is one of ${MODEL_INPUTS.join(', ')}` }),
    dof: numberField('Degrees of freedom').positive('Degrees of freedom must be above 0 (leave them out for infinite)').max(1e9).nullable().optional().default(null),
  })
  .superRefine((c, ctx) => {
    if (c.distribution === 'normal' && c.coverageFactor === null) {
      ctx.addIssue({ code: 'custom', path: ['coverageFactor'], message: 'A normal component is given by its expanded uncertainty: state its coverage factor k' })
    }
    const allowed = EMISSIVITY_INPUTS.includes(c.input) ? UNITS_FOR_EMISSIVITY : UNITS_FOR_TEMPERATURE
    if (!allowed.includes(c.unit)) ctx.addIssue({ code: 'custom', path: ['unit'], message: `${MODEL_INPUT_LABELS[c.input]} takes ${allowed.join(' or ')}` })
  })
export type TemplateComponentInput = z.infer<typeof templateComponentSchema>

export const cmcEntrySchema = z
  .object({
    minK: kelvin('The range start'),
    maxK: kelvin('The range end'),
    expandedUncertaintyK: numberField('The expanded uncertainty').positive('The expanded uncertainty must be above 0 K').max(1000, 'The expanded uncertainty is at most 1000 K'),
  })
  .refine(r => r.maxK > r.minK, { path: ['maxK'], message: 'The range must end above its start' })

const procedureFields = z.object({
  name: text(160, 'Name'),
  documentReference: text(120, 'Document reference'),
  decisionRule: z.enum(DECISION_RULES, { error: `The decision rule is one of ${DECISION_RULES.join(', ')}` }),
  /** r in w = r·U; used by the guard-band and non-binary rules (default 1). */
  guardBandFactor: numberField('The guard-band factor').min(0, 'The guard-band factor cannot be negative').max(10, 'The guard-band factor is at most 10').nullable().optional().default(null),
  template: z.array(templateComponentSchema, { error: 'The template is a list of components' }).max(60, 'At most 60 components'),
  cmc: z.array(cmcEntrySchema, { error: 'The CMC is a list of ranges (start, end, expanded uncertainty)' }).max(100, 'At most 100 ranges'),
  /** What changed in this version (for the record). */
  changeNote: optionalText(2000).default(null),
})

/** POST /api/procedures */
export const procedureCreateSchema = procedureFields
/** The parsed create body. */
export type ProcedureCreateInput = z.infer<typeof procedureCreateSchema>

/** PATCH /api/procedures/[id]: any subset, with the version last seen; the change becomes a new ProcedureVersion. */
export const procedureUpdateSchema = z.object({
  name: procedureFields.shape.name.optional(),
  documentReference: procedureFields.shape.documentReference.optional(),
  decisionRule: procedureFields.shape.decisionRule.optional(),
  guardBandFactor: numberField('The guard-band factor').min(0, 'The guard-band factor cannot be negative').max(10, 'The guard-band factor is at most 10').nullable().optional(),
  template: procedureFields.shape.template.optional(),
  cmc: procedureFields.shape.cmc.optional(),
  changeNote: optionalText(2000),
  version: versionSchema,
})
export type ProcedureUpdateInput = z.infer<typeof procedureUpdateSchema>
