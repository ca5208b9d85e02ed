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
  TEMPLATE_DISTRIBUTIONS,
  UNITS_FOR_EMISSIVITY,
  UNITS_FOR_TEMPERATURE,
} from '../calibration/constants'
import { SOURCE_KINDS } from '../registers/constants'
import { text, versionSchema } from './common'
import { numberField, optionalText } from './registerQuery'

const kelvin = (label: string) => numberField(label).positive(`${label} must be above 0 K`).max(5000, `${label}: at most 5000 K`)

/** One line of an uncertainty-budget template. */
export const templateComponentSchema = z
  .object({
    name: text(120, 'Name'),
    type: z.enum(COMPONENT_TYPES, { error: 'type is A or B' }),
    distribution: z.enum(TEMPLATE_DISTRIBUTIONS, { error: `distribution is one of ${TEMPLATE_DISTRIBUTIONS.join(', ')}` }),
    value: numberField('value').min(0, 'value cannot be negative').max(1e4, 'value is out of range'),
    coverageFactor: numberField('coverageFactor').positive('coverageFactor must be above 0').max(100).nullable().optional().default(null),
    unit: z.enum(COMPONENT_UNITS, { error: `unit is one of ${COMPONENT_UNITS.join(', ')}` }),
    input: z.enum(MODEL_INPUTS, { error: `input is one of ${MODEL_INPUTS.join(', ')}` }),
    dof: numberField('dof').positive('dof must be above 0 (null = infinite)').max(1e9).nullable().optional().default(null),
  })
  .superRefine((c, ctx) => {
    if (c.distribution === 'normal' && c.coverageFactor === null) {
      ctx.addIssue({ code: 'custom', path: ['coverageFactor'], message: 'A normal component is given by its expanded uncertainty: state its coverage factor k' })
    }
    const allowed = EMISSIVITY_INPUTS.includes(c.input) ? UNITS_FOR_EMISSIVITY : UNITS_FOR_TEMPERATURE
    if (!allowed.includes(c.unit)) ctx.addIssue({ code: 'custom', path: ['unit'], message: `An input ${c.input} takes ${allowed.join(' or ')}` })
  })
export type TemplateComponentInput = z.infer<typeof templateComponentSchema>

const templateIndex = z.number({ error: 'Each index must be a number' }).int('Each index must be a whole number').min(0, 'An index counts from 0')

/**
 * A correlation between two template lines (GUM 5.2.2), e.g. the reflected and the instrument temperature
 * read from one thermometer (r = 1): their indices in `template` and r. Monte Carlo samples the pair jointly.
 */
export const templateCorrelationSchema = z.object({
  between: z.tuple([templateIndex, templateIndex], { error: 'between is [i, j], the indices of two template lines' }),
  coefficient: numberField('The correlation coefficient').min(-1, 'A correlation coefficient is from −1 to 1').max(1, 'A correlation coefficient is from −1 to 1'),
}, { error: 'Each correlation is { between: [i, j], coefficient }' })

/**
 * What is wrong with correlations for a template of n lines: an index beyond the template, a line with
 * itself, a pair given twice. Paths relative to the correlation list.
 * @example correlationProblems([{ between: [0, 3], coefficient: 1 }], 2) → [{ path: [0, 'between', 1], message: 'There is no template line 3 …' }]
 */
export function correlationProblems(correlations: readonly { between: readonly [number, number] }[], n: number): { path: (string | number)[], message: string }[] {
  const out: { path: (string | number)[], message: string }[] = []
  const seen = new Set<string>()
  correlations.forEach((c, m) => {
    const [i, j] = c.between
    for (const [k, x] of [[0, i], [1, j]] as const) {
      if (x >= n) out.push({ path: [m, 'between', k], message: n ? `There is no template line ${x}: the template has lines 0 to ${n - 1}` : 'The template has no lines to correlate' })
    }
    if (i === j) out.push({ path: [m, 'between'], message: 'A correlation is between two different lines' })
    const key = `${Math.min(i, j)}-${Math.max(i, j)}`
    if (seen.has(key)) out.push({ path: [m, 'between'], message: `Lines ${i} and ${j} already have a correlation` })
    seen.add(key)
  })
  return out
}

export const cmcEntrySchema = z
  .object({
    minK: kelvin('minK'),
    maxK: kelvin('maxK'),
    expandedUncertaintyK: numberField('expandedUncertaintyK').positive('expandedUncertaintyK must be above 0 K').max(1000),
  })
  .refine(r => r.maxK > r.minK, { path: ['maxK'], message: 'maxK must be above minK' })

/**
 * What a procedure applies to: the kinds of source it uses, the spectral band an instrument must lie
 * in (µm) and the temperature range (K). A run is refused, with the reason, when its source or
 * instrument falls outside.
 */
export const applicabilitySchema = z
  .object({
    sourceKinds: z.array(z.enum(SOURCE_KINDS, { error: `A source kind is one of ${SOURCE_KINDS.join(', ')}` }), { error: 'Say which kinds of source the procedure uses' })
      .min(1, 'Say which kinds of source the procedure uses').max(SOURCE_KINDS.length),
    bandMinUm: numberField('Shortest wavelength').positive('The shortest wavelength is above 0 µm').max(100),
    bandMaxUm: numberField('Longest wavelength').positive('The longest wavelength is above 0 µm').max(100),
    minK: kelvin('Lowest temperature'),
    maxK: kelvin('Highest temperature'),
  })
  .refine(a => a.bandMaxUm > a.bandMinUm, { path: ['bandMaxUm'], message: 'The longest wavelength must be above the shortest' })
  .refine(a => a.maxK > a.minK, { path: ['maxK'], message: 'The highest temperature must be above the lowest' })
export type ApplicabilityInput = z.infer<typeof applicabilitySchema>

const procedureFields = z.object({
  name: text(160, 'Name'),
  documentReference: text(120, 'Document reference'),
  decisionRule: z.enum(DECISION_RULES, { error: `decisionRule is one of ${DECISION_RULES.join(', ')}` }),
  /** r in w = r·U; used by the guard-band and non-binary rules (default 1). */
  guardBandFactor: numberField('guardBandFactor').min(0, 'guardBandFactor cannot be negative').max(10, 'guardBandFactor is at most 10').nullable().optional().default(null),
  template: z.array(templateComponentSchema, { error: 'template is a list of components' }).max(60, 'At most 60 components'),
  /** Correlated pairs of template lines (indices into `template`); default none. */
  correlations: z.array(templateCorrelationSchema, { error: 'correlations is a list of { between: [i, j], coefficient }' }).max(200, 'At most 200 correlations').default([]),
  /**
   * Whether each point's budget also takes the reference equipment's lines from the registers (source
   * certificate U and k, emissivity for the band, uniformity, stability; reference thermometer): then the
   * template holds the instrument-side lines only. Default false (the template is the whole budget).
   */
  budgetFromEquipment: z.boolean({ error: 'budgetFromEquipment is true or false' }).default(false),
  /** m in "aperture ≥ m × spot diameter" (e.g. 2); null: none stated, the spot must only fit. */
  spotMargin: numberField('Spot margin').min(1, 'The margin is at least 1 (the spot must fit inside the aperture)').max(20, 'The margin is at most 20').nullable().optional().default(null),
  cmc: z.array(cmcEntrySchema, { error: 'cmc is a list of { minK, maxK, expandedUncertaintyK }' }).max(100, 'At most 100 ranges'),
  applicability: applicabilitySchema,
  /** What changed in this version (for the record). */
  changeNote: optionalText(2000).default(null),
})

/** POST /api/procedures */
export const procedureCreateSchema = procedureFields.superRefine((v, ctx) => {
  for (const p of correlationProblems(v.correlations, v.template.length)) ctx.addIssue({ code: 'custom', path: ['correlations', ...p.path], message: p.message })
})
/** The parsed create body. */
export type ProcedureCreateInput = z.infer<typeof procedureCreateSchema>

/** PATCH /api/procedures/[id]: any subset, with the version last seen; the change becomes a new ProcedureVersion. */
export const procedureUpdateSchema = z.object({
  name: procedureFields.shape.name.optional(),
  documentReference: procedureFields.shape.documentReference.optional(),
  decisionRule: procedureFields.shape.decisionRule.optional(),
  guardBandFactor: numberField('guardBandFactor').min(0).max(10, 'guardBandFactor is at most 10').nullable().optional(),
  template: procedureFields.shape.template.optional(),
  correlations: z.array(templateCorrelationSchema, { error: 'correlations is a list of { between: [i, j], coefficient }' }).max(200, 'At most 200 correlations').optional(),
  budgetFromEquipment: z.boolean({ error: 'budgetFromEquipment is true or false' }).optional(),
  spotMargin: numberField('Spot margin').min(1, 'The margin is at least 1 (the spot must fit inside the aperture)').max(20, 'The margin is at most 20').nullable().optional(),
  cmc: procedureFields.shape.cmc.optional(),
  applicability: applicabilitySchema.optional(),
  changeNote: optionalText(2000),
  version: versionSchema,
})
export type ProcedureUpdateInput = z.infer<typeof procedureUpdateSchema>
