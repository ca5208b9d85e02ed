/**
 * How a point's GUM budget becomes Monte Carlo input distributions (JCGM 101:2008 §6) for the
 * reading model. Pure and framework-free.
 *
 * - Each of the five model inputs (T_s, ε_s, T_w, T_d, ε_i) gets the distribution of its largest
 *   budget line (by |cᵢ|·u(xᵢ)), centred on the value used at the point, and is propagated through
 *   the full non-linear model; an input with no line is constant.
 * - Further lines on the same input, and every line acting on the reading (repeatability,
 *   resolution, instrument ambient …), are added to the output as independent zero-mean terms scaled
 *   by their sensitivity — exact for the reading lines (c = 1) and first-order for the others, which
 *   the notes say.
 * - Distributions (JCGM 101 6.4): every Type B line is sampled from its stated distribution: normal
 *   U/k → Gaussian; rectangular, triangular, U-shaped (arcsine) with their half-width; the display
 *   resolution → rectangular of width δ; a Type B line given by its standard uncertainty → Gaussian
 *   (6.4.7), whatever its ν. Degrees of freedom of a Type B line belong to the GUM's Welch–Satterthwaite
 *   step only and never make its distribution a t. Only a Type A line given by its standard uncertainty
 *   with finite ν — the mean of n indications, s/√n with ν = n − 1, as the repeatability line — is a
 *   scaled and shifted t with ν degrees of freedom (6.4.9); with ν = ∞ a Gaussian.
 * - Correlations (the point's `inputs.correlations`, pairs of template indices with r): each pair of
 *   lines becomes a pair of Monte Carlo inputs sampled jointly (JCGM 101 6.4.8 with a Gaussian copula
 *   for non-normal lines; see shared/uncertainty/montecarlo.ts). A line added to the output enters as
 *   |cᵢ|·δᵢ, so r is multiplied by the sign of cᵢ for each such line. Use {@link monteCarloPlanInputs}
 *   for the five model inputs and the output terms as one list with the correlations in its indices,
 *   and {@link planModel} for the matching model (reading + Σ output terms): correlated output terms
 *   must be drawn in the same trials as the model inputs.
 * - A point whose reference is a radiance temperature (shared/calibration/compute.ts, step 1) runs the
 *   two-step model of shared/radiometry/radianceTemperature.ts over {@link MC_RADIANCE_MODEL_INPUTS}
 *   (T_rad, ε_s, T_w0, T_w, T_d, ε_i): ε_s is sampled once and enters both steps. Lines that move the
 *   surface temperature T_s itself are then added to the output to first order (c = ∂T_meas/∂T_s), as
 *   the notes say. {@link planReadingModel} gives the model for either plan.
 * - A ratio pyrometer's point runs the two-colour model of shared/radiometry/ratio.ts over
 *   {@link MC_RATIO_MODEL_INPUTS} (T_s, ε_1, ε_2, T_w, k); lines on the instrument temperature or the
 *   emissivity setting, which do not enter that model (c = 0), are left out, as the notes say.
 */
import type { RadiationConstantsId } from '../radiometry/constants'
import type { Band } from '../radiometry/planck'
import { INVERSION_RANGE_K } from '../radiometry/inversion'
import { radianceTemperatureReadingModel } from '../radiometry/radianceTemperature'
import { ratioReadingModel } from '../radiometry/ratio'
import { readingModel } from '../radiometry/reading'
import type { MonteCarloCorrelation, MonteCarloInput } from '../uncertainty/montecarlo'
import type { BandInput, BudgetLine, CertifiedBandInput, PointResult } from '../types/runs'

/** Inputs of the reading model x = [T_s, ε_s, T_w, T_d, ε_i] (shared/radiometry/reading.ts readingModel). */
export const MC_MODEL_INPUTS = ['sourceTemperatureK', 'sourceEmissivity', 'reflectedTemperatureK', 'instrumentTemperatureK', 'emissivitySetting'] as const
export type McModelInput = (typeof MC_MODEL_INPUTS)[number]
/** Inputs of the radiance-temperature model x = [T_rad, ε_s, T_w0, T_w, T_d, ε_i] (radianceTemperatureReadingModel). */
export const MC_RADIANCE_MODEL_INPUTS = ['radianceTemperatureK', 'sourceEmissivity', 'certificationReflectedTemperatureK', 'reflectedTemperatureK', 'instrumentTemperatureK', 'emissivitySetting'] as const
export type McRadianceModelInput = (typeof MC_RADIANCE_MODEL_INPUTS)[number]

const LINE_INPUT: Record<string, McModelInput | null> = {
  sourceTemperature: 'sourceTemperatureK',
  sourceEmissivity: 'sourceEmissivity',
  reflectedTemperature: 'reflectedTemperatureK',
  instrumentTemperature: 'instrumentTemperatureK',
  emissivitySetting: 'emissivitySetting',
  reading: null,
}
/** Inputs of the ratio (two-colour) model x = [T_s, ε_1, ε_2, T_w, k] (shared/radiometry/ratio.ts ratioReadingModel). */
export const MC_RATIO_MODEL_INPUTS = ['sourceTemperatureK', 'sourceEmissivity', 'sourceEmissivity2', 'reflectedTemperatureK', 'emissivityRatioSetting'] as const
export type McRatioModelInput = (typeof MC_RATIO_MODEL_INPUTS)[number]
const RATIO_LINE_INPUT: Record<string, McRatioModelInput | null> = {
  sourceTemperature: 'sourceTemperatureK',
  sourceEmissivity: 'sourceEmissivity',
  sourceEmissivity2: 'sourceEmissivity2',
  reflectedTemperature: 'reflectedTemperatureK',
  emissivityRatioSetting: 'emissivityRatioSetting',
  // no part of the two-colour model (c = 0): added to the output with that sensitivity
  instrumentTemperature: null,
  emissivitySetting: null,
  reading: null,
}
const RADIANCE_LINE_INPUT: Record<string, McRadianceModelInput | null> = {
  radianceTemperature: 'radianceTemperatureK',
  certificationReflectedTemperature: 'certificationReflectedTemperatureK',
  sourceEmissivity: 'sourceEmissivity',
  reflectedTemperature: 'reflectedTemperatureK',
  instrumentTemperature: 'instrumentTemperatureK',
  emissivitySetting: 'emissivitySetting',
  sourceTemperature: null,
  reading: null,
}

/**
 * The model a plan runs, as plain data a worker thread can receive: the reading model in the
 * instrument's band, or the radiance-temperature model with the band b0 of the source's certified value.
 */
export type McModelSpec =
  | { kind: 'reading', band: BandInput, constants?: RadiationConstantsId }
  | { kind: 'radiance-temperature', band: BandInput, radianceTemperatureBand: CertifiedBandInput, constants?: RadiationConstantsId }
  | { kind: 'ratio', band: BandInput, band2: BandInput, constants?: RadiationConstantsId }

export interface MonteCarloPlan {
  /** The model the inputs run through. */
  model: McModelSpec
  /** Names of the model inputs in the model's order ({@link MC_MODEL_INPUTS} or {@link MC_RADIANCE_MODEL_INPUTS}). */
  modelInputs: readonly string[]
  /** One distribution per model input, in its unit (K or emissivity), keyed by the names of `modelInputs`. */
  inputs: Record<string, MonteCarloInput>
  /** Zero-mean terms added to the model output, K. */
  outputTerms: MonteCarloInput[]
  /**
   * Correlated pairs, indices in the order of {@link monteCarloPlanInputs}: 0 … m − 1 the model inputs in
   * `modelInputs` order, m + k the output term k. Empty without correlations.
   */
  correlations: MonteCarloCorrelation[]
  /** The GUM result to validate: y = expected reading, u = u_c, U = k·u_c (computed, before any CMC floor), K. */
  gum: { y: number, u: number, U: number }
  notes: string[]
}

/**
 * A distribution for one budget line with centre `value` and scale factor `scale` (|c| for an output term).
 * @param line - budget line (u in the input's unit); its `type` decides between t and Gaussian for a 'standard' line
 * @param value - centre of the distribution, input unit (0 for an output term)
 * @param scale - factor applied to the width (1 for a model input, |cᵢ| for an output term)
 * @returns a Monte Carlo input
 * @example lineDistribution({ distribution: 'rectangular', standardUncertainty: 0.2/√3, … }, 373.15, 1) → rectangular ±0.2 about 373.15
 */
export function lineDistribution(line: BudgetLine, value: number, scale: number): MonteCarloInput {
  const u = line.standardUncertainty * scale
  const name = line.name
  switch (line.distribution) {
    case 'rectangular': return { name, distribution: 'rectangular', value, halfWidth: u * Math.sqrt(3) }
    case 'triangular': return { name, distribution: 'triangular', value, halfWidth: u * Math.sqrt(6) }
    case 'u-shaped': return { name, distribution: 'u-shaped', value, halfWidth: u * Math.SQRT2 }
    case 'resolution': return { name, distribution: 'rectangular', value, halfWidth: (u * Math.sqrt(12)) / 2 }
    case 'standard':
      // JCGM 101 6.4.9: only a Type A mean (s/√n, ν = n − 1) is a scaled and shifted t; a Type B
      // standard uncertainty is Gaussian (6.4.7) whatever its ν
      if (line.type === 'A' && line.dof !== null && Number.isFinite(line.dof) && line.dof > 0) return { name, distribution: 'student-t', value, scale: u, dof: line.dof }
      return { name, distribution: 'normal', value, standardUncertainty: u }
    default: return { name, distribution: 'normal', value, standardUncertainty: u }
  }
}

/**
 * The Monte Carlo plan of a computed point (see the module notes).
 * @param result - a stored point result (its budget and inputs)
 * @returns the five model-input distributions, the output terms, the GUM figures and notes
 */
export function monteCarloPlan(result: PointResult): MonteCarloPlan {
  const i = result.inputs
  const basis = i.reference.kind === 'source-correction' ? i.reference.basis : undefined
  const radiance = basis?.kind === 'radiance-temperature' ? basis : null
  const ratio = i.ratio ?? null
  const model: McModelSpec = ratio
    ? { kind: 'ratio', band: i.band, band2: ratio.band2 }
    : radiance ? { kind: 'radiance-temperature', band: i.band, radianceTemperatureBand: radiance.band } : { kind: 'reading', band: i.band }
  const names: readonly string[] = ratio ? MC_RATIO_MODEL_INPUTS : radiance ? MC_RADIANCE_MODEL_INPUTS : MC_MODEL_INPUTS
  const lineInput: Record<string, string | null> = ratio ? RATIO_LINE_INPUT : radiance ? RADIANCE_LINE_INPUT : LINE_INPUT
  const at: Record<string, number> = {
    sourceEmissivity2: ratio ? ratio.sourceEmissivity2 : Number.NaN,
    emissivityRatioSetting: ratio ? ratio.emissivityRatioSetting : Number.NaN,
    sourceTemperatureK: result.referenceTemperatureK,
    radianceTemperatureK: result.referenceTemperatureK,
    certificationReflectedTemperatureK: radiance ? radiance.reflectedTemperatureK : Number.NaN,
    sourceEmissivity: i.sourceEmissivity,
    reflectedTemperatureK: i.reflectedTemperatureK,
    instrumentTemperatureK: i.instrumentTemperatureK ?? Number.NaN,
    emissivitySetting: i.emissivitySetting ?? Number.NaN,
  }
  const notes: string[] = []
  const outputTerms: MonteCarloInput[] = []
  const inputs: Record<string, MonteCarloInput> = Object.fromEntries(names.map(k => [k, { name: k, distribution: 'constant', value: at[k]! } as MonteCarloInput]))
  // where each budget line went: a model input slot (0 … m − 1) or an output term (m + k), with its sign
  const slotOf = new Map<number, { slot: number, sign: number }>()
  const lines = result.budget.components
  const indexOf = new Map(lines.map((l, i) => [l, i]))
  const m = names.length
  for (const [slot, k] of names.entries()) {
    const onInput = lines.filter(l => lineInput[l.input] === k && l.standardUncertainty > 0)
    if (!onInput.length) continue
    const sorted = [...onInput].sort((a, b) => b.contributionK - a.contributionK)
    inputs[k] = { ...lineDistribution(sorted[0]!, at[k]!, 1), name: k }
    slotOf.set(indexOf.get(sorted[0]!)!, { slot, sign: 1 })
    for (const extra of sorted.slice(1)) {
      slotOf.set(indexOf.get(extra)!, { slot: m + outputTerms.length, sign: Math.sign(extra.sensitivity) || 1 })
      outputTerms.push(lineDistribution(extra, 0, Math.abs(extra.sensitivity)))
      notes.push(`${extra.name}: a second component on ${extra.input}, added to the reading to first order (c = ${Number(extra.sensitivity.toPrecision(4))})`)
    }
  }
  lines.forEach((l, i) => {
    if (lineInput[l.input] !== null || !(l.standardUncertainty > 0)) return
    if (ratio && l.input !== 'reading') {
      // the instrument temperature and the emissivity setting are no inputs of the two-colour model (c = 0)
      notes.push(`${l.name}: no input of the two-colour model (c = 0); left out`)
      return
    }
    slotOf.set(i, { slot: m + outputTerms.length, sign: l.input === 'reading' ? 1 : Math.sign(l.sensitivity) || 1 })
    outputTerms.push(lineDistribution(l, 0, l.input === 'reading' ? 1 : Math.abs(l.sensitivity)))
    if (l.input !== 'reading') notes.push(`${l.name}: moves the surface temperature found from the radiance temperature; added to the reading to first order (c = ${Number(l.sensitivity.toPrecision(4))})`)
  })
  const correlations: MonteCarloCorrelation[] = []
  for (const c of result.inputs.correlations ?? []) {
    const [a, b] = c.between
    const sa = slotOf.get(a)
    const sb = slotOf.get(b)
    if (!sa || !sb || c.coefficient === 0) {
      if (c.coefficient !== 0) notes.push(`The correlation between lines ${a} and ${b} is left out: one of them has no uncertainty.`)
      continue
    }
    if (sa.slot === sb.slot) continue
    correlations.push({ between: [sa.slot, sb.slot], coefficient: c.coefficient * sa.sign * sb.sign })
    notes.push(`${lines[a]!.name} and ${lines[b]!.name}: sampled jointly with r = ${c.coefficient} (JCGM 101 6.4.8; a Gaussian copula matched to r for non-normal lines).`)
  }
  return {
    model,
    modelInputs: names,
    inputs,
    outputTerms,
    correlations,
    gum: { y: result.expectedReadingK, u: result.budget.combinedStandardUncertaintyK, U: result.budget.expandedUncertaintyK },
    notes,
  }
}

/**
 * The plan's distributions as one list: the model inputs in `plan.modelInputs` order, then the
 * output terms; with the correlations in the same indices. Run it with {@link planReadingModel}.
 * @param plan - a Monte Carlo plan
 * @returns inputs (model inputs in K or emissivity, output terms in K) and correlations
 * @example runMonteCarlo(planReadingModel(plan), ...Object.values(monteCarloPlanInputs(plan)))
 */
export function monteCarloPlanInputs(plan: MonteCarloPlan): { inputs: MonteCarloInput[], correlations: MonteCarloCorrelation[] } {
  const names = plan.modelInputs ?? MC_MODEL_INPUTS
  return { inputs: [...names.map(k => plan.inputs[k]!), ...plan.outputTerms], correlations: plan.correlations }
}

/**
 * The model for {@link monteCarloPlanInputs}: y = reading(x₀…x_{m−1}) + Σ x_{m+k} (the output terms).
 * @param reading - the model over the m model inputs (e.g. `readingModel(band)` over [T_s, ε_s, T_w, T_d, ε_i]), K
 * @param modelInputs - m, the number of model inputs (default 5, the reading model's)
 * @returns model function, K
 * @example planModel(readingModel(band))(x) = reading(x) + x[5] + x[6] + …
 */
export function planModel(reading: (x: ArrayLike<number>) => number, modelInputs: number = MC_MODEL_INPUTS.length): (x: Float64Array) => number {
  const n = modelInputs
  return (x: Float64Array): number => {
    let s = reading(x)
    for (let i = n; i < x.length; i++) s += x[i]!
    return s
  }
}

/**
 * The model a plan (or a worker's copy of its spec) runs, with the output terms added: the reading
 * model over a signal table for a tabulated band (readingModel with temperatureRangeK = the inversion
 * range, 50 K to 5000 K, tables built lazily where trials go), or the radiance-temperature model.
 * @param spec - the plan's model (`plan.model`; constants default CODATA 2018)
 * @returns y = f(x) + Σ output terms, K
 * @throws EngineInputError (`band…`, `radianceTemperatureBand…`) for a band the engine refuses
 * @example runMonteCarlo(planReadingModel(plan.model), monteCarloPlanInputs(plan).inputs, { correlations: plan.correlations })
 */
export function planReadingModel(spec: McModelSpec): (x: Float64Array) => number {
  if (spec.kind === 'ratio') return planModel(ratioReadingModel(spec.band as Band, spec.band2 as Band, spec.constants), MC_RATIO_MODEL_INPUTS.length)
  if (spec.kind === 'radiance-temperature') {
    return planModel(radianceTemperatureReadingModel(spec.radianceTemperatureBand as Band, spec.band as Band, spec.constants), MC_RADIANCE_MODEL_INPUTS.length)
  }
  return planModel(readingModel(spec.band as Band, spec.constants, { temperatureRangeK: INVERSION_RANGE_K }), MC_MODEL_INPUTS.length)
}
