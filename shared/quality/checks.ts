/**
 * Judging one intermediate check of a piece of reference equipment (ISO/IEC 17025:2017 6.4.10,
 * "intermediate checks … to maintain confidence in the performance of the equipment", and 7.7.1).
 *
 * A check compares what the item is supposed to give (`nominalK`: a source's set-point with its
 * certificate correction, a reference thermometer's corrected reading, a check standard's assigned
 * value) with what the check measured (`measuredK`). The deviation is d = measured − nominal, K:
 * the correction the item would need at that value (true − value the laboratory uses).
 *
 * Two acceptance rules, as the check plan states:
 * - `limit`: |d| ≤ limit (a tolerance the laboratory sets, e.g. a fraction of the item's
 *   uncertainty budget). A deviation on the limit passes ("≤").
 * - `en`: the normalized error E_n = d/√(U_meas² + U_nom²) with both expanded uncertainties
 *   (ISO 13528:2015 9.7, via {@link enNumber}); |E_n| ≤ 1 passes.
 * As in ./proficiency.ts, a computed value within the rounding bound of its own computation
 * (τ = 8·ε·(|measured| + |nominal|), K) of the limit counts as on it: 273.25 − 273.15 is
 * 0.10000000000002274 in binary, and a 0.1 K limit passes it.
 */

import { EngineInputError } from '../radiometry/errors'
import type { CheckAcceptance, CheckVerdict } from './constants'
import { enNumber } from './proficiency'

/** Input of {@link evaluateCheck}; temperatures and uncertainties in K. */
export interface CheckInput {
  /** What the item is supposed to give, K (> 0). */
  nominalK: number
  /** What the check measured, K (> 0). */
  measuredK: number
  /** The plan's rule. */
  acceptance: CheckAcceptance
  /** For `limit`: the largest |measured − nominal| accepted, K (> 0). */
  acceptanceLimitK?: number | null
  /** Expanded uncertainty of the measured value, K (≥ 0); needed for `en`. */
  expandedUncertaintyK?: number | null
  /** Expanded uncertainty of the nominal value, K (≥ 0); needed for `en`. */
  nominalUncertaintyK?: number | null
}

/** Result of {@link evaluateCheck}. */
export interface CheckEvaluation {
  /** d = measured − nominal, K. */
  deviationK: number
  /** E_n for the `en` rule, dimensionless; null for `limit`. */
  en: number | null
  verdict: CheckVerdict
  /** One plain sentence for the record, e.g. "Deviation +0.62 K exceeds the limit ±0.50 K". */
  statement: string
}

function temperature(v: unknown, field: string): number {
  if (typeof v !== 'number' || !Number.isFinite(v) || v <= 0) throw new EngineInputError(field, `must be a temperature above 0 K, got ${String(v)}`)
  return v
}

function kelvin(x: number): string {
  const s = Number(x.toPrecision(4)).toString()
  return `${x > 0 ? '+' : x < 0 ? '−' : ''}${s.replace(/^-/, '')} K`
}

/**
 * Deviation and verdict of one intermediate check (see the module notes).
 * @param input - nominalK and measuredK (K), the acceptance rule with its limit (K) or the two expanded uncertainties (K)
 * @returns deviation d = measured − nominal (K), E_n (dimensionless, `en` rule only), verdict and a statement
 * @throws EngineInputError (`nominalK`, `measuredK`, `acceptance`, `acceptanceLimitK`, `expandedUncertaintyK`, `nominalUncertaintyK`)
 * @example evaluateCheck({ nominalK: 373.15, measuredK: 373.77, acceptance: 'limit', acceptanceLimitK: 0.5 })
 *   // { deviationK: 0.62 (to rounding), verdict: 'fail', … }
 */
export function evaluateCheck(input: CheckInput): CheckEvaluation {
  const nominal = temperature(input.nominalK, 'nominalK')
  const measured = temperature(input.measuredK, 'measuredK')
  const d = measured - nominal
  if (input.acceptance === 'limit') {
    const limit = input.acceptanceLimitK
    if (typeof limit !== 'number' || !Number.isFinite(limit) || limit <= 0) {
      throw new EngineInputError('acceptanceLimitK', `must be a limit above 0 K for a check judged by a limit, got ${String(limit)}`)
    }
    const tau = 8 * Number.EPSILON * (Math.abs(measured) + Math.abs(nominal))
    const pass = Math.abs(d) <= limit + tau
    return {
      deviationK: d,
      en: null,
      verdict: pass ? 'pass' : 'fail',
      statement: `Deviation ${kelvin(d)} ${pass ? 'within' : 'exceeds'} the limit ±${Number(limit.toPrecision(4))} K`,
    }
  }
  if (input.acceptance !== 'en') throw new EngineInputError('acceptance', `must be 'limit' or 'en', got ${String(input.acceptance)}`)
  const U = input.expandedUncertaintyK
  const Unom = input.nominalUncertaintyK
  if (typeof U !== 'number' || !Number.isFinite(U) || U < 0) throw new EngineInputError('expandedUncertaintyK', `is needed for a check judged by E_n: a number ≥ 0 K, got ${String(U)}`)
  if (typeof Unom !== 'number' || !Number.isFinite(Unom) || Unom < 0) throw new EngineInputError('nominalUncertaintyK', `is needed for a check judged by E_n: a number ≥ 0 K, got ${String(Unom)}`)
  if (U === 0 && Unom === 0) throw new EngineInputError('expandedUncertaintyK', 'and nominalUncertaintyK are both zero; E_n needs at least one uncertainty above zero')
  const r = enNumber({ labValue: measured, labExpandedUncertainty: U, referenceValue: nominal, referenceExpandedUncertainty: Unom })
  const pass = r.verdict === 'satisfactory'
  return {
    deviationK: d,
    en: r.en,
    verdict: pass ? 'pass' : 'fail',
    statement: `Deviation ${kelvin(d)}, E_n = ${Number(r.en.toPrecision(3))}: |E_n| ${pass ? '≤' : '>'} 1`,
  }
}
