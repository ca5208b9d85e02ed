/**
 * Re-evaluation of an issued result after a reference standard is found out of tolerance
 * (ISO/IEC 17025:2017 7.10 nonconforming work, and 6.4.9 for equipment found defective: "examine
 * the effect of the defect … on previous results").
 *
 * The reference value used at the point (the source temperature T_s, from the reference thermometer
 * or the source's correction table) is found to need a correction δ:
 *   δ = corrected reference value − value used, K
 * (a reference thermometer later found to read 0.3 K high gives δ = −0.3 K). The expected reading
 * moves by c·δ, c = ∂T_meas/∂T_s the point's sensitivity to the reference temperature (from the
 * reading model, `readingSensitivities(...).sourceTemperature` in shared/radiometry; 1 for a
 * radiance-temperature reference), so the error of indication E = reading − expected reading moves
 * by Δ = −c·δ and the corrected error is E′ = E − c·δ. This is the first-order (linear) effect;
 * c varies little over a fraction of a kelvin.
 *
 * Then:
 * - "within uncertainty": |Δ| ≤ U, the stated expanded uncertainty (the shift is covered by the
 *   stated result); a value on the limit counts as inside (within 1e-12 relative, as in
 *   shared/uncertainty/conformity.ts);
 * - the verdict under the same decision rule, tolerance, U and guard band
 *   ({@link decideConformity}) for E′, compared with the stated verdict.
 * U is kept: if the reference's new uncertainty differs, the budget has to be re-evaluated first.
 * What to do with the outcome (notify, recall) is the laboratory's decision (7.10.1); `assessment`
 * only sorts the points: `no-effect`, `within-uncertainty`, `exceeds-uncertainty`, `verdict-changed`.
 */

import { EngineInputError } from '../radiometry/errors'
import { decideConformity, type DecisionResult, type DecisionRule, type Verdict } from '../uncertainty/conformity'

const VERDICTS: readonly Verdict[] = ['pass', 'conditional-pass', 'conditional-fail', 'fail']

/** Input of {@link reevaluatePoint}; temperatures and differences in K. */
export interface ImpactInput {
  /** Stated error of indication E, K. */
  error: number
  /** Stated expanded uncertainty U of E, K (≥ 0). */
  expandedUncertainty: number
  /** Tolerance limit TL, K (> 0). */
  tolerance: number
  /** Decision rule the statement was made with. */
  rule: DecisionRule
  /** Guard-band factor r in w = r·U (default 1; ignored by simple acceptance). */
  guardBandFactor?: number
  /** Verdict stated on the certificate. */
  verdict: Verdict
  /** δ = corrected reference value − value used, K. */
  referenceCorrection: number
  /** c = ∂T_meas/∂T_s at the point, K/K (dimensionless). */
  sensitivity: number
}

/** Result of {@link reevaluatePoint}; differences in K. */
export interface ImpactResult {
  /** Δ = −c·δ, K. */
  errorShift: number
  /** E′ = E + Δ, K. */
  correctedError: number
  /** |Δ| ≤ U. */
  withinUncertainty: boolean
  /** The verdict as stated. */
  statedVerdict: Verdict
  /** The rule applied again to the stated E (a check of the stored statement). */
  recomputedVerdict: Verdict
  /** recomputedVerdict === statedVerdict. */
  statedVerdictReproduced: boolean
  /** The verdict for E′ under the same rule. */
  correctedVerdict: Verdict
  /** correctedVerdict !== statedVerdict. */
  verdictChanged: boolean
  /** How the point is affected. */
  assessment: 'no-effect' | 'within-uncertainty' | 'exceeds-uncertainty' | 'verdict-changed'
  /** The full decision for E′ (tolerance, guard band, acceptance limit, statement). */
  correctedDecision: DecisionResult
  /** One plain sentence for the nonconforming-work record. */
  statement: string
}

function within(x: number, limit: number): boolean {
  return x <= limit + 1e-12 * Math.max(Math.abs(limit), 1e-300)
}

/**
 * Effect of a correction to the reference value on one issued calibration point (see the module notes).
 * @param input - stated error E (K), expandedUncertainty U (K), tolerance TL (K), rule, guardBandFactor r, stated verdict,
 *   referenceCorrection δ (K) and sensitivity c = ∂T_meas/∂T_s (K/K)
 * @returns Δ = −c·δ (K), E′ (K), whether |Δ| ≤ U, the recomputed, stated and corrected verdicts and an assessment
 * @throws EngineInputError (`error`, `expandedUncertainty`, `tolerance`, `rule`, `guardBandFactor`, `verdict`,
 *   `referenceCorrection`, `sensitivity`)
 * @example reevaluatePoint({ error: 0.6, expandedUncertainty: 0.3, tolerance: 1, rule: 'guard-band', verdict: 'pass',
 *   referenceCorrection: -0.2, sensitivity: 1 }) // E′ = 0.8 > 0.7 = TL − U: 'fail', assessment 'verdict-changed'
 */
export function reevaluatePoint(input: ImpactInput): ImpactResult {
  if (!VERDICTS.includes(input.verdict)) {
    throw new EngineInputError('verdict', `unknown verdict '${String(input.verdict)}'; use ${VERDICTS.join(', ')}`)
  }
  const delta = input.referenceCorrection
  if (typeof delta !== 'number' || !Number.isFinite(delta)) throw new EngineInputError('referenceCorrection', `must be a finite number of kelvins, got ${String(delta)}`)
  const c = input.sensitivity
  if (typeof c !== 'number' || !Number.isFinite(c)) throw new EngineInputError('sensitivity', `must be a finite number, got ${String(c)}`)
  const same = {
    expandedUncertainty: input.expandedUncertainty,
    tolerance: input.tolerance,
    rule: input.rule,
    ...(input.guardBandFactor !== undefined ? { guardBandFactor: input.guardBandFactor } : {}),
  }
  // validates error, expandedUncertainty, tolerance, rule and guardBandFactor with their field names
  const original = decideConformity({ error: input.error, ...same })
  const shift = -c * delta
  const corrected = input.error + shift
  const decision = decideConformity({ error: corrected, ...same })
  const U = original.expandedUncertainty
  const withinU = within(Math.abs(shift), U)
  const changed = decision.verdict !== input.verdict
  const assessment: ImpactResult['assessment'] = changed ? 'verdict-changed' : shift === 0 ? 'no-effect' : withinU ? 'within-uncertainty' : 'exceeds-uncertainty'
  const f = (x: number): string => `${Number(x.toPrecision(6))} K`
  const head = `Reference corrected by δ = ${f(delta)} with sensitivity c = ${Number(c.toPrecision(6))}: the error moves by ${f(shift)} from ${f(input.error)} to ${f(corrected)}`
  const uText = withinU ? `within the stated U = ${f(U)}` : `more than the stated U = ${f(U)}`
  const vText = changed ? `the verdict changes from ${input.verdict} to ${decision.verdict}` : `the verdict (${decision.verdict}) is unchanged`
  const check = original.verdict === input.verdict ? '' : ` Note: the rule applied to the stated error gives ${original.verdict}, not the stated ${input.verdict}.`
  return {
    errorShift: shift,
    correctedError: corrected,
    withinUncertainty: withinU,
    statedVerdict: input.verdict,
    recomputedVerdict: original.verdict,
    statedVerdictReproduced: original.verdict === input.verdict,
    correctedVerdict: decision.verdict,
    verdictChanged: changed,
    assessment,
    correctedDecision: decision,
    statement: `${head}, ${uText}; under ${decision.ruleReference} ${vText}.${check}`,
  }
}

/**
 * The correction δ a reference needed at a temperature, from as-found data: rows
 * `[temperatureK, correctionK]` (true value − value the laboratory used). Inside the rows' range δ
 * is interpolated linearly; within `marginK` outside it the nearest row's δ is used; farther out,
 * and for an empty table, the data do not say (null). A single row applies within ±marginK of its
 * temperature. Rows at the same temperature are averaged.
 * @param rows - as-found corrections `[temperatureK, correctionK]`, any order (K, K)
 * @param temperatureK - the reference temperature of the point, K
 * @param marginK - how far outside the data the nearest value still applies, K (≥ 0; default 1)
 * @returns δ in K, or null when the data do not cover the temperature
 * @throws EngineInputError (`rows[i]`, `temperatureK`, `marginK`)
 * @example referenceCorrectionAt([[323.15, -0.1], [373.15, -0.3]], 348.15) // -0.2
 */
export function referenceCorrectionAt(rows: readonly (readonly [number, number])[], temperatureK: number, marginK = 1): number | null {
  if (typeof temperatureK !== 'number' || !Number.isFinite(temperatureK) || temperatureK <= 0) throw new EngineInputError('temperatureK', `must be a temperature above 0 K, got ${String(temperatureK)}`)
  if (typeof marginK !== 'number' || !Number.isFinite(marginK) || marginK < 0) throw new EngineInputError('marginK', `must be a number ≥ 0 K, got ${String(marginK)}`)
  const byT = new Map<number, number[]>()
  rows.forEach((r, i) => {
    if (!Array.isArray(r) || r.length !== 2 || !r.every(v => typeof v === 'number' && Number.isFinite(v)) || r[0] <= 0) {
      throw new EngineInputError(`rows[${i}]`, 'must be [temperatureK, correctionK] with a temperature above 0 K')
    }
    byT.set(r[0], [...(byT.get(r[0]) ?? []), r[1]])
  })
  const pts = [...byT].map(([t, ds]) => [t, ds.reduce((a, b) => a + b, 0) / ds.length] as const).sort((a, b) => a[0] - b[0])
  if (!pts.length) return null
  const first = pts[0]!
  const last = pts[pts.length - 1]!
  if (temperatureK < first[0]) return first[0] - temperatureK <= marginK ? first[1] : null
  if (temperatureK > last[0]) return temperatureK - last[0] <= marginK ? last[1] : null
  for (let i = 1; i < pts.length; i++) {
    const [t0, d0] = pts[i - 1]!
    const [t1, d1] = pts[i]!
    if (temperatureK === t1) return d1
    if (temperatureK < t1) return d0 + (d1 - d0) * (temperatureK - t0) / (t1 - t0)
  }
  return first[1]
}
