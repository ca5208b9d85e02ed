/**
 * Conformity with an accuracy specification and the decision rules of ILAC-G8:09/2019
 * ("Guidelines on Decision Rules and Statements of Conformity"), as required by ISO/IEC 17025:2017
 * 7.8.6.
 *
 * Accuracy specifications (symmetric, ± tolerance limit TL about zero error):
 * - `absolute`: TL = b (K);
 * - `percentOfReading`: TL = a % × |reading|;
 * - `greaterOf`: TL = max(a % × |reading|, b) — "±1 % of reading or ±1 °C, whichever is greater"
 *   (common practice in makers' data sheets);
 * - `percentPlus`: TL = a % × |reading| + b.
 * The reading for "% of reading" is taken **in degrees Celsius** by default, which is what makers
 * of radiation thermometers mean ("1 % of reading" at 500 °C is 5 °C, not 7.7 K); pass
 * `percentBasis: 'kelvin'` for a specification stated on the kelvin reading. Temperatures and the
 * tolerance are in kelvins (a difference of 1 K equals 1 °C).
 *
 * Decision rules (ILAC-G8:09/2019; guard band w = r·U, r = 1 by default):
 * - `simple-acceptance` (w = 0): pass if |E| ≤ TL, else fail (risk of false acceptance up to 50 % at
 *   the limit);
 * - `guard-band`: pass if |E| ≤ TL − w, else fail (with w = U and k = 2, false-accept risk < 2.5 %);
 *   when w ≥ TL nothing can pass;
 * - `non-binary`: pass if |E| ≤ TL − w; conditional pass if TL − w < |E| ≤ TL; conditional fail if
 *   TL < |E| ≤ TL + w; fail if |E| > TL + w.
 * A value on a limit counts as inside it (within 1e-12 relative, to absorb binary rounding).
 *
 * Probability of conformity (JCGM 106:2012, 7.4, for a normal PDF of the error with expectation E and
 * standard uncertainty u): p_c = Φ((T_U − E)/u) − Φ((T_L − E)/u), here with T_L = −TL and T_U = +TL and
 * u = U/k ({@link probabilityOfConformity}). It is reported beside the verdict whatever the rule; the
 * normal PDF is used even when ν_eff is finite (the normal case of JCGM 106 7.4; a scaled t would give
 * slightly lower probabilities near the limits with few degrees of freedom).
 */

import { EngineInputError } from '../radiometry/errors'
import { normalIntervalProbability } from './normal'

/** Accuracy specification of an instrument (the API's `spec`); a in %, b in K. */
export type AccuracySpec =
  | { kind: 'absolute'; b: number }
  | { kind: 'percentOfReading'; a: number }
  | { kind: 'greaterOf'; a: number; b: number }
  | { kind: 'percentPlus'; a: number; b: number }

/** Decision rules (ILAC-G8:09/2019). */
export type DecisionRule = 'simple-acceptance' | 'guard-band' | 'non-binary'

/** Verdicts; the conditional ones only come from the non-binary rule. */
export type Verdict = 'pass' | 'conditional-pass' | 'conditional-fail' | 'fail'

/** Which reading "% of reading" refers to. */
export type PercentBasis = 'celsius' | 'kelvin'

const CELSIUS_OFFSET = 273.15

function finiteNonNeg(v: unknown, field: string): number {
  if (typeof v !== 'number' || !Number.isFinite(v) || v < 0) throw new EngineInputError(field, `must be a finite number ≥ 0, got ${String(v)}`)
  return v
}

/**
 * Tolerance limit TL of an accuracy specification at a reading.
 * @param spec - accuracy specification (a in %, b in K)
 * @param readingK - the instrument reading, K (> 0)
 * @param percentBasis - 'celsius' (default: % of the reading in °C) or 'kelvin'
 * @returns TL, K (= °C difference)
 * @throws EngineInputError (`spec`, `spec.kind`, `spec.a`, `spec.b`, `readingK`, `percentBasis`)
 * @example toleranceLimit({ kind: 'greaterOf', a: 1, b: 1 }, 773.15) === 5 (1 % of 500 °C)
 */
export function toleranceLimit(spec: AccuracySpec, readingK: number, percentBasis: PercentBasis = 'celsius'): number {
  if (typeof readingK !== 'number' || !Number.isFinite(readingK) || readingK <= 0) {
    throw new EngineInputError('readingK', `must be a finite temperature above 0 K, got ${String(readingK)}`)
  }
  if (percentBasis !== 'celsius' && percentBasis !== 'kelvin') {
    throw new EngineInputError('percentBasis', `must be 'celsius' or 'kelvin', got ${String(percentBasis)}`)
  }
  if (typeof spec !== 'object' || spec === null) throw new EngineInputError('spec', 'must be an object with a kind')
  const reading = percentBasis === 'celsius' ? Math.abs(readingK - CELSIUS_OFFSET) : readingK
  switch (spec.kind) {
    case 'absolute':
      return finiteNonNeg(spec.b, 'spec.b')
    case 'percentOfReading':
      return (finiteNonNeg(spec.a, 'spec.a') / 100) * reading
    case 'greaterOf':
      return Math.max((finiteNonNeg(spec.a, 'spec.a') / 100) * reading, finiteNonNeg(spec.b, 'spec.b'))
    case 'percentPlus':
      return (finiteNonNeg(spec.a, 'spec.a') / 100) * reading + finiteNonNeg(spec.b, 'spec.b')
  }
  throw new EngineInputError(
    'spec.kind',
    `unknown specification kind '${String((spec as { kind?: unknown }).kind)}'; use absolute, percentOfReading, greaterOf or percentPlus`,
  )
}

/** Input of {@link probabilityOfConformity}; all in the unit of the error (K). */
export interface ConformityProbabilityInput {
  /** Best estimate E of the error (or of the property), K. */
  error: number
  /** Standard uncertainty u of E, K (≥ 0; u = U/k). */
  standardUncertainty: number
  /** Lower tolerance limit T_L, K; null or omitted for none (one-sided upper limit). */
  lowerLimit?: number | null
  /** Upper tolerance limit T_U, K; null or omitted for none (one-sided lower limit). */
  upperLimit?: number | null
}

/**
 * Probability that the error lies within the tolerance interval, for a normal PDF with expectation E and
 * standard deviation u (JCGM 106:2012, 7.4): p_c = Φ((T_U − E)/u) − Φ((T_L − E)/u), with an erfc-based Φ
 * accurate in relative terms in the tails (./normal). With u = 0 the probability is 1 inside [T_L, T_U]
 * (limits included) and 0 outside.
 * @param input - error E (K), standardUncertainty u (K), lowerLimit T_L and upperLimit T_U (K; one may be null)
 * @returns p_c, dimensionless in [0, 1]
 * @throws EngineInputError (`error`, `standardUncertainty`, `lowerLimit`, `upperLimit`)
 * @example probabilityOfConformity({ error: 0.8, standardUncertainty: 0.15, lowerLimit: -1, upperLimit: 1 }) ≈ 0.90879
 */
export function probabilityOfConformity(input: ConformityProbabilityInput): number {
  if (typeof input !== 'object' || input === null) throw new EngineInputError('error', 'input must be an object')
  const { error: E, standardUncertainty: u } = input
  if (typeof E !== 'number' || !Number.isFinite(E)) throw new EngineInputError('error', `must be a finite number, got ${String(E)}`)
  const uu = finiteNonNeg(u, 'standardUncertainty')
  const limit = (v: unknown, field: string): number | null => {
    if (v === undefined || v === null) return null
    if (typeof v !== 'number' || !Number.isFinite(v)) throw new EngineInputError(field, `must be a finite number (or null for no limit), got ${String(v)}`)
    return v
  }
  const lo = limit(input.lowerLimit, 'lowerLimit')
  const hi = limit(input.upperLimit, 'upperLimit')
  if (lo === null && hi === null) throw new EngineInputError('upperLimit', 'give at least one tolerance limit')
  if (lo !== null && hi !== null && !(hi > lo)) throw new EngineInputError('upperLimit', `must be above lowerLimit (${lo}), got ${hi}`)
  if (uu === 0) return (lo === null || E >= lo) && (hi === null || E <= hi) ? 1 : 0
  const b = lo === null ? Number.NEGATIVE_INFINITY : (lo - E) / uu
  const a = hi === null ? Number.POSITIVE_INFINITY : (hi - E) / uu
  return normalIntervalProbability(b, a)
}

/** Input of {@link decideConformity}; all in K. */
export interface DecisionInput {
  /** Error of indication E = reading − reference (or expected reading), K. */
  error: number
  /** Expanded uncertainty U of E, K (≥ 0). */
  expandedUncertainty: number
  /** Tolerance limit TL, K (> 0). */
  tolerance: number
  /** Decision rule. */
  rule: DecisionRule
  /** Guard-band factor r in w = r·U (default 1; ignored by simple acceptance). */
  guardBandFactor?: number
  /**
   * Standard uncertainty u of E, K, for the probability of conformity; when omitted, u = U/k with
   * `coverageFactor`; with neither, no probability is given.
   */
  standardUncertainty?: number
  /** Coverage factor k of U (> 0), used for u = U/k when `standardUncertainty` is omitted. */
  coverageFactor?: number
}

/** Result of a conformity decision. */
export interface DecisionResult {
  /** Rule applied. */
  rule: DecisionRule
  /** Where the rule comes from, for the certificate. */
  ruleReference: string
  /** TL, K. */
  tolerance: number
  /** Guard band w, K (0 for simple acceptance). */
  guardBand: number
  /** Acceptance limit TL − w, K (may be negative: nothing passes). */
  acceptanceLimit: number
  /** E, K. */
  error: number
  /** U, K. */
  expandedUncertainty: number
  /** Verdict. */
  verdict: Verdict
  /** One plain sentence stating the verdict and why. */
  statement: string
  /**
   * Probability that the error is within ±TL for a normal PDF (JCGM 106:2012, 7.4), dimensionless; null
   * when neither standardUncertainty nor coverageFactor was given.
   */
  probabilityOfConformity: number | null
}

const RULE_REFERENCE: Record<DecisionRule, string> = {
  'simple-acceptance': 'ILAC-G8:09/2019, simple acceptance (w = 0)',
  'guard-band': 'ILAC-G8:09/2019, guarded acceptance (w = r·U)',
  'non-binary': 'ILAC-G8:09/2019, non-binary statement with guard band (w = r·U)',
}

function within(x: number, limit: number): boolean {
  return x <= limit + 1e-12 * Math.max(Math.abs(limit), 1e-300)
}

/**
 * Applies a decision rule to an error of indication (see the module notes for each rule).
 * @param input - error E (K), expandedUncertainty U (K), tolerance TL (K), rule, guardBandFactor r,
 *   standardUncertainty u (K) or coverageFactor k (for p_c with u = U/k)
 * @returns the rule applied, TL, w, TL − w, the verdict, a statement and the probability of conformity
 *   (JCGM 106 7.4; null without u or k)
 * @throws EngineInputError (`error`, `expandedUncertainty`, `tolerance`, `rule`, `guardBandFactor`,
 *   `standardUncertainty`, `coverageFactor`)
 * @example decideConformity({ error: 0.8, expandedUncertainty: 0.3, tolerance: 1, rule: 'non-binary' }).verdict === 'conditional-pass'
 */
export function decideConformity(input: DecisionInput): DecisionResult {
  const { error: E, rule } = input
  if (typeof E !== 'number' || !Number.isFinite(E)) throw new EngineInputError('error', `must be a finite number, got ${String(E)}`)
  const U = finiteNonNeg(input.expandedUncertainty, 'expandedUncertainty')
  const TL = input.tolerance
  if (typeof TL !== 'number' || !Number.isFinite(TL) || TL <= 0) throw new EngineInputError('tolerance', `must be a finite number above 0, got ${String(TL)}`)
  if (rule !== 'simple-acceptance' && rule !== 'guard-band' && rule !== 'non-binary') {
    throw new EngineInputError('rule', `unknown decision rule '${String(rule)}'; use simple-acceptance, guard-band or non-binary`)
  }
  const r = input.guardBandFactor ?? 1
  if (typeof r !== 'number' || !Number.isFinite(r) || r < 0) throw new EngineInputError('guardBandFactor', `must be a finite number ≥ 0, got ${String(r)}`)
  let u: number | null = null
  if (input.standardUncertainty !== undefined) u = finiteNonNeg(input.standardUncertainty, 'standardUncertainty')
  else if (input.coverageFactor !== undefined) {
    const k = input.coverageFactor
    if (typeof k !== 'number' || !Number.isFinite(k) || k <= 0) throw new EngineInputError('coverageFactor', `must be a finite number above 0, got ${String(k)}`)
    u = U / k
  }
  const w = rule === 'simple-acceptance' ? 0 : r * U
  const a = Math.abs(E)
  const acceptance = TL - w
  let verdict: Verdict
  if (rule === 'non-binary') {
    if (acceptance >= 0 && within(a, acceptance)) verdict = 'pass'
    else if (within(a, TL)) verdict = 'conditional-pass'
    else if (within(a, TL + w)) verdict = 'conditional-fail'
    else verdict = 'fail'
  } else {
    verdict = acceptance >= 0 && within(a, acceptance) ? 'pass' : 'fail'
  }
  const f = (x: number): string => `${Number(x.toPrecision(6))} K`
  const limitsText =
    rule === 'simple-acceptance'
      ? `|E| = ${f(a)} against the tolerance ±${f(TL)}`
      : `|E| = ${f(a)} against the tolerance ±${f(TL)} with a guard band w = ${f(w)} (acceptance limit ${f(acceptance)})`
  const verdictText: Record<Verdict, string> = {
    pass: 'Pass',
    'conditional-pass': 'Conditional pass: the error is within the tolerance but the uncertainty interval reaches beyond it',
    'conditional-fail': 'Conditional fail: the error is outside the tolerance but the uncertainty interval reaches inside it',
    fail: 'Fail',
  }
  return {
    rule,
    ruleReference: RULE_REFERENCE[rule],
    tolerance: TL,
    guardBand: w,
    acceptanceLimit: acceptance,
    error: E,
    expandedUncertainty: U,
    verdict,
    statement: `${verdictText[verdict]} (${limitsText}; ${RULE_REFERENCE[rule]}).`,
    probabilityOfConformity: u === null ? null : probabilityOfConformity({ error: E, standardUncertainty: u, lowerLimit: -TL, upperLimit: TL }),
  }
}

/** Input of {@link evaluateConformity}. */
export interface ConformityInput {
  spec: AccuracySpec
  /** Instrument reading at which the specification applies, K. */
  readingK: number
  /** Error of indication E, K. */
  error: number
  /** Expanded uncertainty U of E, K. */
  expandedUncertainty: number
  rule: DecisionRule
  guardBandFactor?: number
  percentBasis?: PercentBasis
  /** Standard uncertainty u of E, K, for the probability of conformity (else u = U/k with coverageFactor). */
  standardUncertainty?: number
  /** Coverage factor k of U, for u = U/k. */
  coverageFactor?: number
}

/**
 * Tolerance at the reading from the specification, then the decision ({@link toleranceLimit} +
 * {@link decideConformity}).
 * @param input - spec, readingK (K), error (K), expandedUncertainty (K), rule, guardBandFactor, percentBasis,
 *   standardUncertainty (K) or coverageFactor for the probability of conformity
 * @returns the decision, with the tolerance computed from the specification and p_c (or null)
 * @example evaluateConformity({ spec: { kind: 'greaterOf', a: 1, b: 1 }, readingK: 373.15, error: -0.6,
 *   expandedUncertainty: 0.5, rule: 'guard-band' }).verdict === 'fail' (TL 1 K, acceptance limit 0.5 K)
 */
export function evaluateConformity(input: ConformityInput): DecisionResult & { percentBasis: PercentBasis } {
  const basis = input.percentBasis ?? 'celsius'
  const tl = toleranceLimit(input.spec, input.readingK, basis)
  if (!(tl > 0)) throw new EngineInputError('spec', `gives a tolerance of ${tl} K at ${input.readingK} K; a tolerance must be above 0`)
  const decision = decideConformity({
    error: input.error,
    expandedUncertainty: input.expandedUncertainty,
    tolerance: tl,
    rule: input.rule,
    ...(input.guardBandFactor !== undefined ? { guardBandFactor: input.guardBandFactor } : {}),
    ...(input.standardUncertainty !== undefined ? { standardUncertainty: input.standardUncertainty } : {}),
    ...(input.coverageFactor !== undefined ? { coverageFactor: input.coverageFactor } : {}),
  })
  return { ...decision, percentBasis: basis }
}
