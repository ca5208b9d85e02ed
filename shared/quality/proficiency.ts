/**
 * Performance statistics for proficiency testing and interlaboratory comparisons, used by a
 * laboratory to assure the validity of its results (ISO/IEC 17025:2017 7.7.2).
 *
 * Formulas and interpretation (ISO 13528:2015 clause 9, "Calculation of performance statistics";
 * the same criteria in ISO/IEC 17043:2010 Annex B.4.1.1 — clause numbers *from memory*):
 * - E_n number (ISO 13528:2015 9.7): E_n = (x − X) / √(U_lab² + U_ref²), with expanded
 *   uncertainties; |E_n| ≤ 1 satisfactory, |E_n| > 1 unsatisfactory. The usual statistic for a
 *   comparison of calibration laboratories against a reference laboratory.
 * - z score (9.4): z = (x − X) / σ_pt; |z| ≤ 2 satisfactory, 2 < |z| < 3 questionable,
 *   |z| ≥ 3 unsatisfactory.
 * - z′ score (9.5): z′ = (x − X) / √(σ_pt² + u(X)²), same interpretation as z; used when the
 *   uncertainty of the assigned value is not negligible.
 * - ζ (zeta) score (9.6): ζ = (x − X) / √(u(x)² + u(X)²), with standard uncertainties; same
 *   interpretation as z.
 *
 * **Boundaries.** A score exactly on a limit belongs to the better class at 2 and 1 (|z| = 2 and
 * |E_n| = 1 are satisfactory, as the standards write "≤") and to the worse class at 3 (|z| = 3 is
 * unsatisfactory, "≥ 3"). In floating point the score of decimal inputs that are exactly on a
 * limit often comes out a few units in the last place off it — (273.25 − 273.15)/0.05 gives
 * 2.0000000000004547, (12.1 − 10)/0.7 gives 2.9999999999999996 — because x − X cancels digits.
 * So a computed score counts as **on** a limit when it is within the rounding bound of its own
 * computation,
 *   τ = 8·ε·((|x| + |X|)/d + |score|),  ε = 2⁻⁵² (Number.EPSILON), d the denominator,
 * which is several times the worst-case error of subtracting, representing and dividing the inputs.
 * Anything farther from the limit than τ is classified as computed: z = 2 + 1e-12 from x = 2 + 1e-12,
 * X = 0, σ_pt = 1 (τ ≈ 7e-15) is questionable; z = 3 − 1e-12 is questionable.
 */

import { EngineInputError } from '../radiometry/errors'

/** Verdict of an E_n number. */
export type EnVerdict = 'satisfactory' | 'unsatisfactory'

/** Verdict of a z, z′ or ζ score. */
export type ScoreVerdict = 'satisfactory' | 'questionable' | 'unsatisfactory'

function finite(v: unknown, field: string): number {
  if (typeof v !== 'number' || !Number.isFinite(v)) throw new EngineInputError(field, `must be a finite number, got ${String(v)}`)
  return v
}

function nonNegative(v: unknown, field: string): number {
  const x = finite(v, field)
  if (x < 0) throw new EngineInputError(field, `must not be negative, got ${x}`)
  return x
}

function positive(v: unknown, field: string): number {
  const x = finite(v, field)
  if (x <= 0) throw new EngineInputError(field, `must be greater than zero, got ${x}`)
  return x
}

/**
 * Rounding bound of a score (x − X)/d computed in binary floating point (see the module notes).
 * @param x - participant's value (any unit)
 * @param X - reference or assigned value (same unit)
 * @param d - denominator (same unit, > 0)
 * @param score - the computed score (dimensionless)
 * @returns τ, dimensionless
 */
function roundingBound(x: number, X: number, d: number, score: number): number {
  return 8 * Number.EPSILON * ((Math.abs(x) + Math.abs(X)) / d + Math.abs(score))
}

/**
 * Classifies |score| against the z-score limits 2 and 3 with the rounding bound τ.
 * @param score - z, z′ or ζ (dimensionless)
 * @param tau - rounding bound of the score (dimensionless)
 */
function classifyZ(score: number, tau: number): ScoreVerdict {
  const a = Math.abs(score)
  if (a <= 2 + tau) return 'satisfactory'
  if (a < 3 - tau) return 'questionable'
  return 'unsatisfactory'
}

/** Input of {@link enNumber}; values and uncertainties in one unit (e.g. K). */
export interface EnNumberInput {
  /** The laboratory's result x (e.g. K). */
  labValue: number
  /** The laboratory's expanded uncertainty U_lab (same unit, ≥ 0; usually k = 2). */
  labExpandedUncertainty: number
  /** The reference laboratory's value X (same unit). */
  referenceValue: number
  /** The reference value's expanded uncertainty U_ref (same unit, ≥ 0). */
  referenceExpandedUncertainty: number
}

/** Result of {@link enNumber}. */
export interface EnNumberResult {
  /** E_n, dimensionless. */
  en: number
  /** x − X (same unit as the input). */
  difference: number
  /** √(U_lab² + U_ref²) (same unit as the input). */
  denominator: number
  /** 'satisfactory' when |E_n| ≤ 1 (a computed value within rounding of 1 counts as 1). */
  verdict: EnVerdict
  /** Where the criterion comes from. */
  reference: string
}

/**
 * E_n number of a laboratory's result against a reference value (ISO 13528:2015 9.7, *from memory*;
 * ISO/IEC 17043:2010 B.4.1.1): E_n = (x − X)/√(U_lab² + U_ref²); satisfactory iff |E_n| ≤ 1.
 * @param input - labValue x, labExpandedUncertainty U_lab, referenceValue X, referenceExpandedUncertainty U_ref (one unit, e.g. K)
 * @returns E_n (dimensionless), x − X, the denominator and the verdict
 * @throws EngineInputError (`labValue`, `labExpandedUncertainty`, `referenceValue`,
 *   `referenceExpandedUncertainty`); both uncertainties zero is rejected on `labExpandedUncertainty`
 * @example enNumber({ labValue: 373.45, labExpandedUncertainty: 0.3, referenceValue: 373.15, referenceExpandedUncertainty: 0.4 })
 *   // { en: 0.6 (0.3/0.5), verdict: 'satisfactory', … }
 */
export function enNumber(input: EnNumberInput): EnNumberResult {
  const x = finite(input.labValue, 'labValue')
  const Ulab = nonNegative(input.labExpandedUncertainty, 'labExpandedUncertainty')
  const X = finite(input.referenceValue, 'referenceValue')
  const Uref = nonNegative(input.referenceExpandedUncertainty, 'referenceExpandedUncertainty')
  const d = Math.hypot(Ulab, Uref)
  if (d === 0) {
    throw new EngineInputError('labExpandedUncertainty', 'and referenceExpandedUncertainty are both zero; E_n needs at least one uncertainty above zero')
  }
  const en = (x - X) / d
  const tau = roundingBound(x, X, d, en)
  return {
    en,
    difference: x - X,
    denominator: d,
    verdict: Math.abs(en) <= 1 + tau ? 'satisfactory' : 'unsatisfactory',
    reference: 'ISO 13528:2015 9.7 (E_n; |E_n| ≤ 1 satisfactory)',
  }
}

/** Input of {@link zScore}; values in one unit (e.g. K). */
export interface ZScoreInput {
  /** The laboratory's result x (e.g. K). */
  labValue: number
  /** The assigned value X of the scheme (same unit). */
  assignedValue: number
  /** Standard deviation for proficiency assessment σ_pt (same unit, > 0), set by the scheme. */
  standardDeviationForProficiency: number
}

/** Result of {@link zScore}, {@link zPrimeScore} and {@link zetaScore}. */
export interface ScoreResult {
  /** The score, dimensionless (z, z′ or ζ). */
  score: number
  /** x − X (same unit as the input). */
  difference: number
  /** The denominator (same unit as the input). */
  denominator: number
  /** |s| ≤ 2 satisfactory; 2 < |s| < 3 questionable; |s| ≥ 3 unsatisfactory. */
  verdict: ScoreVerdict
  /** Where the criterion comes from. */
  reference: string
}

/**
 * z score (ISO 13528:2015 9.4, *from memory*): z = (x − X)/σ_pt. |z| ≤ 2 satisfactory,
 * 2 < |z| < 3 questionable ("warning signal"), |z| ≥ 3 unsatisfactory ("action signal").
 * @param input - labValue x, assignedValue X, standardDeviationForProficiency σ_pt (one unit, e.g. K)
 * @returns z (dimensionless, also as `score`), x − X, σ_pt and the verdict
 * @throws EngineInputError (`labValue`, `assignedValue`, `standardDeviationForProficiency`)
 * @example zScore({ labValue: 373.45, assignedValue: 373.15, standardDeviationForProficiency: 0.12 })
 *   // z = 2.5, 'questionable'
 */
export function zScore(input: ZScoreInput): ScoreResult & { z: number } {
  const x = finite(input.labValue, 'labValue')
  const X = finite(input.assignedValue, 'assignedValue')
  const s = positive(input.standardDeviationForProficiency, 'standardDeviationForProficiency')
  const z = (x - X) / s
  return {
    z,
    score: z,
    difference: x - X,
    denominator: s,
    verdict: classifyZ(z, roundingBound(x, X, s, z)),
    reference: 'ISO 13528:2015 9.4 (z score; |z| ≤ 2 satisfactory, 2 < |z| < 3 questionable, |z| ≥ 3 unsatisfactory)',
  }
}

/** Input of {@link zPrimeScore}; values in one unit (e.g. K). */
export interface ZPrimeScoreInput extends ZScoreInput {
  /** Standard uncertainty of the assigned value u(X) (same unit, ≥ 0). */
  assignedStandardUncertainty: number
}

/**
 * z′ score (ISO 13528:2015 9.5, *from memory*): z′ = (x − X)/√(σ_pt² + u(X)²), interpreted as z.
 * @param input - labValue x, assignedValue X, standardDeviationForProficiency σ_pt, assignedStandardUncertainty u(X) (one unit)
 * @returns z′ (dimensionless, as `zPrime` and `score`), x − X, the denominator and the verdict
 * @throws EngineInputError (`labValue`, `assignedValue`, `standardDeviationForProficiency`, `assignedStandardUncertainty`)
 * @example zPrimeScore({ labValue: 10.5, assignedValue: 10, standardDeviationForProficiency: 0.3, assignedStandardUncertainty: 0.4 }).zPrime === 1
 */
export function zPrimeScore(input: ZPrimeScoreInput): ScoreResult & { zPrime: number } {
  const x = finite(input.labValue, 'labValue')
  const X = finite(input.assignedValue, 'assignedValue')
  const s = positive(input.standardDeviationForProficiency, 'standardDeviationForProficiency')
  const uX = nonNegative(input.assignedStandardUncertainty, 'assignedStandardUncertainty')
  const d = Math.hypot(s, uX)
  const zp = (x - X) / d
  return {
    zPrime: zp,
    score: zp,
    difference: x - X,
    denominator: d,
    verdict: classifyZ(zp, roundingBound(x, X, d, zp)),
    reference: 'ISO 13528:2015 9.5 (z′ score; interpreted as z)',
  }
}

/** Input of {@link zetaScore}; values and standard uncertainties in one unit (e.g. K). */
export interface ZetaScoreInput {
  /** The laboratory's result x (e.g. K). */
  labValue: number
  /** The laboratory's standard uncertainty u(x) (same unit, ≥ 0; k = 1). */
  labStandardUncertainty: number
  /** The assigned value X (same unit). */
  assignedValue: number
  /** Standard uncertainty of the assigned value u(X) (same unit, ≥ 0). */
  assignedStandardUncertainty: number
}

/**
 * ζ (zeta) score (ISO 13528:2015 9.6, *from memory*): ζ = (x − X)/√(u(x)² + u(X)²) with
 * **standard** uncertainties, interpreted as z (|ζ| ≤ 2 satisfactory, 2 < |ζ| < 3 questionable,
 * |ζ| ≥ 3 unsatisfactory). With k = 2 on both sides, ζ = 2·E_n.
 * @param input - labValue x, labStandardUncertainty u(x), assignedValue X, assignedStandardUncertainty u(X) (one unit)
 * @returns ζ (dimensionless, as `zeta` and `score`), x − X, the denominator and the verdict
 * @throws EngineInputError (`labValue`, `labStandardUncertainty`, `assignedValue`,
 *   `assignedStandardUncertainty`); both uncertainties zero is rejected on `labStandardUncertainty`
 * @example zetaScore({ labValue: 373.45, labStandardUncertainty: 0.15, assignedValue: 373.15, assignedStandardUncertainty: 0.2 }).zeta // 1.2
 */
export function zetaScore(input: ZetaScoreInput): ScoreResult & { zeta: number } {
  const x = finite(input.labValue, 'labValue')
  const ux = nonNegative(input.labStandardUncertainty, 'labStandardUncertainty')
  const X = finite(input.assignedValue, 'assignedValue')
  const uX = nonNegative(input.assignedStandardUncertainty, 'assignedStandardUncertainty')
  const d = Math.hypot(ux, uX)
  if (d === 0) {
    throw new EngineInputError('labStandardUncertainty', 'and assignedStandardUncertainty are both zero; ζ needs at least one uncertainty above zero')
  }
  const zeta = (x - X) / d
  return {
    zeta,
    score: zeta,
    difference: x - X,
    denominator: d,
    verdict: classifyZ(zeta, roundingBound(x, X, d, zeta)),
    reference: 'ISO 13528:2015 9.6 (ζ score with standard uncertainties; interpreted as z)',
  }
}

/** Input of {@link evaluateProficiency}; values and uncertainties in one unit (e.g. K). */
export interface ProficiencyInput extends EnNumberInput {
  /** σ_pt of a scheme that reports z scores (same unit, > 0), or null/absent when it reports none. */
  standardDeviationForProficiency?: number | null
}

/** Result of {@link evaluateProficiency}. */
export interface ProficiencyEvaluation {
  en: EnNumberResult
  /** The z score when the scheme gives σ_pt, else null. */
  z: (ScoreResult & { z: number }) | null
  /** The worse of the two verdicts (E_n: satisfactory or unsatisfactory; z: three classes). */
  verdict: ScoreVerdict
}

const RANK: Record<ScoreVerdict, number> = { satisfactory: 0, questionable: 1, unsatisfactory: 2 }

/**
 * E_n of a result (always) and its z score (when the scheme gives σ_pt), with the overall verdict:
 * the worse of the two (ISO 13528:2015 9.4 and 9.7, *from memory*; see the module notes).
 * @param input - labValue x, labExpandedUncertainty U_lab, referenceValue X, referenceExpandedUncertainty U_ref and optionally
 *   standardDeviationForProficiency σ_pt (one unit, e.g. K)
 * @returns the E_n result, the z result or null, and the overall verdict
 * @throws EngineInputError as {@link enNumber} and {@link zScore}
 * @example evaluateProficiency({ labValue: 373.45, labExpandedUncertainty: 0.3, referenceValue: 373.15, referenceExpandedUncertainty: 0.4,
 *   standardDeviationForProficiency: 0.12 }).verdict // 'questionable' (E_n = 0.6 satisfactory, z = 2.5 questionable)
 */
export function evaluateProficiency(input: ProficiencyInput): ProficiencyEvaluation {
  const en = enNumber(input)
  const s = input.standardDeviationForProficiency
  const z = s === null || s === undefined ? null : zScore({ labValue: input.labValue, assignedValue: input.referenceValue, standardDeviationForProficiency: s })
  const verdict = z && RANK[z.verdict] > RANK[en.verdict] ? z.verdict : en.verdict
  return { en, z, verdict }
}
