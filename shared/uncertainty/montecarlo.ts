/**
 * Propagation of distributions by the Monte Carlo method (JCGM 101:2008, Supplement 1 to the GUM).
 *
 * Random numbers: xoshiro128** 1.1 (D. Blackman and S. Vigna, "Scrambled linear pseudorandom number
 * generators", ACM Trans. Math. Softw. 47(4), 2021; period 2¹²⁸ − 1), 32-bit outputs combined two at
 * a time into 53-bit uniforms on the open interval (0, 1). The generator state is seeded from
 * (seed, block) through the SplitMix32 mixing function (a Weyl sequence with increment 0x9E3779B9
 * followed by the MurmurHash3 32-bit finaliser).
 *
 * Reproducible chunks: trials are grouped in blocks of {@link MC_BLOCK_SIZE}; block b draws from its
 * own generator seeded by (seed, b). Trial i therefore sees the same random numbers whether the run
 * is done at once or in chunks [start, end) (on one thread or on several workers): concatenating the
 * chunk outputs in order gives exactly the output of one run. A chunk that starts inside a block
 * re-draws (without evaluating the model) the earlier trials of that block.
 *
 * Samplers (JCGM 101 6.4): normal by Box–Muller (both variates used); rectangular a·(2r − 1);
 * triangular by the inverse distribution function (6.4.5); U-shaped (arcsine) a·sin(2πr) (6.4.6);
 * scaled and shifted Student t (6.4.9) by Bailey's polar method (R. W. Bailey, Math. Comp. 62, 779,
 * 1994), valid for any real ν > 0; constant.
 *
 * Correlated inputs (JCGM 101 6.4.8 and GUM 5.2.2's correlation coefficient r): pairs of inputs with
 * r are sampled jointly. The inputs joined by non-zero r form groups; for each group m standard normals
 * are drawn and multiplied by the lower Cholesky factor of a correlation matrix R* (the
 * multivariate Gaussian of JCGM 101 6.4.8 sampled through a Cholesky factor, as recalled), and each member is then put through the inverse distribution
 * function of its own distribution at Φ(w) — a Gaussian copula. For two normal inputs R* = R and the
 * pair is exactly the bivariate normal of 6.4.8. A non-normal marginal changes the correlation (for two
 * rectangular marginals the Pearson correlation of the pair is (6/π)·arcsin(r* / 2); Kruskal 1958, from
 * memory), so each r* is chosen such that the Pearson correlation of the sampled pair equals the stated
 * r (the "NORTA" construction; M. C. Cario and B. L. Nelson, Northwestern Univ. technical report, 1997,
 * from memory): the correlation of g₁(Z₁), g₂(Z₂) is Σₖ aₖbₖ·r*ᵏ, aₖ, bₖ the coefficients of the
 * standardised marginals in normalised Hermite polynomials (Mehler's formula), computed here by
 * quadrature and solved for r* by bisection. A stated r beyond what the two marginals can reach (e.g.
 * r = 1 between a normal and a rectangular input: at most √(3/π) = 0.977) is refused. Inverse
 * functions: rectangular μ + a(2Φ − 1), triangular JCGM 101 6.4.5, U-shaped μ − a·cos(πΦ), t by its
 * quantile (stdlib). A correlated t input needs ν > 4 (its Pearson correlation must be well determined).
 * Each group draws the same number of normals in every trial, so chunks stay reproducible.
 *
 * Results (JCGM 101 7.6, 7.7): mean, standard deviation with M − 1, probabilistically symmetric
 * coverage interval from the sorted values, and the shortest coverage interval. Validation of a GUM
 * result (JCGM 101 8.2): {@link validateGumResult}.
 *
 * Adaptive Monte Carlo (JCGM 101 7.9, as recalled): batches of M = max(J, 10⁴) trials, J the smallest
 * integer ≥ 100/(1 − p); after each batch h ≥ 2 the standard deviations of the batch means s_y, of the
 * batch standard uncertainties s_u, and of the batch interval ends s_low, s_high, each as
 * s² = Σ (v⁽ʳ⁾ − v̄)²/(h(h − 1)), are compared with the numerical tolerance δ of u(y) (from all h·M
 * values, n_dig significant digits, 7.9.2); the run stops when 2s ≤ δ for all four. The batches are
 * consecutive trial ranges of one seed, so the values equal those of a fixed run of h·M trials.
 */

import tQuantile from '@stdlib/stats-base-dists-t-quantile'
import { EngineInputError } from '../radiometry/errors'
import { choleskySemidefinite, validateCorrelations } from './budget'
import { normalCdf, normalSf } from './normal'

/** Trials per independently seeded block. */
export const MC_BLOCK_SIZE = 1024

/** An input quantity for Monte Carlo propagation (the API's `inputs[i]`). */
export type MonteCarloInput =
  | {
      name: string
      distribution: 'normal'
      /** Expectation, input unit. */
      value: number
      /** Standard deviation, input unit (or give halfWidth = expanded uncertainty with coverageFactor). */
      standardUncertainty?: number
      halfWidth?: number
      coverageFactor?: number
    }
  | {
      name: string
      distribution: 'rectangular' | 'triangular' | 'u-shaped'
      /** Centre, input unit. */
      value: number
      /** Half-width a, input unit. */
      halfWidth: number
    }
  | {
      name: string
      distribution: 'resolution'
      value: number
      /** Full resolution step δ: rectangular over value ± δ/2. */
      resolution: number
    }
  | {
      name: string
      distribution: 'student-t'
      value: number
      /** Scale s (e.g. s/√n of a Type A mean), input unit. */
      scale: number
      /** Degrees of freedom ν > 0 (e.g. n − 1). */
      dof: number
    }
  | { name: string; distribution: 'constant'; value: number }

/** Distribution names accepted by Monte Carlo inputs. */
export const MC_DISTRIBUTIONS = Object.freeze(['normal', 'rectangular', 'triangular', 'u-shaped', 'resolution', 'student-t', 'constant'] as const)

const K_CONST = 0
const K_NORMAL = 1
const K_RECT = 2
const K_TRI = 3
const K_U = 4
const K_T = 5

/** A correlation between two Monte Carlo inputs (the API's `correlations[n]`). */
export interface MonteCarloCorrelation {
  /** Indices [i, j] of the two inputs (0-based, i ≠ j). */
  between: readonly [number, number]
  /** Pearson correlation coefficient r of the two inputs, −1 ≤ r ≤ 1. */
  coefficient: number
}

/** A correlated group compiled for sampling. */
export interface CompiledGroup {
  /** Input indices of the members, increasing. */
  members: Int32Array
  /** Lower Cholesky factor of the copula correlation matrix R*, row-major m×m. */
  cholesky: Float64Array
  /** @internal scratch for the normals */
  z: Float64Array
}

/** The copula of correlated inputs, with the normal-scale coefficient used for each stated pair. */
export interface CompiledCopula {
  groups: CompiledGroup[]
  /** Group index of each input, −1 for an independent one. */
  groupOf: Int32Array
  /** Each stated pair (i < j): r stated and r* used between the underlying normals. */
  pairs: { i: number, j: number, coefficient: number, normalCoefficient: number }[]
}

/** Inputs validated and compiled to flat arrays for the sampling loop ({@link compileInputs}). */
export interface CompiledInputs {
  kind: Int32Array
  centre: Float64Array
  width: Float64Array
  dof: Float64Array
  /** Present when inputs are correlated. */
  copula?: CompiledCopula
}

function num(v: unknown, field: string, min: number, inclusive: boolean): number {
  if (typeof v !== 'number' || !Number.isFinite(v) || (inclusive ? v < min : v <= min)) {
    throw new EngineInputError(field, `must be a finite number ${inclusive ? '≥' : '>'} ${min}, got ${String(v)}`)
  }
  return v
}

/**
 * Validates Monte Carlo inputs and compiles them for sampling (do it once, then pass the result to
 * {@link runMonteCarloChunk} for every chunk).
 * @param inputs - input distributions (values and widths in each input's unit)
 * @param correlations - correlated pairs of inputs (optional; see the module notes)
 * @returns compiled inputs
 * @throws EngineInputError (`inputs`, `inputs[i].value`, `.distribution`, `.standardUncertainty`,
 *   `.halfWidth`, `.coverageFactor`, `.resolution`, `.scale`, `.dof`; `correlations`,
 *   `correlations[n].between` (also for a constant input or a t input with ν ≤ 4), `correlations[n].coefficient`
 *   (also when the two distributions cannot reach r))
 * @example compileInputs([{ name: 'T_s', distribution: 'normal', value: 373.15, standardUncertainty: 0.025 }])
 */
export function compileInputs(inputs: readonly MonteCarloInput[], correlations?: readonly MonteCarloCorrelation[]): CompiledInputs {
  if (!Array.isArray(inputs) || inputs.length === 0) throw new EngineInputError('inputs', 'needs at least one input')
  const n = inputs.length
  const out: CompiledInputs = { kind: new Int32Array(n), centre: new Float64Array(n), width: new Float64Array(n), dof: new Float64Array(n) }
  for (let i = 0; i < n; i++) {
    const f = `inputs[${i}]`
    const inp = inputs[i]!
    if (typeof inp !== 'object' || inp === null) throw new EngineInputError(f, 'must be an object')
    const value = inp.value
    if (typeof value !== 'number' || !Number.isFinite(value)) throw new EngineInputError(`${f}.value`, `must be a finite number, got ${String(value)}`)
    out.centre[i] = value
    switch (inp.distribution) {
      case 'constant':
        out.kind[i] = K_CONST
        break
      case 'normal': {
        out.kind[i] = K_NORMAL
        if (inp.standardUncertainty !== undefined) out.width[i] = num(inp.standardUncertainty, `${f}.standardUncertainty`, 0, true)
        else {
          const a = num(inp.halfWidth, `${f}.halfWidth`, 0, true)
          const k = num(inp.coverageFactor, `${f}.coverageFactor`, 0, false)
          out.width[i] = a / k
        }
        break
      }
      case 'rectangular':
        out.kind[i] = K_RECT
        out.width[i] = num(inp.halfWidth, `${f}.halfWidth`, 0, true)
        break
      case 'triangular':
        out.kind[i] = K_TRI
        out.width[i] = num(inp.halfWidth, `${f}.halfWidth`, 0, true)
        break
      case 'u-shaped':
        out.kind[i] = K_U
        out.width[i] = num(inp.halfWidth, `${f}.halfWidth`, 0, true)
        break
      case 'resolution':
        out.kind[i] = K_RECT
        out.width[i] = num(inp.resolution, `${f}.resolution`, 0, true) / 2
        break
      case 'student-t':
        out.kind[i] = K_T
        out.width[i] = num(inp.scale, `${f}.scale`, 0, true)
        out.dof[i] = num(inp.dof, `${f}.dof`, 0, false)
        break
      default:
        throw new EngineInputError(
          `${f}.distribution`,
          `unknown distribution '${String((inp as { distribution?: unknown }).distribution)}'; use ${MC_DISTRIBUTIONS.join(', ')}`,
        )
    }
  }
  const copula = compileCopula(out, correlations)
  if (copula) out.copula = copula
  return out
}

// ---------------------------------------------------------------------------------------------
// Gaussian copula for correlated inputs

/** Hermite terms kept in the correlation series. */
const HERMITE_TERMS = 40
/** Half-range and intervals of the quadrature over z (even number of intervals: z = 0 is a node). */
const QUAD_Z = 12
const QUAD_N = 9600

/** Inverse distribution function of a unit-scale marginal (centre 0, width 1) at Φ(w). */
function unitQuantile(kind: number, dof: number, w: number): number {
  switch (kind) {
    case K_NORMAL:
      return w
    case K_RECT:
      return w < 0 ? 2 * normalCdf(w) - 1 : 1 - 2 * normalSf(w)
    case K_TRI: {
      if (w < 0) return -1 + Math.sqrt(2 * normalCdf(w))
      return 1 - Math.sqrt(2 * normalSf(w))
    }
    case K_U:
      // arcsine: F(x) = ½ + arcsin(x)/π, so x = sin(π(F − ½)) = −cos(πF)
      return w < 0 ? -Math.cos(Math.PI * normalCdf(w)) : Math.cos(Math.PI * normalSf(w))
    case K_T:
      return w < 0 ? tQuantile(normalCdf(w), dof) : -tQuantile(normalSf(w), dof)
    default:
      return 0
  }
}

const hermiteCache = new Map<string, Float64Array>()

/**
 * Coefficients aₖ = E[g̃(Z)·hₖ(Z)], k = 0…K, of the standardised unit marginal g̃ = (g − E g)/sd(g),
 * g(z) the marginal's quantile at Φ(z), in normalised Hermite polynomials hₖ = Heₖ/√k!
 * (Simpson's rule on [−12, 12] with z = 0 a node). Σ aₖ² = 1.
 */
function hermiteCoefficients(kind: number, dof: number): Float64Array {
  const key = `${kind}:${dof}`
  const hit = hermiteCache.get(key)
  if (hit) return hit
  const a = new Float64Array(HERMITE_TERMS + 1)
  if (kind === K_NORMAL) {
    a[1] = 1
    hermiteCache.set(key, a)
    return a
  }
  const h = (2 * QUAD_Z) / QUAD_N
  const raw = new Float64Array(HERMITE_TERMS + 1)
  let m0 = 0
  let m2 = 0
  const hk = new Float64Array(HERMITE_TERMS + 1)
  for (let n = 0; n <= QUAD_N; n++) {
    const z = -QUAD_Z + n * h
    const wgt = (n === 0 || n === QUAD_N ? 1 : n % 2 === 1 ? 4 : 2) * (h / 3) * (Math.exp(-0.5 * z * z) / Math.sqrt(2 * Math.PI))
    const g = unitQuantile(kind, dof, z)
    m0 += wgt * g
    m2 += wgt * g * g
    hk[0] = 1
    hk[1] = z
    for (let k = 1; k < HERMITE_TERMS; k++) hk[k + 1] = (z * hk[k]! - Math.sqrt(k) * hk[k - 1]!) / Math.sqrt(k + 1)
    for (let k = 1; k <= HERMITE_TERMS; k++) raw[k]! += wgt * g * hk[k]!
  }
  const sd = Math.sqrt(m2 - m0 * m0)
  for (let k = 1; k <= HERMITE_TERMS; k++) a[k] = raw[k]! / sd
  hermiteCache.set(key, a)
  return a
}

/** Pearson correlation of g̃₁(Z₁), g̃₂(Z₂) when corr(Z₁, Z₂) = rho (Mehler: Σ aₖbₖρᵏ). */
function pearsonFromNormal(a: Float64Array, b: Float64Array, rho: number): number {
  let s = 0
  let p = 1
  for (let k = 1; k <= HERMITE_TERMS; k++) {
    p *= rho
    s += a[k]! * b[k]! * p
  }
  return s
}

/**
 * The correlation r* of the underlying normals that gives Pearson correlation r between inputs of the
 * two kinds (NORTA; see the module notes), or null when r is outside what the two marginals can reach.
 * @param kindA - compiled kind of the first input; dofA its ν (t only)
 * @param kindB - compiled kind of the second input; dofB its ν (t only)
 * @param r - stated correlation, −1 ≤ r ≤ 1
 * @returns r* in [−1, 1], or null
 */
function normalCoefficientFor(kindA: number, dofA: number, kindB: number, dofB: number, r: number): number | null {
  if (kindA === K_NORMAL && kindB === K_NORMAL) return r
  if (kindA === kindB && kindA !== K_T && Math.abs(r) === 1) return r // same shape: comonotone pair reaches ±1 exactly
  const a = hermiteCoefficients(kindA, dofA)
  const b = hermiteCoefficients(kindB, dofB)
  const lo = pearsonFromNormal(a, b, -1)
  const hi = pearsonFromNormal(a, b, 1)
  const tol = 1e-9
  if (r < lo - tol || r > hi + tol) return null
  if (r <= lo) return -1
  if (r >= hi) return 1
  let x0 = -1
  let x1 = 1
  for (let it = 0; it < 200 && x1 - x0 > 1e-15; it++) {
    const m = (x0 + x1) / 2
    if (pearsonFromNormal(a, b, m) < r) x0 = m
    else x1 = m
  }
  return (x0 + x1) / 2
}

const KIND_NAMES = ['constant', 'normal', 'rectangular', 'triangular', 'u-shaped', 'student-t']

function compileCopula(c: CompiledInputs, correlations: readonly MonteCarloCorrelation[] | undefined): CompiledCopula | undefined {
  const n = c.kind.length
  const all = validateCorrelations(correlations, n)
  const pairs: CompiledCopula['pairs'] = []
  all.forEach((p, m) => {
    if (p.r === 0) return
    for (const i of [p.i, p.j]) {
      if (c.kind[i] === K_CONST) throw new EngineInputError(`correlations[${m}].between`, `input ${i} is a constant and cannot be correlated`)
      if (c.kind[i] === K_T && !(c.dof[i]! > 4)) {
        throw new EngineInputError(`correlations[${m}].between`, `input ${i} is a scaled t with ν = ${c.dof[i]}: a correlated t input needs ν > 4`)
      }
    }
    const rs = normalCoefficientFor(c.kind[p.i]!, c.dof[p.i]!, c.kind[p.j]!, c.dof[p.j]!, p.r)
    if (rs === null) {
      const a = hermiteCoefficients(c.kind[p.i]!, c.dof[p.i]!)
      const b = hermiteCoefficients(c.kind[p.j]!, c.dof[p.j]!)
      throw new EngineInputError(
        `correlations[${m}].coefficient`,
        `a ${KIND_NAMES[c.kind[p.i]!]} and a ${KIND_NAMES[c.kind[p.j]!]} input can be correlated only between ${pearsonFromNormal(a, b, -1).toFixed(4)} and ${pearsonFromNormal(a, b, 1).toFixed(4)}, not ${p.r}`,
      )
    }
    pairs.push({ i: p.i, j: p.j, coefficient: p.r, normalCoefficient: rs })
  })
  if (!pairs.length) return undefined
  // groups: connected sets of correlated inputs
  const parent = Int32Array.from({ length: n }, (_, i) => i)
  const find = (x: number): number => {
    while (parent[x] !== x) x = parent[x] = parent[parent[x]!]!
    return x
  }
  for (const p of pairs) parent[find(p.i)] = find(p.j)
  const byRoot = new Map<number, number[]>()
  for (const p of pairs) {
    for (const i of [p.i, p.j]) {
      const r = find(i)
      if (!byRoot.has(r)) byRoot.set(r, [])
      const list = byRoot.get(r)!
      if (!list.includes(i)) list.push(i)
    }
  }
  const groupOf = new Int32Array(n).fill(-1)
  const groups: CompiledGroup[] = []
  for (const list of byRoot.values()) {
    list.sort((x, y) => x - y)
    const m = list.length
    const mat: number[][] = Array.from({ length: m }, (_, k) => Array.from({ length: m }, (_, l) => (k === l ? 1 : 0)))
    for (const p of pairs) {
      const k = list.indexOf(p.i)
      const l = list.indexOf(p.j)
      if (k >= 0 && l >= 0) {
        mat[k]![l] = p.normalCoefficient
        mat[l]![k] = p.normalCoefficient
      }
    }
    if (!choleskySemidefinite(mat)) {
      throw new EngineInputError('correlations', `the correlations among inputs ${list.join(', ')} contradict each other (the correlation matrix is not positive semi-definite)`)
    }
    const chol = new Float64Array(m * m)
    for (let k = 0; k < m; k++) for (let l = 0; l <= k; l++) chol[k * m + l] = mat[k]![l]!
    for (const i of list) groupOf[i] = groups.length
    groups.push({ members: Int32Array.from(list), cholesky: chol, z: new Float64Array(m) })
  }
  return { groups, groupOf, pairs }
}

// ---------------------------------------------------------------------------------------------
// Generator

function mix32(z: number): number {
  z = Math.imul(z ^ (z >>> 16), 0x85ebca6b)
  z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35)
  return (z ^ (z >>> 16)) >>> 0
}

/**
 * xoshiro128** 1.1 generator (Blackman & Vigna). Deterministic for a given (seed, stream).
 * @example const g = new Xoshiro128(42); g.nextUint32(); g.nextDouble() // in (0, 1)
 */
export class Xoshiro128 {
  private s0 = 0
  private s1 = 0
  private s2 = 0
  private s3 = 0

  /**
   * @param seed - any integer 0 … 2³² − 1 (other numbers are reduced modulo 2³²)
   * @param stream - stream (block) index, integer ≥ 0; different streams give unrelated sequences
   */
  constructor(seed: number, stream = 0) {
    this.reseed(seed, stream)
  }

  /**
   * A generator with the given raw state (for checking against the reference implementation).
   * @param s0 - state word 0 (uint32); s1, s2, s3 likewise; not all zero
   * @returns the generator
   * @example Xoshiro128.fromState(1, 2, 3, 4).nextUint32() === 11520
   */
  static fromState(s0: number, s1: number, s2: number, s3: number): Xoshiro128 {
    const g = new Xoshiro128(0)
    g.s0 = s0 >>> 0
    g.s1 = s1 >>> 0
    g.s2 = s2 >>> 0
    g.s3 = s3 >>> 0
    if ((g.s0 | g.s1 | g.s2 | g.s3) === 0) throw new EngineInputError('state', 'xoshiro128** state must not be all zero')
    return g
  }

  /** Resets the state for (seed, stream) without allocating. */
  reseed(seed: number, stream: number): void {
    // SplitMix32: Weyl sequence in 32 bits, MurmurHash3 finaliser; the stream is mixed into the start
    let z = (mix32(seed >>> 0) ^ mix32((Math.imul(stream >>> 0, 0x9e3779b9) + 0x632be5ab) >>> 0)) >>> 0
    z = (z + 0x9e3779b9) >>> 0
    this.s0 = mix32(z)
    z = (z + 0x9e3779b9) >>> 0
    this.s1 = mix32(z)
    z = (z + 0x9e3779b9) >>> 0
    this.s2 = mix32(z)
    z = (z + 0x9e3779b9) >>> 0
    this.s3 = mix32(z)
    if ((this.s0 | this.s1 | this.s2 | this.s3) === 0) this.s0 = 1
  }

  /** Next 32-bit output, integer in [0, 2³²). */
  nextUint32(): number {
    const s1 = this.s1
    const result = Math.imul(rotl(Math.imul(s1, 5), 7), 9) >>> 0
    const t = s1 << 9
    this.s2 ^= this.s0
    this.s3 ^= s1
    this.s1 ^= this.s2
    this.s0 ^= this.s3
    this.s2 ^= t
    this.s3 = rotl(this.s3, 11)
    return result
  }

  /** Next uniform double in the open interval (0, 1) with 53 random bits. */
  nextDouble(): number {
    const a = this.nextUint32() >>> 5 // 27 bits
    const b = this.nextUint32() >>> 6 // 26 bits
    return (a * 67108864 + b + 0.5) / 9007199254740992
  }
}

function rotl(x: number, k: number): number {
  return (x << k) | (x >>> (32 - k))
}

/** Sampler with Box–Muller state, one per chunk. */
class Sampler {
  readonly rng = new Xoshiro128(0)
  private spare = 0
  private hasSpare = false

  reset(seed: number, block: number): void {
    this.rng.reseed(seed, block)
    this.hasSpare = false
  }

  normal(): number {
    if (this.hasSpare) {
      this.hasSpare = false
      return this.spare
    }
    const r = Math.sqrt(-2 * Math.log(this.rng.nextDouble()))
    const th = 2 * Math.PI * this.rng.nextDouble()
    this.spare = r * Math.sin(th)
    this.hasSpare = true
    return r * Math.cos(th)
  }

  studentT(nu: number): number {
    // Bailey's polar method: exact for any ν > 0
    for (;;) {
      const u = 2 * this.rng.nextDouble() - 1
      const v = 2 * this.rng.nextDouble() - 1
      const w = u * u + v * v
      if (w > 0 && w < 1) return u * Math.sqrt((nu * (w ** (-2 / nu) - 1)) / w)
    }
  }

  fill(c: CompiledInputs, x: Float64Array): void {
    const n = x.length
    const cop = c.copula
    for (let i = 0; i < n; i++) {
      const mu = c.centre[i]!
      const a = c.width[i]!
      if (cop !== undefined && cop.groupOf[i]! >= 0) {
        const g = cop.groups[cop.groupOf[i]!]!
        if (g.members[0] !== i) continue // drawn with the group's first member
        this.fillGroup(c, g, x)
        continue
      }
      switch (c.kind[i]) {
        case K_NORMAL:
          x[i] = mu + a * this.normal()
          break
        case K_RECT:
          x[i] = mu + a * (2 * this.rng.nextDouble() - 1)
          break
        case K_TRI: {
          const r = this.rng.nextDouble()
          x[i] = r < 0.5 ? mu - a + a * Math.sqrt(2 * r) : mu + a - a * Math.sqrt(2 * (1 - r))
          break
        }
        case K_U:
          x[i] = mu + a * Math.sin(2 * Math.PI * this.rng.nextDouble())
          break
        case K_T:
          x[i] = mu + a * this.studentT(c.dof[i]!)
          break
        default:
          x[i] = mu
      }
    }
  }

  /** Correlated normals w = L·z, then each member's inverse distribution function at Φ(w). */
  fillGroup(c: CompiledInputs, g: CompiledGroup, x: Float64Array): void {
    const m = g.members.length
    const z = g.z
    for (let k = 0; k < m; k++) z[k] = this.normal()
    for (let k = m - 1; k >= 0; k--) {
      // row k of L·z uses z[0..k]; going down from the last row keeps z intact for the rows above
      let w = 0
      for (let l = 0; l <= k; l++) w += g.cholesky[k * m + l]! * z[l]!
      const i = g.members[k]!
      x[i] = c.centre[i]! + c.width[i]! * unitQuantile(c.kind[i]!, c.dof[i]!, w)
    }
  }
}

/** A measurement model y = f(x), x in the order of the inputs. */
export type MonteCarloModel = (x: Float64Array) => number

function checkSeed(seed: unknown): number {
  if (typeof seed !== 'number' || !Number.isInteger(seed) || seed < 0 || seed > 0xffffffff) {
    throw new EngineInputError('seed', `must be an integer from 0 to 4294967295, got ${String(seed)}`)
  }
  return seed
}

/**
 * Runs trials [start, end) of a Monte Carlo propagation and returns the model values in trial order.
 * Chunks with the same seed concatenate to exactly the values of one run over [0, M): this is the
 * unit of work for a worker thread.
 * @param model - y = f(x), x a Float64Array in input order (reused between trials: do not keep it)
 * @param inputs - input distributions
 * @param seed - integer 0 … 2³² − 1
 * @param start - first trial index (integer ≥ 0)
 * @param end - one past the last trial index (> start)
 * @param correlations - correlated pairs, when `inputs` are not compiled (compiled inputs carry their own)
 * @returns model values, length end − start, output unit
 * @throws EngineInputError (`inputs…`, `correlations…`, `seed`, `start`, `end`)
 * @example runMonteCarloChunk(x => x[0] + x[1], inputs, 1, 0, 1000).length === 1000
 */
export function runMonteCarloChunk(
  model: MonteCarloModel,
  inputs: readonly MonteCarloInput[] | CompiledInputs,
  seed: number,
  start: number,
  end: number,
  correlations?: readonly MonteCarloCorrelation[],
): Float64Array {
  const c = 'kind' in inputs && inputs.kind instanceof Int32Array ? (inputs as CompiledInputs) : compileInputs(inputs as readonly MonteCarloInput[], correlations)
  checkSeed(seed)
  if (!Number.isInteger(start) || start < 0) throw new EngineInputError('start', `must be an integer ≥ 0, got ${String(start)}`)
  if (!Number.isInteger(end) || end <= start) throw new EngineInputError('end', `must be an integer above start (${start}), got ${String(end)}`)
  const out = new Float64Array(end - start)
  const x = new Float64Array(c.kind.length)
  const sampler = new Sampler()
  let block = Math.floor(start / MC_BLOCK_SIZE)
  let i = block * MC_BLOCK_SIZE
  sampler.reset(seed, block)
  for (; i < start; i++) sampler.fill(c, x) // re-draw the skipped head of the first block
  for (; i < end; i++) {
    const b = Math.floor(i / MC_BLOCK_SIZE)
    if (b !== block) {
      block = b
      sampler.reset(seed, block)
    }
    sampler.fill(c, x)
    out[i - start] = model(x)
  }
  return out
}

/** Summary of Monte Carlo output (JCGM 101 7.6, 7.7). */
export interface MonteCarloSummary {
  /** Number of trials M. */
  trials: number
  /** Estimate y (mean of the model values), output unit. */
  mean: number
  /** Standard uncertainty u(y) (standard deviation, divisor M − 1), output unit. */
  standardUncertainty: number
  /** Coverage probability p. */
  coverageProbability: number
  /** Probabilistically symmetric coverage interval [y_low, y_high], output unit (JCGM 101 7.7.1). */
  coverageInterval: { low: number; high: number }
  /** Shortest coverage interval, output unit (JCGM 101 7.7.2). */
  shortestCoverageInterval: { low: number; high: number }
}

/**
 * Summarises model values: mean, standard deviation, coverage intervals. Indices follow JCGM 101 7.7
 * (as recalled from memory): q = pM if pM is an integer, else ⌊pM + ½⌋; symmetric interval
 * [y₍ᵣ₎, y₍ᵣ₊q₎] (1-based order statistics) with r = (M − q)/2 if that is an integer, else
 * ⌊(M − q + 1)/2⌋; shortest interval: the r minimising y₍ᵣ₊q₎ − y₍ᵣ₎.
 * @param values - model values (not modified; a sorted copy is made), output unit
 * @param coverageProbability - p in (0, 1) (default 0.95)
 * @returns summary, output unit
 * @throws EngineInputError (`values` with a NaN/∞ or fewer than 2 values, `coverageProbability`)
 * @example summarizeMonteCarlo(values, 0.95).coverageInterval
 */
export function summarizeMonteCarlo(values: Float64Array | readonly number[], coverageProbability = 0.95): MonteCarloSummary {
  if (typeof coverageProbability !== 'number' || !(coverageProbability > 0 && coverageProbability < 1)) {
    throw new EngineInputError('coverageProbability', `must be strictly between 0 and 1, got ${String(coverageProbability)}`)
  }
  const M = values.length
  if (M < 2) throw new EngineInputError('trials', 'needs at least two trials')
  const sorted = Float64Array.from(values)
  let sum = 0
  let bad = 0
  for (let i = 0; i < M; i++) {
    const v = sorted[i]!
    if (!Number.isFinite(v)) bad++
    else sum += v
  }
  if (bad > 0) {
    throw new EngineInputError('inputs', `${bad} of ${M} trials gave no finite model value: narrow the input distributions to where the model is defined`)
  }
  const mean = sum / M
  let ss = 0
  let comp = 0 // compensated correction Σ(x − mean)
  for (let i = 0; i < M; i++) {
    const d = sorted[i]! - mean
    ss += d * d
    comp += d
  }
  const variance = (ss - (comp * comp) / M) / (M - 1)
  sorted.sort()
  const pM = coverageProbability * M
  const q = Math.min(M - 1, Number.isInteger(pM) ? pM : Math.floor(pM + 0.5))
  const r = (M - q) % 2 === 0 ? (M - q) / 2 : Math.floor((M - q + 1) / 2)
  const lowIdx = Math.max(1, r) - 1
  const highIdx = Math.min(M, Math.max(1, r) + q) - 1
  let best = 0
  let bestWidth = Number.POSITIVE_INFINITY
  for (let j = 0; j + q < M; j++) {
    const w = sorted[j + q]! - sorted[j]!
    if (w < bestWidth) {
      bestWidth = w
      best = j
    }
  }
  return {
    trials: M,
    mean,
    standardUncertainty: Math.sqrt(Math.max(variance, 0)),
    coverageProbability,
    coverageInterval: { low: sorted[lowIdx]!, high: sorted[highIdx]! },
    shortestCoverageInterval: { low: sorted[best]!, high: sorted[best + q]! },
  }
}

/** Options for {@link runMonteCarlo}. */
export interface MonteCarloOptions {
  /** Number of trials M (default 10⁶; at least 2, at most 10⁸). Ignored by the adaptive procedure. */
  trials?: number
  /** Seed, integer 0 … 2³² − 1 (default 1). */
  seed?: number
  /** Coverage probability p (default 0.95). */
  coverageProbability?: number
  /** Trials per chunk between progress reports (default 65536). */
  chunkTrials?: number
  /** Called after each chunk with (trials done, trials in total; for an adaptive run the total so far). */
  onProgress?: (done: number, total: number) => void
  /** Correlated pairs of inputs (JCGM 101 6.4.8; see the module notes). */
  correlations?: readonly MonteCarloCorrelation[]
  /** The adaptive procedure of JCGM 101 7.9 instead of a fixed M: `true` or its settings. */
  adaptive?: boolean | AdaptiveOptions
}

/** Settings of the adaptive procedure (JCGM 101 7.9). */
export interface AdaptiveOptions {
  /** Significant digits n_dig of u(y) for the tolerance δ (default 2; JCGM 101 7.9.2 suggests 1 or 2). */
  significantDigits?: number
  /** Trials per batch (default max(J, 10⁴), J = ⌈100/(1 − p)⌉; JCGM 101 7.9.4). */
  batchTrials?: number
  /** Stop without stabilisation after this many trials (default 10⁷). */
  maxTrials?: number
}

/** How an adaptive run ended (JCGM 101 7.9). */
export interface AdaptiveReport {
  /** Trials per batch M. */
  batchTrials: number
  /** Number of batches h run. */
  batches: number
  /** n_dig used. */
  significantDigits: number
  /** Numerical tolerance δ of the final u(y), output unit. */
  tolerance: number
  /** 2·s of the batch means, standard uncertainties and interval ends, output unit. */
  twoStandardDeviations: { mean: number, standardUncertainty: number, low: number, high: number }
  /** True when all four are ≤ δ; false when maxTrials stopped the run first. */
  converged: boolean
  /** Per-batch results y⁽ʳ⁾, u(y⁽ʳ⁾), y_low⁽ʳ⁾, y_high⁽ʳ⁾ (probabilistically symmetric interval), output unit. */
  batchResults: { mean: number[], standardUncertainty: number[], low: number[], high: number[] }
}

/** Result of {@link runMonteCarlo}: the summary plus the run's parameters. */
export interface MonteCarloResult extends MonteCarloSummary {
  seed: number
  /** Present for an adaptive run: batches, tolerance and whether the results stabilised. */
  adaptive?: AdaptiveReport
  /** Present when inputs were correlated: each stated r and the r* of the underlying normals. */
  correlations?: { between: [number, number], coefficient: number, normalCoefficient: number }[]
}

function checkTrials(trials: unknown, field = 'trials'): number {
  if (typeof trials !== 'number' || !Number.isInteger(trials) || trials < 2 || trials > 1e8) {
    throw new EngineInputError(field, `must be an integer from 2 to 100000000, got ${String(trials)}`)
  }
  return trials
}

interface Plan {
  c: CompiledInputs
  seed: number
  p: number
  chunk: number
  adaptive: { M: number, nDig: number, maxTrials: number } | null
  trials: number
}

function plan(inputs: readonly MonteCarloInput[], options: MonteCarloOptions): Plan {
  const c = compileInputs(inputs, options.correlations)
  const seed = checkSeed(options.seed ?? 1)
  const p = options.coverageProbability ?? 0.95
  if (typeof p !== 'number' || !(p > 0 && p < 1)) {
    throw new EngineInputError('coverageProbability', `must be strictly between 0 and 1, got ${String(p)}`)
  }
  const chunk = Math.max(MC_BLOCK_SIZE, Math.floor(options.chunkTrials ?? 65536))
  const a = options.adaptive
  if (a === undefined || a === false) return { c, seed, p, chunk, adaptive: null, trials: checkTrials(options.trials ?? 1_000_000) }
  if (a !== true && (typeof a !== 'object' || a === null)) throw new EngineInputError('adaptive', 'must be true, false or { significantDigits, batchTrials, maxTrials }')
  const o: AdaptiveOptions = a === true ? {} : a
  const nDig = o.significantDigits ?? 2
  if (!Number.isInteger(nDig) || nDig < 1 || nDig > 6) throw new EngineInputError('adaptive.significantDigits', `must be an integer from 1 to 6, got ${String(nDig)}`)
  const J = Math.ceil(100 / (1 - p) - 1e-9)
  const M = checkTrials(o.batchTrials ?? Math.max(J, 10_000), 'adaptive.batchTrials')
  const maxTrials = checkTrials(o.maxTrials ?? 10_000_000, 'adaptive.maxTrials')
  if (maxTrials < 2 * M) throw new EngineInputError('adaptive.maxTrials', `must allow at least two batches (${2 * M} trials), got ${maxTrials}`)
  return { c, seed, p, chunk, adaptive: { M, nDig, maxTrials }, trials: 0 }
}

/** Standard deviation of the mean of h batch values: √(Σ(v − v̄)²/(h(h − 1))). */
function sdOfMean(v: readonly number[]): number {
  const h = v.length
  let m = 0
  for (const x of v) m += x
  m /= h
  let s = 0
  for (const x of v) s += (x - m) ** 2
  return Math.sqrt(s / (h * (h - 1)))
}

/**
 * The run as a generator of chunk ranges, so that the sync and async drivers share it: yields after
 * each chunk; returns the result.
 */
function* drive(model: MonteCarloModel, pl: Plan, onProgress?: (done: number, total: number) => void): Generator<void, MonteCarloResult, void> {
  const { c, seed, p, chunk } = pl
  const correlations = c.copula?.pairs.map(q => ({ between: [q.i, q.j] as [number, number], coefficient: q.coefficient, normalCoefficient: q.normalCoefficient }))
  const extra = correlations ? { correlations } : {}
  if (pl.adaptive === null) {
    const M = pl.trials
    const values = new Float64Array(M)
    for (let s = 0; s < M; s += chunk) {
      const e = Math.min(M, s + chunk)
      values.set(runMonteCarloChunk(model, c, seed, s, e), s)
      onProgress?.(e, M)
      yield
    }
    return { ...summarizeMonteCarlo(values, p), seed, ...extra }
  }
  const { M, nDig, maxTrials } = pl.adaptive
  let values = new Float64Array(Math.min(maxTrials, 8 * M))
  const batch: AdaptiveReport['batchResults'] = { mean: [], standardUncertainty: [], low: [], high: [] }
  // running sums of all values for u(y) (Chan et al. pairwise update of mean and M2)
  let n = 0
  let mean = 0
  let m2 = 0
  let converged = false
  let tolerance = 0
  let two = { mean: Number.NaN, standardUncertainty: Number.NaN, low: Number.NaN, high: Number.NaN }
  for (let h = 1; (h - 1) * M + M <= maxTrials; h++) {
    const start = (h - 1) * M
    if (values.length < start + M) {
      const grown = new Float64Array(Math.min(maxTrials, Math.max(2 * values.length, start + M)))
      grown.set(values.subarray(0, start))
      values = grown
    }
    for (let s = start; s < start + M; s += chunk) {
      const e = Math.min(start + M, s + chunk)
      values.set(runMonteCarloChunk(model, c, seed, s, e), s)
      onProgress?.(e, e)
      yield
    }
    const b = summarizeMonteCarlo(values.subarray(start, start + M), p)
    batch.mean.push(b.mean)
    batch.standardUncertainty.push(b.standardUncertainty)
    batch.low.push(b.coverageInterval.low)
    batch.high.push(b.coverageInterval.high)
    const bm2 = b.standardUncertainty ** 2 * (M - 1)
    const delta = b.mean - mean
    const nn = n + M
    m2 += bm2 + (delta * delta * n * M) / nn
    mean += (delta * M) / nn
    n = nn
    if (h < 2) continue
    const u = Math.sqrt(m2 / (n - 1))
    if (!(u > 0)) {
      // a constant output: nothing to stabilise
      tolerance = 0
      two = { mean: 0, standardUncertainty: 0, low: 0, high: 0 }
      converged = true
      break
    }
    tolerance = numericalTolerance(u, nDig)
    two = { mean: 2 * sdOfMean(batch.mean), standardUncertainty: 2 * sdOfMean(batch.standardUncertainty), low: 2 * sdOfMean(batch.low), high: 2 * sdOfMean(batch.high) }
    if (two.mean <= tolerance && two.standardUncertainty <= tolerance && two.low <= tolerance && two.high <= tolerance) {
      converged = true
      break
    }
  }
  const total = batch.mean.length * M
  return {
    ...summarizeMonteCarlo(values.subarray(0, total), p),
    seed,
    ...extra,
    adaptive: { batchTrials: M, batches: batch.mean.length, significantDigits: nDig, tolerance, twoStandardDeviations: two, converged, batchResults: batch },
  }
}

/**
 * Propagates the input distributions through the model on the calling thread, chunk by chunk
 * (JCGM 101 7.2–7.7), and summarises the output: M trials, or the adaptive procedure of JCGM 101 7.9
 * with `adaptive`. Correlated inputs with `correlations` (JCGM 101 6.4.8; module notes). For 10⁶
 * trials of the reading model this takes about a second: run it off the request thread (see
 * ./montecarloWorker) or use {@link runMonteCarloAsync}.
 * @param model - y = f(x), output unit
 * @param inputs - input distributions
 * @param options - trials (default 10⁶), seed (default 1), coverageProbability (default 0.95), chunkTrials,
 *   onProgress, correlations, adaptive
 * @returns mean, u(y), coverage intervals, M, seed; `adaptive` and `correlations` reports when used
 * @throws EngineInputError (`inputs…`, `correlations…`, `trials`, `seed`, `coverageProbability`, `adaptive…`)
 * @example runMonteCarlo(x => x[0] + x[1] + x[2] + x[3], four N(0,1) inputs).standardUncertainty ≈ 2
 */
export function runMonteCarlo(model: MonteCarloModel, inputs: readonly MonteCarloInput[], options: MonteCarloOptions = {}): MonteCarloResult {
  const g = drive(model, plan(inputs, options), options.onProgress)
  for (;;) {
    const r = g.next()
    if (r.done) return r.value
  }
}

/**
 * As {@link runMonteCarlo}, but yields to the event loop between chunks (so a server stays
 * responsive) and gives the same result for the same seed.
 * @param model - y = f(x)
 * @param inputs - input distributions
 * @param options - as {@link runMonteCarlo}
 * @returns a promise of the result
 */
export async function runMonteCarloAsync(
  model: MonteCarloModel,
  inputs: readonly MonteCarloInput[],
  options: MonteCarloOptions = {},
): Promise<MonteCarloResult> {
  const g = drive(model, plan(inputs, options), options.onProgress)
  for (;;) {
    const r = g.next()
    if (r.done) return r.value
    await new Promise<void>((resolve) => setTimeout(resolve, 0))
  }
}

/**
 * Splits M trials into contiguous chunk ranges aligned to blocks, e.g. for workers.
 * @param trials - M
 * @param parts - number of chunks wanted (≥ 1)
 * @returns [start, end) pairs covering [0, M) in order
 * @example splitTrials(1_000_000, 2) → [[0, 500736], [500736, 1000000]]
 */
export function splitTrials(trials: number, parts: number): [number, number][] {
  const M = checkTrials(trials)
  const k = Math.max(1, Math.floor(parts))
  const blocks = Math.ceil(M / MC_BLOCK_SIZE)
  const per = Math.ceil(blocks / k)
  const out: [number, number][] = []
  for (let s = 0; s < M; s += per * MC_BLOCK_SIZE) out.push([s, Math.min(M, s + per * MC_BLOCK_SIZE)])
  return out
}

// ---------------------------------------------------------------------------------------------
// Validation of the GUM uncertainty framework (JCGM 101 8)

/** Result of {@link validateGumResult}. */
export interface GumValidation {
  /** Numerical tolerance δ = ½·10^ℓ, output unit. */
  tolerance: number
  /** |y − U − y_low|, output unit. */
  dLow: number
  /** |y + U − y_high|, output unit. */
  dHigh: number
  /** True when both dLow and dHigh ≤ δ. */
  validated: boolean
  /** Significant digits n_dig used for u(y). */
  significantDigits: number
}

/**
 * Numerical tolerance of a standard uncertainty (JCGM 101 7.9.2 / 8.2): write u(y) as c × 10^ℓ with c
 * an integer of n_dig digits; δ = ½·10^ℓ.
 * @param standardUncertainty - u(y) > 0, output unit
 * @param significantDigits - n_dig (default 2)
 * @returns δ, output unit
 * @example numericalTolerance(2.0) === 0.05 (u = 20 × 10⁻¹)
 */
export function numericalTolerance(standardUncertainty: number, significantDigits = 2): number {
  if (!(Number.isFinite(standardUncertainty) && standardUncertainty > 0)) {
    throw new EngineInputError('standardUncertainty', `must be a finite number above 0, got ${String(standardUncertainty)}`)
  }
  if (!Number.isInteger(significantDigits) || significantDigits < 1 || significantDigits > 6) {
    throw new EngineInputError('significantDigits', 'must be an integer from 1 to 6')
  }
  const s = standardUncertainty.toExponential(significantDigits - 1)
  // toExponential rounds first, so 0.0996 at two digits is '1.0e-1' and δ = 0.005 (u = 10 × 10⁻²)
  const e = Number(s.slice(s.indexOf('e') + 1)) - (significantDigits - 1)
  return 0.5 * 10 ** e
}

/**
 * Validates a GUM result against a Monte Carlo coverage interval (JCGM 101 8.2): the GUM interval
 * y ± U is validated when d_low = |y − U − y_low| and d_high = |y + U − y_high| are both ≤ δ, with δ
 * from the significant digits of the GUM's u(y).
 * @param gum - y (estimate), U (expanded uncertainty for the same p), u (standard uncertainty u(y)); output unit
 * @param mc - Monte Carlo coverage interval {low, high} for the same coverage probability, output unit
 * @param significantDigits - n_dig (default 2)
 * @returns δ, d_low, d_high and the verdict
 * @example validateGumResult({ y: 0, U: 3.92, u: 2 }, { low: -3.92, high: 3.92 }).validated === true
 */
export function validateGumResult(
  gum: { y: number; U: number; u: number },
  mc: { low: number; high: number },
  significantDigits = 2,
): GumValidation {
  for (const [k, v] of [['y', gum.y], ['U', gum.U], ['low', mc.low], ['high', mc.high]] as const) {
    if (!Number.isFinite(v)) throw new EngineInputError(k, `must be a finite number, got ${String(v)}`)
  }
  const tolerance = numericalTolerance(gum.u, significantDigits)
  const dLow = Math.abs(gum.y - gum.U - mc.low)
  const dHigh = Math.abs(gum.y + gum.U - mc.high)
  return { tolerance, dLow, dHigh, validated: dLow <= tolerance && dHigh <= tolerance, significantDigits }
}
