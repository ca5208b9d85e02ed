/**
 * Inputs of the calculation API (`/api/calculations/*`) and of the calculator page.
 * Units: temperatures in kelvin, wavelengths in micrometres, radiance in W·m⁻²·sr⁻¹.
 * The engine (shared/radiometry, shared/uncertainty) checks its inputs again; these
 * schemas give the caller a field-by-field answer first.
 *
 * Constants: a request that uses Planck's law may say `"constants": "CODATA-2018"` (the default) or
 * `"ITS-90"` (c₂ = 0.014388 m·K); anything else is a 400 naming `constants`, and the answer names the
 * c₂ used. Wavelengths are in vacuum unless a band says `"medium": "air"` (then n_air, default
 * 1.00028, converts them; shared/radiometry/planck.ts).
 */
import { z } from 'zod'
import { STANDARD_AIR_REFRACTIVE_INDEX } from '../radiometry/planck'
import { accuracySpecSchema } from './instrument'

const num = (label: string) => z.number({ error: `${label} must be a number` })
const positive = (label: string) => num(label).positive(`${label} must be above 0`)
const kelvin = (label: string) => positive(label).max(1e5, `${label} above 100000 K is out of range`)
const emissivity = (label: string) => num(label).gt(0, `${label} must be above 0`).max(1, `${label} cannot exceed 1`)

/** The radiation constants a calculation may name (shared/radiometry/constants.ts). */
export const CONSTANTS_IDS = ['CODATA-2018', 'ITS-90'] as const
export const constantsSchema = z.enum(CONSTANTS_IDS, { error: 'constants must be "CODATA-2018" (the default) or "ITS-90" (c₂ = 0.014388 m·K)' }).default('CODATA-2018')

/** Where a band's wavelengths are stated: in vacuum (default) or in air, with the air's refractive index. */
const mediumShape = {
  medium: z.enum(['vacuum', 'air'], { error: 'medium is "vacuum" or "air"' }).optional(),
  refractiveIndex: num('refractiveIndex').min(1, 'The refractive index of air is at least 1').lt(1.01, 'The refractive index of air is below 1.01').optional(),
}
function mediumRule(b: { medium?: 'vacuum' | 'air', refractiveIndex?: number }, ctx: z.RefinementCtx) {
  if (b.refractiveIndex !== undefined && b.medium !== 'air') {
    ctx.addIssue({ code: 'custom', path: ['refractiveIndex'], message: `The refractive index is for wavelengths stated in air (medium "air"; default ${STANDARD_AIR_REFRACTIVE_INDEX})` })
  }
}

export const rectangularBandSchema = z
  .object({
    kind: z.literal('rectangular'),
    lambda1Um: positive('λ1').max(1000, 'λ1 above 1000 µm is out of range'),
    lambda2Um: positive('λ2').max(1000, 'λ2 above 1000 µm is out of range'),
    ...mediumShape,
  })
  .refine(b => b.lambda2Um > b.lambda1Um, { path: ['lambda2Um'], message: 'λ2 must be greater than λ1' })
  .superRefine(mediumRule)

export const tabulatedBandSchema = z
  .object({
    kind: z.literal('tabulated'),
    points: z
      .array(
        z.tuple([positive('Wavelength').max(1000, 'Wavelength above 1000 µm is out of range'), num('Response').min(0, 'Response cannot be negative')], {
          error: 'Each point is [wavelength µm, relative response]',
        }),
        { error: 'points must be a list of [wavelength, response] pairs' },
      )
      .min(2, 'A responsivity table needs at least two points')
      .max(5000, 'At most 5000 points'),
    ...mediumShape,
  })
  .superRefine(mediumRule)
  .superRefine((b, ctx) => {
    for (let i = 1; i < b.points.length; i++) {
      if (!(b.points[i]![0] > b.points[i - 1]![0])) {
        ctx.addIssue({ code: 'custom', path: ['points', i, 0], message: 'Wavelengths must increase strictly' })
        return
      }
    }
    if (b.points.every(p => p[1] === 0)) ctx.addIssue({ code: 'custom', path: ['points'], message: 'At least one response must be above 0' })
  })

/** `{ kind: 'rectangular', lambda1Um, lambda2Um }` or `{ kind: 'tabulated', points: [[λ µm, R], …] }`. */
export const bandSchema = z.discriminatedUnion('kind', [rectangularBandSchema, tabulatedBandSchema], {
  error: 'band.kind must be "rectangular" or "tabulated"',
})
export type BandInput = z.infer<typeof bandSchema>

export const bandRadianceSchema = z.object({
  band: bandSchema,
  temperatureK: kelvin('temperatureK'),
  constants: constantsSchema,
})
export type BandRadianceInput = z.infer<typeof bandRadianceSchema>

export const temperatureSchema = z.object({
  band: bandSchema,
  radiance: positive('radiance'),
  constants: constantsSchema,
})
export type TemperatureInput = z.infer<typeof temperatureSchema>

export const readingInputShape = {
  band: bandSchema,
  sourceTemperatureK: kelvin('The source temperature'),
  sourceEmissivity: emissivity('The source emissivity'),
  reflectedTemperatureK: kelvin('The reflected temperature'),
  instrumentTemperatureK: kelvin('The instrument temperature'),
  emissivitySetting: emissivity('The emissivity setting'),
}

/**
 * A source's radiance temperature as its certificate states it: T_rad (K) in `band`, what an ideal
 * instrument with emissivity setting 1 read on the source, with the surroundings at
 * `reflectedTemperatureK` (T_w0) at that time (domain notes §7).
 */
export const sourceRadianceTemperatureSchema = z.object({
  temperatureK: kelvin('The radiance temperature'),
  band: bandSchema,
  reflectedTemperatureK: kelvin('The surroundings’ temperature at certification'),
}, { error: 'sourceRadianceTemperature is { temperatureK, band, reflectedTemperatureK }' })

const EXACTLY_ONE_SOURCE = 'Give either sourceTemperatureK (the source’s temperature) or sourceRadianceTemperature (its certified radiance temperature), not both'

/**
 * POST /api/calculations/expected-reading: the reading model's inputs, the source given by its
 * temperature T_s (`sourceTemperatureK`) or by a radiance temperature (`sourceRadianceTemperature`) —
 * exactly one of the two.
 */
export const expectedReadingSchema = z
  .object({
    ...readingInputShape,
    sourceTemperatureK: readingInputShape.sourceTemperatureK.optional(),
    sourceRadianceTemperature: sourceRadianceTemperatureSchema.optional(),
    constants: constantsSchema,
  })
  .superRefine((v, ctx) => {
    const a = v.sourceTemperatureK !== undefined
    const b = v.sourceRadianceTemperature !== undefined
    if (a && b) ctx.addIssue({ code: 'custom', path: ['sourceRadianceTemperature'], message: EXACTLY_ONE_SOURCE })
    if (!a && !b) ctx.addIssue({ code: 'custom', path: ['sourceTemperatureK'], message: EXACTLY_ONE_SOURCE.replace(', not both', '') })
  })
export type ExpectedReadingInput = z.infer<typeof expectedReadingSchema>

export const DISTRIBUTION_NAMES = ['normal', 'rectangular', 'triangular', 'u-shaped', 'resolution'] as const
const distributionSchema = z.enum(DISTRIBUTION_NAMES, { error: `distribution must be one of ${DISTRIBUTION_NAMES.join(', ')}` })

const coverageProbabilitySchema = num('coverageProbability').gt(0, 'coverageProbability must be above 0').lt(1, 'coverageProbability must be below 1')

export const budgetComponentSchema = z
  .object({
    name: z.string({ error: 'name is required' }).trim().min(1, 'name is required').max(120),
    standardUncertainty: num('standardUncertainty').min(0, 'standardUncertainty cannot be negative').optional(),
    distribution: distributionSchema.optional(),
    halfWidth: num('halfWidth').min(0, 'halfWidth cannot be negative').optional(),
    coverageFactor: positive('coverageFactor').optional(),
    resolution: num('resolution').min(0, 'resolution cannot be negative').optional(),
    sensitivity: num('sensitivity'),
    dof: positive('dof').nullable().optional(),
  })
  .superRefine((c, ctx) => {
    if (c.standardUncertainty !== undefined) return
    if (!c.distribution) {
      ctx.addIssue({ code: 'custom', path: ['standardUncertainty'], message: 'Give standardUncertainty, or a distribution with its half-width' })
      return
    }
    if (c.distribution === 'resolution') {
      if (c.resolution === undefined) ctx.addIssue({ code: 'custom', path: ['resolution'], message: 'Give the resolution step δ (u = δ/√12)' })
      return
    }
    if (c.halfWidth === undefined) ctx.addIssue({ code: 'custom', path: ['halfWidth'], message: `A ${c.distribution} component needs halfWidth` })
    if (c.distribution === 'normal' && c.coverageFactor === undefined) ctx.addIssue({ code: 'custom', path: ['coverageFactor'], message: 'A normal component given by its expanded uncertainty needs coverageFactor' })
  })
export type BudgetComponentInput = z.infer<typeof budgetComponentSchema>

const lineIndex = z.number({ error: 'Each index must be a number' }).int('Each index must be a whole number').min(0, 'An index counts from 0')

/** A correlation between two budget lines (GUM 5.2.2): their indices in `components` and r. */
export const budgetCorrelationSchema = z.object({
  between: z.tuple([lineIndex, lineIndex], { error: 'between is [i, j], the indices of two components' }),
  coefficient: num('The correlation coefficient').min(-1, 'A correlation coefficient is from −1 to 1').max(1, 'A correlation coefficient is from −1 to 1'),
}, { error: 'Each correlation is { between: [i, j], coefficient }' })

export const budgetSchema = z
  .object({
    components: z.array(budgetComponentSchema, { error: 'components must be a list' }).min(1, 'At least one component').max(200, 'At most 200 components'),
    coverageProbability: coverageProbabilitySchema.default(0.9545),
    /** Correlated pairs of components (JCGM 100 5.2.2, eq. (16)); omitted: all independent. */
    correlations: z.array(budgetCorrelationSchema, { error: 'correlations must be a list of { between: [i, j], coefficient }' }).max(1000, 'At most 1000 correlations').optional(),
  })
  .superRefine((v, ctx) => {
    const n = v.components.length
    const seen = new Set<string>()
    v.correlations?.forEach((c, m) => {
      const [i, j] = c.between
      for (const [k, x] of [[0, i], [1, j]] as const) {
        if (x >= n) ctx.addIssue({ code: 'custom', path: ['correlations', m, 'between', k], message: `There is no component ${x}: the budget has components 0 to ${n - 1}` })
      }
      if (i === j) ctx.addIssue({ code: 'custom', path: ['correlations', m, 'between'], message: 'A correlation is between two different components' })
      const key = `${Math.min(i, j)}-${Math.max(i, j)}`
      if (seen.has(key)) ctx.addIssue({ code: 'custom', path: ['correlations', m, 'between'], message: `Components ${i} and ${j} already have a correlation` })
      seen.add(key)
    })
  })
export type BudgetInput = z.infer<typeof budgetSchema>

/** A Monte Carlo input distribution for one reading-model input. */
export const mcDistributionSchema = z.discriminatedUnion('distribution', [
  z.object({ distribution: z.literal('normal'), value: num('value'), standardUncertainty: num('standardUncertainty').min(0) }),
  z.object({ distribution: z.enum(['rectangular', 'triangular', 'u-shaped']), value: num('value'), halfWidth: num('halfWidth').min(0) }),
  z.object({ distribution: z.literal('constant'), value: num('value') }),
], { error: 'distribution must be one of normal, rectangular, triangular, u-shaped, constant' })
export type McDistributionInput = z.infer<typeof mcDistributionSchema>

export const MC_MAX_TRIALS = 2_000_000

export const monteCarloSchema = z.object({
  band: bandSchema,
  inputs: z.object({
    sourceTemperatureK: mcDistributionSchema,
    sourceEmissivity: mcDistributionSchema,
    reflectedTemperatureK: mcDistributionSchema,
    instrumentTemperatureK: mcDistributionSchema,
    emissivitySetting: mcDistributionSchema,
  }),
  trials: num('trials').int('trials must be a whole number').min(1000, 'At least 1000 trials').max(MC_MAX_TRIALS, `At most ${MC_MAX_TRIALS} trials`).default(200_000),
  seed: num('seed').int().min(0).max(0xffffffff).default(1),
  coverageProbability: coverageProbabilitySchema.default(0.95),
  constants: constantsSchema,
})
export type MonteCarloRequest = z.infer<typeof monteCarloSchema>

export const DECISION_RULES = ['simple-acceptance', 'guard-band', 'non-binary'] as const

export const conformitySchema = z.object({
  spec: accuracySpecSchema,
  readingK: kelvin('readingK'),
  error: num('error'),
  expandedUncertainty: num('expandedUncertainty').min(0),
  rule: z.enum(DECISION_RULES, { error: `rule must be one of ${DECISION_RULES.join(', ')}` }),
  guardBandFactor: num('guardBandFactor').min(0).max(10).optional(),
  percentBasis: z.enum(['celsius', 'kelvin']).optional(),
})

export type ConformityCalcInput = z.infer<typeof conformitySchema>
/**
 * POST /api/calculations/ratio-reading: a ratio (two-colour) pyrometer's expected reading (domain notes §7;
 * shared/radiometry/ratio.ts): band 1 (shorter wavelengths) and band 2, the source's temperature and its
 * emissivity in each band, the surroundings' temperature and the instrument's emissivity-ratio setting k.
 */
export const ratioReadingSchema = z.object({
  band1: bandSchema,
  band2: bandSchema,
  sourceTemperatureK: kelvin('The source temperature'),
  sourceEmissivity1: emissivity('The source emissivity in band 1'),
  sourceEmissivity2: emissivity('The source emissivity in band 2'),
  reflectedTemperatureK: kelvin('The reflected temperature'),
  emissivityRatioSetting: positive('The emissivity-ratio setting').max(100, 'The emissivity-ratio setting is at most 100'),
  constants: constantsSchema,
})
export type RatioReadingRequest = z.infer<typeof ratioReadingSchema>

/** One calibration point of the calibration-equation calculation (T, R, U with its k). */
export const equationPointSchema = z.object({
  referenceTemperatureK: kelvin('The reference temperature'),
  readingK: kelvin('The reading'),
  expandedUncertaintyK: positive('The expanded uncertainty').max(1000, 'The expanded uncertainty is at most 1000 K'),
  coverageFactor: positive('The coverage factor').max(100, 'The coverage factor is at most 100'),
}, { error: 'Each point is { referenceTemperatureK, readingK, expandedUncertaintyK, coverageFactor }' })

/**
 * POST /api/calculations/calibration-equation: a calibration equation through calibration points
 * (shared/radiometry/calibrationEquation.ts) — the Sakuma–Hattori form (needs the instrument's nominal
 * band) or a straight line — with a common correlation r between the points, and the interpolated values
 * at reference temperatures (`temperaturesK`) and at readings (`readingsK`), each inside the points' range.
 */
export const calibrationEquationSchema = z.object({
  points: z.array(equationPointSchema, { error: 'points is a list of { referenceTemperatureK, readingK, expandedUncertaintyK, coverageFactor }' }).min(2, 'Give at least two points (three for the Sakuma–Hattori form)').max(100, 'At most 100 points'),
  model: z.enum(['sakuma-hattori', 'linear'], { error: 'model is "sakuma-hattori" or "linear"' }).default('sakuma-hattori'),
  band: bandSchema.optional(),
  pointCorrelation: num('pointCorrelation').min(0, 'pointCorrelation is from 0 to below 1').lt(1, 'pointCorrelation is below 1').default(0),
  temperaturesK: z.array(kelvin('Each temperature'), { error: 'temperaturesK is a list of temperatures in K' }).max(200, 'At most 200 temperatures').default([]),
  readingsK: z.array(kelvin('Each reading'), { error: 'readingsK is a list of readings in K' }).max(200, 'At most 200 readings').default([]),
  coverageFactor: positive('coverageFactor').max(100, 'coverageFactor is at most 100').default(2),
  constants: constantsSchema,
}).superRefine((v, ctx) => {
  if (v.model === 'sakuma-hattori' && !v.band) ctx.addIssue({ code: 'custom', path: ['band'], message: 'The Sakuma–Hattori form needs the instrument’s nominal band' })
})
export type CalibrationEquationRequest = z.infer<typeof calibrationEquationSchema>
