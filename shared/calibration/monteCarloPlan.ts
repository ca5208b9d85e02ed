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
 * - Distributions (JCGM 101 6.4): normal U/k → Gaussian; rectangular, triangular, U-shaped (arcsine)
 *   with their half-width; a line given by its standard uncertainty with finite ν → scaled and
 *   shifted t with ν degrees of freedom (6.4.9), with ν = ∞ → Gaussian; the display resolution →
 *   rectangular of width δ.
 */
import type { MonteCarloInput } from '../uncertainty/montecarlo'
import type { BudgetLine, PointResult } from '../types/runs'

export const MC_MODEL_INPUTS = ['sourceTemperatureK', 'sourceEmissivity', 'reflectedTemperatureK', 'instrumentTemperatureK', 'emissivitySetting'] as const
export type McModelInput = (typeof MC_MODEL_INPUTS)[number]

const LINE_INPUT: Record<string, McModelInput | null> = {
  sourceTemperature: 'sourceTemperatureK',
  sourceEmissivity: 'sourceEmissivity',
  reflectedTemperature: 'reflectedTemperatureK',
  instrumentTemperature: 'instrumentTemperatureK',
  emissivitySetting: 'emissivitySetting',
  reading: null,
}

export interface MonteCarloPlan {
  /** One distribution per model input, in its unit (K or emissivity). */
  inputs: Record<McModelInput, MonteCarloInput>
  /** Zero-mean terms added to the model output, K. */
  outputTerms: MonteCarloInput[]
  /** The GUM result to validate: y = expected reading, u = u_c, U = k·u_c (computed, before any CMC floor), K. */
  gum: { y: number, u: number, U: number }
  notes: string[]
}

/**
 * A distribution for one budget line with centre `value` and scale factor `scale` (|c| for an output term).
 * @param line - budget line (u in the input's unit)
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
      if (line.dof !== null && line.dof > 0) return { name, distribution: 'student-t', value, scale: u, dof: line.dof }
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
  const at: Record<McModelInput, number> = {
    sourceTemperatureK: result.referenceTemperatureK,
    sourceEmissivity: i.sourceEmissivity,
    reflectedTemperatureK: i.reflectedTemperatureK,
    instrumentTemperatureK: i.instrumentTemperatureK,
    emissivitySetting: i.emissivitySetting,
  }
  const notes: string[] = []
  const outputTerms: MonteCarloInput[] = []
  const inputs = Object.fromEntries(MC_MODEL_INPUTS.map(k => [k, { name: k, distribution: 'constant', value: at[k] } as MonteCarloInput])) as Record<McModelInput, MonteCarloInput>
  for (const k of MC_MODEL_INPUTS) {
    const lines = result.budget.components.filter(l => LINE_INPUT[l.input] === k && l.standardUncertainty > 0)
    if (!lines.length) continue
    const sorted = [...lines].sort((a, b) => b.contributionK - a.contributionK)
    inputs[k] = { ...lineDistribution(sorted[0]!, at[k], 1), name: k }
    for (const extra of sorted.slice(1)) {
      outputTerms.push(lineDistribution(extra, 0, Math.abs(extra.sensitivity)))
      notes.push(`${extra.name}: a second component on ${extra.input}, added to the reading to first order (c = ${Number(extra.sensitivity.toPrecision(4))})`)
    }
  }
  for (const l of result.budget.components.filter(l => l.input === 'reading' && l.standardUncertainty > 0)) {
    outputTerms.push(lineDistribution(l, 0, 1))
  }
  return {
    inputs,
    outputTerms,
    gum: { y: result.expectedReadingK, u: result.budget.combinedStandardUncertaintyK, U: result.budget.expandedUncertaintyK },
    notes,
  }
}
