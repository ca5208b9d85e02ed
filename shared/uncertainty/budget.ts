/**
 * Uncertainty budget by the law of propagation of uncertainty (JCGM 100:2008, the GUM).
 *
 * - Standard uncertainty of each component (GUM 4.3): given directly, or from a distribution:
 *   normal with a stated expanded uncertainty a and coverage factor k → a/k; rectangular
 *   half-width a → a/√3 (GUM 4.3.7); triangular → a/√6 (GUM 4.3.9); U-shaped (arcsine) → a/√2;
 *   resolution: the **full** resolution step δ (the last-digit increment of the display), given in
 *   the `resolution` field, → δ/√12 (GUM F.2.2.1: a rectangular distribution of half-width δ/2).
 *   `halfWidth` is not used for 'resolution', to avoid confusing the step with its half.
 * - Combined standard uncertainty u_c² = Σ (cᵢ·u(xᵢ))² (GUM 5.1.2; uncorrelated inputs), and with
 *   correlated inputs (GUM 5.2.2, eq. (16)) u_c² = Σ cᵢ²u²(xᵢ) + 2 Σ_{i<j} cᵢcⱼu(xᵢ)u(xⱼ)r(xᵢ,xⱼ), the
 *   pairs and their r given in `options.correlations` (signed sensitivities enter here). The
 *   correlation matrix of the lines named in pairs must be positive semi-definite (checked by a
 *   Cholesky factorisation): otherwise the coefficients contradict each other and are rejected. A u_c²
 *   that comes out below zero only by rounding (r = −1 between two lines that cancel exactly) is set to
 *   0 and the result says so in `correlation.notes`.
 * - Effective degrees of freedom by Welch–Satterthwaite, ν_eff = u_c⁴ / Σ (cᵢu(xᵢ))⁴/νᵢ (GUM G.4.1,
 *   eq. G.2b); components with ν = ∞ add nothing to the denominator; all infinite → ν_eff = ∞.
 *   The formula assumes independent components. With correlations, the lines joined by non-zero r form
 *   groups (connected sets); each group enters the denominator as one component whose variance is the
 *   group's share of u_c² (its own variances plus its covariance terms) with ν = the smallest νᵢ of the
 *   group: for equal νᵢ (an "ensemble" of quantities estimated together) this is the treatment of
 *   R. Willink, "A generalization of the Welch–Satterthwaite formula for use with correlated uncertainty
 *   components", Metrologia 44, 340–349 (2007), §4.1.1, as implemented in the GUM Tree Calculator (MSL,
 *   GTC/lib.py `welch_satterthwaite`); the paper itself was not consulted (from memory and that source).
 *   A group of lines all with ν = ∞ adds nothing (as there). For unequal finite νᵢ in one group no
 *   published formula is applied: the smallest ν is our conservative choice (smaller ν, larger k).
 *   Uncorrelated lines enter as in G.2b, so r = 0 everywhere gives exactly the uncorrelated result.
 * - Coverage factor k = t_{(1+p)/2}(ν_eff), the two-sided Student-t quantile (GUM G.3.4, G.6.4),
 *   from `@stdlib/stats-base-dists-t-quantile`. GUM G.4.1 note: a non-integer ν_eff is truncated to
 *   the next lower integer by default (`dofRounding: 'truncate'`, as in GUM H.1, and conservative),
 *   or used as is with `dofRounding: 'fractional'` (the t distribution is defined for real ν, which is
 *   the exact form of interpolating Table G.2). A ν_eff below 1 is never truncated to 0.
 *   For ν = ∞ the normal quantile is needed; the stdlib t quantile returns NaN at ν = ∞, so it is
 *   evaluated at ν = 10¹⁵, where it equals the normal quantile to ~1e-15 (tested against erf).
 * - Expanded uncertainty U = k·u_c (GUM 6.2.1).
 * - Contributions |cᵢ|·u(xᵢ) and their share of u_c² in percent: 100·cᵢu(xᵢ)·Σⱼ r(i,j)cⱼu(xⱼ)/u_c² with
 *   r(i,i) = 1, i.e. each covariance term split equally between its two lines. Without correlations this
 *   is 100·(cᵢu(xᵢ))²/u_c²; the shares always add to 100 %, and with correlations one may be negative (a
 *   line that lowers u_c) or above 100 %.
 * - Rounding (GUM 7.2.6): U to two significant digits, to nearest by default or up on request, and
 *   the value to the same decimal place: {@link roundResult}.
 *
 * JSON cannot carry ∞: an infinite ν is reported as `null` in every result of this module.
 */

import tQuantile from '@stdlib/stats-base-dists-t-quantile'
import { EngineInputError } from '../radiometry/errors'

/** Distribution of a Type B input as accepted by the API (`components[i].distribution`). */
export type Distribution = 'normal' | 'rectangular' | 'triangular' | 'u-shaped' | 'resolution'

/** The distributions {@link evaluateBudget} accepts. */
export const DISTRIBUTIONS: readonly Distribution[] = Object.freeze(['normal', 'rectangular', 'triangular', 'u-shaped', 'resolution'])

/** One line of an uncertainty budget (the API's `components[i]`). */
export interface BudgetComponent {
  /** Name of the input quantity, e.g. 'Reference thermometer'. */
  name: string
  /** Standard uncertainty u(xᵢ) in the input's unit, when known directly (Type A s/√n, or a stated u). */
  standardUncertainty?: number
  /** Distribution, when u(xᵢ) is derived from a half-width, an expanded uncertainty or a resolution. */
  distribution?: Distribution
  /** Half-width a (rectangular, triangular, u-shaped), or the expanded uncertainty U (normal, with coverageFactor); input unit. */
  halfWidth?: number
  /** Coverage factor k of a stated expanded uncertainty (normal distribution with halfWidth = U). */
  coverageFactor?: number
  /** Full resolution step δ (distribution 'resolution'), input unit; u = δ/√12. */
  resolution?: number
  /** Sensitivity coefficient cᵢ = ∂y/∂xᵢ, output unit per input unit. */
  sensitivity: number
  /** Degrees of freedom νᵢ (> 0, may be non-integer); undefined, null or Infinity = infinite. */
  dof?: number | null
}

/** Per-component result. */
export interface BudgetContribution {
  name: string
  /** u(xᵢ), input unit. */
  standardUncertainty: number
  /** cᵢ, output unit per input unit. */
  sensitivity: number
  /** |cᵢ|·u(xᵢ), output unit. */
  contribution: number
  /**
   * Share of u_c², percent: 100·cᵢu(xᵢ)·Σⱼ r(i,j)cⱼu(xⱼ)/u_c² (= 100·(cᵢu(xᵢ))²/u_c² without correlations);
   * 0 when u_c = 0. Shares add to 100; with correlations one may be negative.
   */
  percent: number
  /** νᵢ, or null for infinite. */
  dof: number | null
}

/** Result of {@link evaluateBudget} (JSON-safe: no ∞ or NaN). */
export interface BudgetResult {
  /** u_c(y), output unit. */
  combinedStandardUncertainty: number
  /** ν_eff (Welch–Satterthwaite), or null when infinite. */
  effectiveDegreesOfFreedom: number | null
  /** ν actually used for k (after truncation), or null when infinite. */
  degreesOfFreedomUsed: number | null
  /** Coverage probability p, e.g. 0.9545. */
  coverageProbability: number
  /** Coverage factor k. */
  coverageFactor: number
  /** U = k·u_c, output unit. */
  expandedUncertainty: number
  contributions: BudgetContribution[]
  /** Present when `options.correlations` has at least one pair: what the correlations did. */
  correlation?: BudgetCorrelationSummary
}

/** A correlation coefficient between two budget lines (the API's `correlations[n]`). */
export interface BudgetCorrelation {
  /** Indices [i, j] of the two components in `components` (0-based, i ≠ j). */
  between: readonly [number, number]
  /** Correlation coefficient r(xᵢ, xⱼ), −1 ≤ r ≤ 1 (GUM 5.2.2). */
  coefficient: number
}

/** What the correlations did to a budget (JSON-safe). */
export interface BudgetCorrelationSummary {
  /** Σ (cᵢu(xᵢ))², output unit². */
  uncorrelatedVariance: number
  /** 2 Σ_{i<j} cᵢcⱼu(xᵢ)u(xⱼ)r(xᵢ,xⱼ), output unit². */
  covarianceTerm: number
  /** True when u_c² came out below zero by rounding and was set to 0. */
  clampedAtZero: boolean
  /** Lines joined by non-zero r, with the ν and variance used for each group in Welch–Satterthwaite. */
  groups: { components: number[], dof: number | null, variance: number }[]
  /** Plain remarks (how ν_eff treated the groups, clamping). */
  notes: string[]
}

/** Options for {@link evaluateBudget}. */
export interface BudgetOptions {
  /** Coverage probability p in (0, 1) (default 0.9545, the GUM's "k = 2" level). */
  coverageProbability?: number
  /** How to treat a non-integer ν_eff (default 'truncate', GUM G.4.1). */
  dofRounding?: 'truncate' | 'fractional'
  /** Correlated pairs of components (GUM 5.2.2); omitted or empty: all independent. */
  correlations?: readonly BudgetCorrelation[]
}

/** ν used in place of ∞ for the t quantile (see the module notes). */
const INFINITE_DOF_PROXY = 1e15

/**
 * Coverage factor k = t_{(1+p)/2}(ν), the two-sided Student-t quantile (GUM G.3.4, Table G.2),
 * via `@stdlib/stats-base-dists-t-quantile`.
 * @param dof - degrees of freedom ν (> 0, may be non-integer); null, undefined or Infinity for infinite
 * @param coverageProbability - p in (0, 1) (default 0.9545)
 * @param dofRounding - 'truncate' (default; GUM G.4.1) or 'fractional'
 * @returns k, dimensionless
 * @throws EngineInputError (`dof`, `coverageProbability`)
 * @example coverageFactor(10) ≈ 2.28; coverageFactor(null) ≈ 2.000; coverageFactor(16, 0.99) ≈ 2.92
 */
export function coverageFactor(
  dof?: number | null,
  coverageProbability = 0.9545,
  dofRounding: 'truncate' | 'fractional' = 'truncate',
): number {
  checkProbability(coverageProbability, 'coverageProbability')
  const nu = effectiveDofForK(dof, dofRounding)
  return tQuantile((1 + coverageProbability) / 2, nu ?? INFINITE_DOF_PROXY)
}

function effectiveDofForK(dof: number | null | undefined, rounding: 'truncate' | 'fractional'): number | null {
  if (dof === undefined || dof === null || dof === Number.POSITIVE_INFINITY) return null
  if (typeof dof !== 'number' || !Number.isFinite(dof) || dof <= 0) {
    throw new EngineInputError('dof', `must be a number above 0 (or null for infinite), got ${String(dof)}`)
  }
  if (dof >= INFINITE_DOF_PROXY) return null
  if (rounding === 'truncate' && dof >= 1) return Math.floor(dof)
  return dof
}

function checkProbability(p: unknown, field: string): asserts p is number {
  if (typeof p !== 'number' || !Number.isFinite(p) || p <= 0 || p >= 1) {
    throw new EngineInputError(field, `must be a probability strictly between 0 and 1, got ${String(p)}`)
  }
}

/**
 * Standard uncertainty of one budget component (see the module notes for each distribution).
 * @param component - the component
 * @param index - its position, used in error field names `components[index].…`
 * @returns u(xᵢ), input unit
 * @throws EngineInputError naming `components[i].standardUncertainty`, `.distribution`, `.halfWidth`,
 *   `.coverageFactor` or `.resolution`
 * @example standardUncertaintyOf({ name: 'plate', distribution: 'rectangular', halfWidth: 0.2, sensitivity: 1 }) ≈ 0.1155
 */
export function standardUncertaintyOf(component: BudgetComponent, index = 0): number {
  const f = `components[${index}]`
  const { standardUncertainty: u, distribution: d, halfWidth: a, coverageFactor: k, resolution: r } = component
  if (u !== undefined) {
    if (d !== undefined && d !== 'normal') {
      throw new EngineInputError(`${f}.distribution`, `give either standardUncertainty or a ${d} distribution with its width, not both`)
    }
    if (a !== undefined || r !== undefined) {
      throw new EngineInputError(`${f}.standardUncertainty`, 'give either standardUncertainty or halfWidth/resolution, not both')
    }
    if (typeof u !== 'number' || !Number.isFinite(u) || u < 0) {
      throw new EngineInputError(`${f}.standardUncertainty`, `must be a finite number ≥ 0, got ${String(u)}`)
    }
    return u
  }
  if (d === undefined) {
    throw new EngineInputError(`${f}.standardUncertainty`, 'give standardUncertainty, or a distribution with halfWidth (or resolution)')
  }
  if (d === 'resolution') {
    if (r === undefined) {
      throw new EngineInputError(
        `${f}.resolution`,
        "give the full resolution step δ in 'resolution' (u = δ/√12); halfWidth is not used for 'resolution'",
      )
    }
    if (typeof r !== 'number' || !Number.isFinite(r) || r < 0) throw new EngineInputError(`${f}.resolution`, `must be a finite number ≥ 0, got ${String(r)}`)
    return r / Math.sqrt(12)
  }
  if (!DISTRIBUTIONS.includes(d)) {
    throw new EngineInputError(`${f}.distribution`, `unknown distribution '${String(d)}'; use ${DISTRIBUTIONS.join(', ')}`)
  }
  if (a === undefined || typeof a !== 'number' || !Number.isFinite(a) || a < 0) {
    throw new EngineInputError(`${f}.halfWidth`, `must be a finite number ≥ 0 for a ${d} distribution, got ${String(a)}`)
  }
  switch (d) {
    case 'normal':
      if (k === undefined || typeof k !== 'number' || !Number.isFinite(k) || k <= 0) {
        throw new EngineInputError(`${f}.coverageFactor`, `a normal distribution given by halfWidth (an expanded uncertainty) needs its coverage factor k > 0, got ${String(k)}`)
      }
      return a / k
    case 'rectangular':
      return a / Math.sqrt(3)
    case 'triangular':
      return a / Math.sqrt(6)
    case 'u-shaped':
      return a / Math.SQRT2
  }
  throw new EngineInputError(`${f}.distribution`, `unknown distribution '${String(d)}'`)
}

/**
 * Validates correlation pairs against a list of n components.
 * @param correlations - pairs `{ between: [i, j], coefficient: r }`
 * @param n - number of components
 * @returns the pairs with their indices ordered (i < j)
 * @throws EngineInputError (`correlations`, `correlations[m].between`, `correlations[m].coefficient`)
 */
export function validateCorrelations(correlations: unknown, n: number): { i: number, j: number, r: number }[] {
  if (correlations === undefined || correlations === null) return []
  if (!Array.isArray(correlations)) throw new EngineInputError('correlations', 'must be a list of { between: [i, j], coefficient }')
  const seen = new Set<string>()
  return correlations.map((c: unknown, m) => {
    const f = `correlations[${m}]`
    if (typeof c !== 'object' || c === null) throw new EngineInputError(f, 'must be an object { between: [i, j], coefficient }')
    const { between, coefficient } = c as { between?: unknown, coefficient?: unknown }
    if (!Array.isArray(between) || between.length !== 2) throw new EngineInputError(`${f}.between`, 'must be a pair of component indices [i, j]')
    const [a, b] = between as unknown[]
    for (const x of [a, b]) {
      if (typeof x !== 'number' || !Number.isInteger(x) || x < 0 || x >= n) {
        throw new EngineInputError(`${f}.between`, `must hold component indices from 0 to ${n - 1}, got ${String(x)}`)
      }
    }
    if (a === b) throw new EngineInputError(`${f}.between`, `must name two different components, got [${String(a)}, ${String(b)}]`)
    const i = Math.min(a as number, b as number)
    const j = Math.max(a as number, b as number)
    const key = `${i},${j}`
    if (seen.has(key)) throw new EngineInputError(`${f}.between`, `the pair [${i}, ${j}] is given more than once`)
    seen.add(key)
    if (typeof coefficient !== 'number' || !Number.isFinite(coefficient) || coefficient < -1 || coefficient > 1) {
      throw new EngineInputError(`${f}.coefficient`, `must be a correlation coefficient from −1 to 1, got ${String(coefficient)}`)
    }
    return { i, j, r: coefficient }
  })
}

/**
 * Throws unless the correlation matrix of the components named in `pairs` (unit diagonal, the given
 * coefficients, zero elsewhere) is positive semi-definite, by a Cholesky factorisation that accepts
 * zero pivots within 1e-10 (r = ±1 is allowed).
 * @param pairs - validated pairs
 * @param field - API field name for the error (default `correlations`)
 * @throws EngineInputError naming `field` when the coefficients are not mutually consistent
 */
export function requirePositiveSemidefinite(pairs: readonly { i: number, j: number, r: number }[], field = 'correlations'): void {
  const idx = [...new Set(pairs.flatMap(p => [p.i, p.j]))].sort((a, b) => a - b)
  const m = idx.length
  if (m < 3) return // a 2×2 matrix with |r| ≤ 1 always is
  const pos = new Map(idx.map((v, k) => [v, k]))
  const a: number[][] = Array.from({ length: m }, (_, k) => Array.from({ length: m }, (_, l) => (k === l ? 1 : 0)))
  for (const p of pairs) {
    a[pos.get(p.i)!]![pos.get(p.j)!] = p.r
    a[pos.get(p.j)!]![pos.get(p.i)!] = p.r
  }
  if (!choleskySemidefinite(a)) {
    throw new EngineInputError(field, 'the correlation coefficients contradict each other (their correlation matrix is not positive semi-definite)')
  }
}

/**
 * @internal In-place lower Cholesky factor of a symmetric matrix, accepting zero pivots (tolerance 1e-10);
 * returns false when the matrix is not positive semi-definite. On success a[k][l] (l ≤ k) holds L.
 */
export function choleskySemidefinite(a: number[][]): boolean {
  const m = a.length
  const tol = 1e-10
  for (let k = 0; k < m; k++) {
    let d = a[k]![k]!
    for (let l = 0; l < k; l++) d -= a[k]![l]! * a[k]![l]!
    if (d < -tol) return false
    const piv = d > tol ? Math.sqrt(d) : 0
    a[k]![k] = piv
    for (let r = k + 1; r < m; r++) {
      let v = a[r]![k]!
      for (let l = 0; l < k; l++) v -= a[r]![l]! * a[k]![l]!
      if (piv === 0) {
        if (Math.abs(v) > 1e-8) return false
        a[r]![k] = 0
      } else a[r]![k] = v / piv
    }
    for (let l = k + 1; l < m; l++) a[k]![l] = 0
  }
  return true
}

/**
 * Evaluates an uncertainty budget: u_c, ν_eff, k, U and the contribution of each component
 * (GUM 5.1.2, G.4.1, G.6.4; see the module notes).
 * @param components - at least one component; output unit = unit of cᵢ·u(xᵢ)
 * @param options - coverageProbability (default 0.9545), dofRounding (default 'truncate'), correlations
 *   (pairs of component indices with r; GUM 5.2.2)
 * @returns JSON-safe result; effectiveDegreesOfFreedom is null when infinite; `correlation` when pairs were given
 * @throws EngineInputError (`components`, `components[i].…`, `coverageProbability`, `dofRounding`,
 *   `correlations`, `correlations[n].between`, `correlations[n].coefficient`)
 * @example GUM H.1 end gauge (contribution form): u_c ≈ 32 nm, ν_eff ≈ 16.7 → 16, k(99 %) = 2.92, U ≈ 93 nm
 */
export function evaluateBudget(components: readonly BudgetComponent[], options: BudgetOptions = {}): BudgetResult {
  if (!Array.isArray(components) || components.length === 0) {
    throw new EngineInputError('components', 'needs at least one component')
  }
  const p = options.coverageProbability ?? 0.9545
  checkProbability(p, 'coverageProbability')
  const rounding = options.dofRounding ?? 'truncate'
  if (rounding !== 'truncate' && rounding !== 'fractional') {
    throw new EngineInputError('dofRounding', `must be 'truncate' or 'fractional', got ${String(rounding)}`)
  }
  const n = components.length
  const u = new Float64Array(n)
  const cu = new Float64Array(n)
  const nu = new Float64Array(n)
  let variance = 0
  for (let i = 0; i < n; i++) {
    const comp = components[i]!
    if (typeof comp !== 'object' || comp === null) throw new EngineInputError(`components[${i}]`, 'must be an object')
    if (typeof comp.name !== 'string' || comp.name.trim() === '') {
      throw new EngineInputError(`components[${i}].name`, 'must be a non-empty string')
    }
    u[i] = standardUncertaintyOf(comp, i)
    const c = comp.sensitivity
    if (typeof c !== 'number' || !Number.isFinite(c)) {
      throw new EngineInputError(`components[${i}].sensitivity`, `must be a finite number, got ${String(c)}`)
    }
    const dof = comp.dof
    if (dof === undefined || dof === null || dof === Number.POSITIVE_INFINITY) nu[i] = Number.POSITIVE_INFINITY
    else if (typeof dof !== 'number' || !Number.isFinite(dof) || dof <= 0) {
      throw new EngineInputError(`components[${i}].dof`, `must be a number above 0, or null/omitted for infinite, got ${String(dof)}`)
    } else nu[i] = dof
    cu[i] = Math.abs(c) * u[i]!
    variance += cu[i]! * cu[i]!
  }
  const pairs = validateCorrelations(options.correlations, n).filter(q => q.r !== 0)
  const given = Array.isArray(options.correlations) && options.correlations.length > 0
  let correlation: BudgetCorrelationSummary | undefined
  // signed cᵢu(xᵢ) and, per line, Σⱼ≠ᵢ r(i,j)cⱼu(xⱼ) (for the shares)
  const su = new Float64Array(n)
  const cross = new Float64Array(n)
  let groupOf: Int32Array | null = null
  if (pairs.length) {
    requirePositiveSemidefinite(pairs)
    for (let i = 0; i < n; i++) su[i] = components[i]!.sensitivity * u[i]!
    const uncorrelated = variance
    let covariance = 0
    for (const { i, j, r } of pairs) {
      covariance += 2 * r * su[i]! * su[j]!
      cross[i]! += r * su[j]!
      cross[j]! += r * su[i]!
    }
    variance = uncorrelated + covariance
    const notes: string[] = []
    let clamped = false
    if (!(variance > 0) && uncorrelated > 0) {
      if (variance < -1e-9 * uncorrelated) {
        // cannot happen with a positive semi-definite matrix; kept as a guard
        throw new EngineInputError('correlations', `they make u_c² negative (${variance.toPrecision(3)})`)
      }
      clamped = true
      variance = 0
      notes.push('The correlated terms cancel: u_c² came out at or below zero only by rounding and was set to 0.')
    }
    // groups: connected sets of lines joined by non-zero r (union–find)
    const parent = Int32Array.from({ length: n }, (_, i) => i)
    const find = (x: number): number => {
      while (parent[x] !== x) x = parent[x] = parent[parent[x]!]!
      return x
    }
    for (const { i, j } of pairs) parent[find(i)] = find(j)
    groupOf = new Int32Array(n)
    const members = new Map<number, number[]>()
    for (let i = 0; i < n; i++) {
      const g = find(i)
      groupOf[i] = g
      if (!members.has(g)) members.set(g, [])
      members.get(g)!.push(i)
    }
    const groups: BudgetCorrelationSummary['groups'] = []
    for (const list of members.values()) {
      if (list.length < 2) continue
      let v = 0
      let nuMin = Number.POSITIVE_INFINITY
      for (const i of list) {
        v += su[i]! * (su[i]! + cross[i]!)
        nuMin = Math.min(nuMin, nu[i]!)
      }
      groups.push({ components: list, dof: Number.isFinite(nuMin) ? nuMin : null, variance: Math.max(0, v) })
      if (Number.isFinite(nuMin)) {
        const mixed = new Set(list.map(i => nu[i]!)).size > 1
        notes.push(
          `Welch–Satterthwaite: the correlated lines ${list.join(', ')} count as one component with ν = ${nuMin}`
          + (mixed ? ' (their smallest ν: their degrees of freedom differ, a conservative choice).' : ' (Willink 2007, §4.1.1).'),
        )
      }
    }
    correlation = { uncorrelatedVariance: uncorrelated, covarianceTerm: covariance, clampedAtZero: clamped, groups, notes }
  } else if (given) {
    correlation = { uncorrelatedVariance: variance, covarianceTerm: 0, clampedAtZero: false, groups: [], notes: [] }
  }
  const uc = Math.sqrt(variance)
  // Welch–Satterthwaite with contributions normalised by u_c (no under/overflow of the 4th powers);
  // correlated groups enter as one component each (see the module notes)
  let denom = 0
  if (uc > 0) {
    const done = new Set<number>()
    for (let i = 0; i < n; i++) {
      if (groupOf !== null && correlation!.groups.some(g => g.components.includes(i))) {
        const g = groupOf[i]!
        if (done.has(g)) continue
        done.add(g)
        const grp = correlation!.groups.find(x => x.components.includes(i))!
        if (grp.dof !== null && grp.variance > 0) {
          const r = grp.variance / variance
          denom += (r * r) / grp.dof
        }
        continue
      }
      if (Number.isFinite(nu[i]!) && cu[i]! > 0) {
        const r = cu[i]! / uc
        denom += (r * r * r * r) / nu[i]!
      }
    }
  }
  const nuEff = denom > 0 ? 1 / denom : Number.POSITIVE_INFINITY
  const nuEffJson = Number.isFinite(nuEff) && nuEff < INFINITE_DOF_PROXY ? nuEff : null
  const nuUsed = effectiveDofForK(nuEffJson, rounding)
  const k = tQuantile((1 + p) / 2, nuUsed ?? INFINITE_DOF_PROXY)
  const contributions: BudgetContribution[] = []
  for (let i = 0; i < n; i++) {
    const comp = components[i]!
    const share = cross[i] === 0 ? cu[i]! * cu[i]! : su[i]! * (su[i]! + cross[i]!)
    contributions.push({
      name: comp.name,
      standardUncertainty: u[i]!,
      sensitivity: comp.sensitivity,
      contribution: cu[i]!,
      percent: variance > 0 ? (100 * share) / variance : 0,
      dof: Number.isFinite(nu[i]!) ? nu[i]! : null,
    })
  }
  return {
    combinedStandardUncertainty: uc,
    effectiveDegreesOfFreedom: nuEffJson,
    degreesOfFreedomUsed: nuUsed,
    coverageProbability: p,
    coverageFactor: k,
    expandedUncertainty: k * uc,
    contributions,
    ...(correlation ? { correlation } : {}),
  }
}

// ---------------------------------------------------------------------------------------------
// Rounding of a stated result (GUM 7.2.6)

/** Result of {@link roundResult}. */
export interface RoundedResult {
  /** Value rounded to the decimal place of the last significant digit of the uncertainty. */
  value: number
  /** Uncertainty rounded to `significantDigits` significant digits. */
  uncertainty: number
  /** Value as text with exactly the decimals of the uncertainty, e.g. '373.15'. */
  valueText: string
  /** Uncertainty as text, e.g. '0.12'. */
  uncertaintyText: string
  /** Number of decimals used (0 when the last digit is at or left of the units place). */
  decimals: number
  /** Decimal exponent ℓ of the last kept digit (uncertainty = n × 10^ℓ). */
  exponent: number
}

function decimalExponent(x: number): number {
  // exponent of the leading digit, immune to log10 rounding at powers of ten
  const s = x.toExponential(14)
  return Number(s.slice(s.indexOf('e') + 1))
}

function scaleDown(x: number, e: number): number {
  // x / 10^e using exact powers of ten, then strip binary noise (e.g. 32.4999999999 → 32.5)
  const v = e < 0 ? x * 10 ** -e : x / 10 ** e
  return Number(v.toPrecision(12))
}

function scaleUp(n: number, e: number): number {
  return e < 0 ? n / 10 ** -e : n * 10 ** e
}

/**
 * Rounds a stated uncertainty to two significant digits and the value to the same decimal place
 * (GUM 7.2.6). `mode: 'nearest'` (default, half away from zero) follows the GUM's "common sense"
 * note; `mode: 'up'` rounds the uncertainty up (never states less than computed), which GUM 7.2.6
 * allows ("10.47 mΩ might be rounded up to 11 mΩ"). The value is always rounded to nearest.
 * @param value - the measured value, any unit
 * @param uncertainty - its (expanded or standard) uncertainty, same unit, > 0
 * @param options - significantDigits (default 2, 1–6), mode ('nearest' | 'up')
 * @returns rounded numbers and their text (the text never carries binary noise)
 * @throws EngineInputError (`value`, `uncertainty`, `significantDigits`, `mode`)
 * @example roundResult(100.02147, 0.03513) → { valueText: '100.021', uncertaintyText: '0.035' }
 */
export function roundResult(
  value: number,
  uncertainty: number,
  options: { significantDigits?: number; mode?: 'nearest' | 'up' } = {},
): RoundedResult {
  if (typeof value !== 'number' || !Number.isFinite(value)) throw new EngineInputError('value', `must be a finite number, got ${String(value)}`)
  if (typeof uncertainty !== 'number' || !Number.isFinite(uncertainty) || uncertainty <= 0) {
    throw new EngineInputError('uncertainty', `must be a finite number above 0, got ${String(uncertainty)}`)
  }
  const digits = options.significantDigits ?? 2
  if (!Number.isInteger(digits) || digits < 1 || digits > 6) throw new EngineInputError('significantDigits', 'must be an integer from 1 to 6')
  const mode = options.mode ?? 'nearest'
  if (mode !== 'nearest' && mode !== 'up') throw new EngineInputError('mode', `must be 'nearest' or 'up', got ${String(mode)}`)

  let e = decimalExponent(uncertainty) - (digits - 1)
  let n = roundScaled(scaleDown(uncertainty, e), mode)
  if (n >= 10 ** digits) {
    // e.g. 0.0996 → 0.100 at two digits: keep two digits, one place further left
    e += 1
    n = roundScaled(scaleDown(uncertainty, e), mode)
  }
  const decimals = Math.max(0, -e)
  const u = scaleUp(n, e)
  const m = roundHalfAwayFromZero(scaleDown(value, e))
  const v = m === 0 ? 0 : scaleUp(m, e)
  return {
    value: v,
    uncertainty: u,
    valueText: v.toFixed(decimals),
    uncertaintyText: u.toFixed(decimals),
    decimals,
    exponent: e,
  }
}

function roundScaled(x: number, mode: 'nearest' | 'up'): number {
  return mode === 'up' ? Math.ceil(x) : Math.round(x)
}

function roundHalfAwayFromZero(x: number): number {
  return x < 0 ? -Math.round(-x) : Math.round(x)
}
