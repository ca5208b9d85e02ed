/**
 * A band's signal S(T) = ∫ R(λ) L(λ,T) dλ tabulated once over a temperature range, so that a Monte
 * Carlo run with a measured (tabulated) responsivity costs per trial about what a rectangular band
 * costs: the exact closed form of ./planck sums every segment of the table at every call (≈ 5 µs for
 * 33 points, ≈ 20 µs for 121), the table ≈ 30 ns.
 *
 * Representation. In u = 1/T (K⁻¹) the function y(u) = ln S(1/u) + k·u, with k = c2/λ0 (λ0 the
 * band's mean wavelength), is smooth and slowly varying: ln S is nearly linear in 1/T (Wien), and the
 * k·u term removes most of that slope so y stays of modest size. The range [1/maxK, 1/minK] is split
 * into equal bins in u; each bin, the first time it is used, is covered by panels on which y and its
 * derivative y′ are each replaced by their Chebyshev interpolant of degree 11 (12 Chebyshev points;
 * J. C. Mason and D. C. Handscomb, "Chebyshev Polynomials", 2003, §6.3), with node values from the
 * exact evaluator of ./planck. A panel is accepted only when
 *   (a) at the 11 points half-way (in angle) between its nodes the interpolated y differs from the
 *       exact ln S + k·u by at most {@link SIGNAL_TABLE_TOLERANCE} (1e-11, i.e. S to 1e-11 relative)
 *       and y′ from the exact one by at most 1e-9 of d ln S/d ln T, and
 *   (b) the last two Chebyshev coefficients of y together are below a tenth of that tolerance
 *       (for a function analytic around the panel the interpolation error is bounded by about twice
 *       the sum of the omitted coefficients, which decay geometrically; L. N. Trefethen,
 *       "Approximation Theory and Approximation Practice", SIAM 2013, Theorems 8.2 and 4.2);
 * otherwise the panel is halved and both halves are tried again. A panel still failing after 16
 * halvings, or beyond 64 panels in a bin (the exact values too noisy, or S underflowing), is marked
 * and evaluated exactly.
 * So every value the table returns has passed both an a-posteriori check against the exact integral
 * and a coefficient-decay test; the unit tests check the result densely (10⁴ temperatures per band)
 * against the exact integral: ≤ 1e-10 relative for S, ≤ 1e-8 for dS/dT.
 *
 * Outside [minK, maxK] every method falls back to the exact evaluator, so a table is always safe to
 * use; it is only faster where it applies.
 *
 * Inversion (signal → T) inside the table: Newton's method on ln S(u) − ln S* in u = 1/T. ln S is a
 * convex function of u (S is a sum of Laplace transforms of a positive measure: the Bose–Einstein
 * factor expands as Σₖ e^(−k·c2·u/λ)), so after the first step the iterates approach the root
 * monotonically from one side and never leave the bracket; it stops when the step is below
 * 1e-13·u (≤ 5e-10 K at 5000 K). Targets outside the table's range, and the rare iteration that does
 * not settle, go to the exact safeguarded inversion of ./inversion.
 */

import { resolveConstants, type RadiationConstants, type RadiationConstantsChoice } from './constants'
import { EngineInputError } from './errors'
import { INVERSION_RANGE_K, invertUnchecked } from './inversion'
import { bandRadianceAndDerivativeUnchecked, bandRadianceUnchecked, prepareBand, type Band, type PreparedBand } from './planck'

/** Acceptance tolerance of a panel on ln S (so on S, relative). */
export const SIGNAL_TABLE_TOLERANCE = 1e-11

/** Acceptance tolerance of a panel on d ln S/d ln T, relative to max(1, |d ln S/d ln T|). */
const DERIVATIVE_TOLERANCE = 1e-9

/** Chebyshev points (and coefficients) per panel. */
const NC = 12
/** Target bin width in u = 1/T, K⁻¹: a few bins per range a Monte Carlo run visits. */
const BIN_WIDTH_U = 2.5e-4
const MAX_BINS = 512
/** Halvings of a bin before a failing panel is left to the exact evaluator. */
const MAX_DEPTH = 16
/** Panels per bin before the rest of the bin is left to the exact evaluator. */
const MAX_PANELS_PER_BIN = 64

/** cos(π(2j + 1)/(2NC)): the Chebyshev nodes on [−1, 1]. */
const NODES = Float64Array.from({ length: NC }, (_, j) => Math.cos((Math.PI * (2 * j + 1)) / (2 * NC)))
/** cos(πj/NC), j = 1…NC−1: the check points, half-way in angle between consecutive nodes. */
const CHECKS = Float64Array.from({ length: NC - 1 }, (_, j) => Math.cos((Math.PI * (j + 1)) / NC))
/** cos(πm/(2NC)) for m = 0…4NC−1: the DCT's cosines with the angle reduced exactly. */
const COS = Float64Array.from({ length: 4 * NC }, (_, m) => Math.cos((Math.PI * m) / (2 * NC)))

/** Chebyshev coefficients of the interpolant through values f at NODES. */
function chebCoefficients(f: Float64Array): Float64Array {
  const c = new Float64Array(NC)
  for (let k = 0; k < NC; k++) {
    let sum = 0
    for (let j = 0; j < NC; j++) sum += f[j]! * COS[(k * (2 * j + 1)) % (4 * NC)]!
    c[k] = ((k === 0 ? 1 : 2) * sum) / NC
  }
  return c
}

/** Chebyshev → monomial coefficients in s, written to out at offset o. */
function toMonomial(cheb: Float64Array, out: Float64Array, o: number): void {
  let tPrev = new Float64Array(NC)
  let tCur = new Float64Array(NC)
  tPrev[0] = 1
  tCur[1] = 1
  out[o] = cheb[0]!
  for (let m = 1; m < NC; m++) out[o + m] = 0
  for (let k = 1; k < NC; k++) {
    for (let m = 0; m < NC; m++) out[o + m] = out[o + m]! + cheb[k]! * tCur[m]!
    const next = new Float64Array(NC)
    for (let m = 0; m < NC; m++) next[m] = (m > 0 ? 2 * tCur[m - 1]! : 0) - tPrev[m]!
    tPrev = tCur
    tCur = next
  }
}

/** Σ a[o+k]·s^k, k = 0…11, by Estrin's scheme. */
function estrin12(a: Float64Array, o: number, s: number): number {
  const s2 = s * s
  const s4 = s2 * s2
  const q0 = a[o]! + a[o + 1]! * s + s2 * (a[o + 2]! + a[o + 3]! * s)
  const q1 = a[o + 4]! + a[o + 5]! * s + s2 * (a[o + 6]! + a[o + 7]! * s)
  const q2 = a[o + 8]! + a[o + 9]! * s + s2 * (a[o + 10]! + a[o + 11]! * s)
  return q0 + s4 * (q1 + s4 * q2)
}

/** The panels covering one bin: n panels, edges[0…n] in u, coefficients n × NC for y and y′. */
class Bin {
  constructor(
    readonly n: number,
    readonly edges: Float64Array,
    readonly mid: Float64Array,
    readonly invHalf: Float64Array,
    readonly coef: Float64Array,
    readonly dcoef: Float64Array,
  ) {}
}
const UNBUILT = new Bin(0, new Float64Array(0), new Float64Array(0), new Float64Array(0), new Float64Array(0), new Float64Array(0))

interface Panel {
  a: number
  b: number
  coef: Float64Array // NC monomial coefficients of y, or NaN when the panel is evaluated exactly
  dcoef: Float64Array
  worst: number
}

/**
 * S(T) and dS/dT of one band, interpolated over a temperature range (see the module notes).
 * Create with {@link prepareSignalTable}. Holds scratch state: one table per thread.
 */
export class SignalTable {
  /** The band, prepared. */
  readonly band: PreparedBand
  /** Radiation constants used. */
  readonly constants: RadiationConstants
  /** Lowest temperature of the table, K. */
  readonly minK: number
  /** Highest temperature of the table, K. */
  readonly maxK: number
  /** k = c2/λ0, K: the slope removed from ln S in 1/T. */
  private readonly k: number
  private readonly uLo: number
  private readonly uHi: number
  private readonly nBins: number
  private readonly binScale: number
  private readonly bins: Bin[]
  private readonly out = new Float64Array(2)
  // results of locate(): y and y′ at the last u, or NaN when the panel is exact-only
  private y = 0
  private yp = 0
  private lnSAtMax = Number.NaN
  private lnSAtMin = Number.NaN
  private worst = 0
  private panelCount = 0
  private exactEvaluations = 0

  /** @internal use {@link prepareSignalTable} */
  constructor(band: PreparedBand, minK: number, maxK: number, c: RadiationConstants) {
    this.band = band
    this.constants = c
    this.minK = minK
    this.maxK = maxK
    this.k = c.c2UmK / band.meanWavelengthUm
    this.uLo = 1 / maxK
    this.uHi = 1 / minK
    this.nBins = Math.min(MAX_BINS, Math.max(1, Math.ceil((this.uHi - this.uLo) / BIN_WIDTH_U)))
    this.binScale = this.nBins / (this.uHi - this.uLo)
    this.bins = Array.from({ length: this.nBins }, () => UNBUILT)
  }

  /** Panels built so far (all bins are built lazily, on first use). */
  get panels(): number {
    return this.panelCount
  }

  /** Exact evaluations spent on building panels so far. */
  get buildEvaluations(): number {
    return this.exactEvaluations
  }

  /** Largest |interpolated − exact| of ln S found at the check points of the panels built so far (relative error of S). */
  get maxCheckedError(): number {
    return this.worst
  }

  /** Builds every bin now (normally they are built on first use). */
  buildAll(): this {
    for (let i = 0; i < this.nBins; i++) this.binAt(i)
    return this
  }

  /**
   * Band signal S(T): interpolated inside [minK, maxK], exact outside.
   * @param temperatureK - T, K (> 0; not re-validated)
   * @returns S(T), W·m⁻²·sr⁻¹
   */
  signal(temperatureK: number): number {
    if (temperatureK >= this.minK && temperatureK <= this.maxK) {
      const u = 1 / temperatureK
      this.locate(u)
      const y = this.y
      if (y === y) return Math.exp(y - this.k * u)
    }
    return bandRadianceUnchecked(this.band, temperatureK, this.constants)
  }

  /**
   * S(T) and dS/dT, interpolated inside [minK, maxK], exact outside.
   * @param temperatureK - T, K
   * @param out - receives [S (W·m⁻²·sr⁻¹), dS/dT (W·m⁻²·sr⁻¹·K⁻¹)]
   */
  signalAndDerivative(temperatureK: number, out: Float64Array): void {
    if (temperatureK >= this.minK && temperatureK <= this.maxK) {
      const u = 1 / temperatureK
      this.locate(u)
      const y = this.y
      if (y === y) {
        const s = Math.exp(y - this.k * u)
        out[0] = s
        out[1] = -s * (this.yp - this.k) * u * u // dS/dT = S · d ln S/du · du/dT
        return
      }
    }
    bandRadianceAndDerivativeUnchecked(this.band, temperatureK, this.constants, out)
  }

  /**
   * Temperature whose signal is `signal`: Newton on the table when the answer lies in [minK, maxK]
   * (see the module notes), otherwise the exact safeguarded inversion over 50 K to 5000 K, which
   * throws as `temperatureFromRadiance` does.
   * @param signal - S*, W·m⁻²·sr⁻¹ (> 0)
   * @param guessK - starting temperature, K (e.g. the source temperature of a reading)
   * @param field - input named in an error from the exact inversion (default `'radiance'`)
   * @returns T, K
   * @throws EngineInputError when the exact inversion is needed and fails (S* ≤ 0 or out of range)
   */
  temperature(signal: number, guessK: number, field = 'radiance'): number {
    const t = this.temperatureInTable(signal, guessK)
    if (t === t) return t
    return invertUnchecked(this.band, signal, this.constants, INVERSION_RANGE_K.min, INVERSION_RANGE_K.max, guessK, field)
  }

  /** Newton in the table; NaN when the answer is outside it (or the iteration does not settle). */
  private temperatureInTable(signal: number, guessK: number): number {
    if (!(signal > 0) || signal === Infinity) return Number.NaN
    if (this.lnSAtMax !== this.lnSAtMax) {
      this.lnSAtMax = Math.log(this.signal(this.maxK))
      this.lnSAtMin = Math.log(this.signal(this.minK))
    }
    const target = Math.log(signal)
    if (!(target <= this.lnSAtMax && target >= this.lnSAtMin)) return Number.NaN
    const uLo = this.uLo
    const uHi = this.uHi
    let u = guessK >= this.minK && guessK <= this.maxK ? 1 / guessK : (uLo + uHi) / 2
    const k = this.k
    for (let i = 0; i < 40; i++) {
      this.locate(u)
      const y = this.y
      if (y !== y) return Number.NaN
      const f = y - k * u - target
      const fp = this.yp - k // d ln S/du < 0
      if (!(fp < 0)) return Number.NaN
      const step = f / fp
      let next = u - step
      if (next < uLo) next = uLo
      else if (next > uHi) next = uHi
      if (Math.abs(next - u) <= 1e-13 * u) return 1 / next
      u = next
    }
    return Number.NaN
  }

  /** Sets this.y, this.yp for u in [uLo, uHi] (NaN when the panel is exact-only). */
  private locate(u: number): void {
    let i = ((u - this.uLo) * this.binScale) | 0
    if (i >= this.nBins) i = this.nBins - 1
    else if (i < 0) i = 0
    let b = this.bins[i]!
    if (b.n === 0) b = this.binAt(i)
    let j = 0
    const e = b.edges
    while (j + 1 < b.n && u >= e[j + 1]!) j++
    const s = (u - b.mid[j]!) * b.invHalf[j]!
    const o = j * NC
    this.y = estrin12(b.coef, o, s)
    this.yp = estrin12(b.dcoef, o, s)
  }

  private binAt(i: number): Bin {
    const built = this.bins[i]!
    if (built.n > 0) return built
    const w = (this.uHi - this.uLo) / this.nBins
    const a = this.uLo + i * w
    const b = i === this.nBins - 1 ? this.uHi : a + w
    const panels: Panel[] = []
    this.cover(a, b, 0, panels)
    const n = panels.length
    const edges = new Float64Array(n + 1)
    const mid = new Float64Array(n)
    const invHalf = new Float64Array(n)
    const coef = new Float64Array(n * NC)
    const dcoef = new Float64Array(n * NC)
    for (let j = 0; j < n; j++) {
      const p = panels[j]!
      edges[j] = p.a
      mid[j] = (p.a + p.b) / 2
      invHalf[j] = 2 / (p.b - p.a)
      coef.set(p.coef, j * NC)
      dcoef.set(p.dcoef, j * NC)
    }
    edges[n] = b
    const bin = new Bin(n, edges, mid, invHalf, coef, dcoef)
    this.bins[i] = bin
    this.panelCount += n
    return bin
  }

  /** Exact y and y′ at u into this.out. */
  private exactY(u: number): void {
    const T = 1 / u
    bandRadianceAndDerivativeUnchecked(this.band, T, this.constants, this.out)
    this.exactEvaluations++
    const s = this.out[0]!
    const ds = this.out[1]!
    this.out[0] = Math.log(s) + this.k * u
    this.out[1] = this.k - (ds * T * T) / s // d ln S/du = −T²·S′/S
  }

  /** Covers [a, b] with accepted panels (halving on failure), appended to `panels` in order. */
  private cover(a: number, b: number, depth: number, panels: Panel[]): void {
    const mid = (a + b) / 2
    if (panels.length >= MAX_PANELS_PER_BIN) {
      panels.push({ a, b, coef: new Float64Array(NC).fill(Number.NaN), dcoef: new Float64Array(NC), worst: Number.NaN })
      return
    }
    const half = (b - a) / 2
    const fy = new Float64Array(NC)
    const fp = new Float64Array(NC)
    let finite = true
    for (let j = 0; j < NC; j++) {
      this.exactY(mid + half * NODES[j]!)
      fy[j] = this.out[0]!
      fp[j] = this.out[1]!
      if (!Number.isFinite(fy[j]!) || !Number.isFinite(fp[j]!)) finite = false
    }
    const cy = chebCoefficients(fy)
    const cp = chebCoefficients(fp)
    const coef = new Float64Array(NC)
    const dcoef = new Float64Array(NC)
    toMonomial(cy, coef, 0)
    toMonomial(cp, dcoef, 0)
    let ok = finite && Math.abs(cy[NC - 1]!) + Math.abs(cy[NC - 2]!) <= SIGNAL_TABLE_TOLERANCE / 10
    let worst = 0
    if (ok) {
      for (let j = 0; j < NC - 1 && ok; j++) {
        const s = CHECKS[j]!
        const u = mid + half * s
        this.exactY(u)
        const ey = Math.abs(estrin12(coef, 0, s) - this.out[0]!)
        const dlnS = Math.abs(u * (this.out[1]! - this.k)) // |d ln S/d ln T|
        const ep = (Math.abs(estrin12(dcoef, 0, s) - this.out[1]!) * u) / Math.max(1, dlnS)
        if (!(ey <= SIGNAL_TABLE_TOLERANCE && ep <= DERIVATIVE_TOLERANCE)) ok = false
        if (ey > worst) worst = ey
      }
    }
    if (ok) {
      if (worst > this.worst) this.worst = worst
      panels.push({ a, b, coef, dcoef, worst })
      return
    }
    if (depth >= MAX_DEPTH) {
      coef.fill(Number.NaN)
      panels.push({ a, b, coef, dcoef, worst: Number.NaN })
      return
    }
    this.cover(a, mid, depth + 1, panels)
    this.cover(mid, b, depth + 1, panels)
  }
}

/**
 * Tabulates a band's signal over [minK, maxK] for fast repeated evaluation (see the module notes).
 * Bins are built lazily, so a wide range costs only where it is used.
 * @param band - rectangular or tabulated band, or a PreparedBand
 * @param minK - lowest temperature of the table, K (> 0)
 * @param maxK - highest temperature, K (> minK)
 * @param constants - radiation constants (default CODATA 2018)
 * @returns the table
 * @throws EngineInputError (`band…`, `minTemperatureK`, `maxTemperatureK`)
 * @example prepareSignalTable(demoTable, 223, 823).signal(373.15) ≈ bandRadiance(demoTable, 373.15) (to 1e-11)
 */
export function prepareSignalTable(
  band: Band | PreparedBand,
  minK: number,
  maxK: number,
  constants?: RadiationConstantsChoice,
): SignalTable {
  const p = prepareBand(band)
  const c = resolveConstants(constants)
  if (typeof minK !== 'number' || !Number.isFinite(minK) || minK <= 0) {
    throw new EngineInputError('minTemperatureK', `must be a finite temperature above 0 K, got ${String(minK)}`)
  }
  if (typeof maxK !== 'number' || !Number.isFinite(maxK) || maxK <= minK) {
    throw new EngineInputError('maxTemperatureK', `must be finite and above minTemperatureK (${minK} K), got ${String(maxK)}`)
  }
  return new SignalTable(p, minK, maxK, c)
}

/** Options of `readingModel` (./reading). */
export interface ReadingModelOptions {
  /**
   * Temperatures (K) the trials are expected to visit: source, reflected and instrument temperatures
   * and the readings. For a tabulated band a {@link SignalTable} is prepared over this range
   * (intersected with the inversion range 50 K to 5000 K); values outside it are computed exactly, so
   * the range affects speed only, never results beyond ~1e-9 K. Ignored for a rectangular band.
   */
  temperatureRangeK?: { min: number; max: number }
}

/**
 * @internal The reading model x = [T_s, ε_s, T_w, T_d, ε_i] → T_meas evaluated through a signal table;
 * same equation and same NaN/throw behaviour as the exact model of ./reading.
 */
export function readingModelFromTable(table: SignalTable): (x: ArrayLike<number>) => number {
  return (x: ArrayLike<number>): number => {
    const ts = x[0]!
    const es = x[1]!
    const ei = x[4]!
    const ss = table.signal(ts)
    const sw = es === 1 ? 0 : table.signal(x[2]!)
    const sd = ei === 1 ? 0 : table.signal(x[3]!)
    const sMeas = (es * ss + (1 - es) * sw - (1 - ei) * sd) / ei
    if (!(sMeas > 0) || !Number.isFinite(sMeas)) return Number.NaN
    return table.temperature(sMeas, ts, 'sourceTemperatureK')
  }
}

/**
 * @internal The table for a reading model, or null when none applies (rectangular band, no range, a
 * single temperature, or a range outside 50 K to 5000 K).
 * @throws EngineInputError (`temperatureRangeK`) for a malformed range
 */
export function readingSignalTable(band: PreparedBand, c: RadiationConstants, options: ReadingModelOptions | undefined): SignalTable | null {
  const range = options?.temperatureRangeK
  if (range === undefined || band.kind !== 'tabulated') return null
  const min: unknown = range?.min
  const max: unknown = range?.max
  if (typeof min !== 'number' || typeof max !== 'number' || !(min > 0) || !(max >= min) || max === Infinity) {
    throw new EngineInputError('temperatureRangeK', `must be {min, max} in K with 0 < min ≤ max, both finite; got ${String(min)} to ${String(max)}`)
  }
  const lo = Math.max(min, INVERSION_RANGE_K.min)
  const hi = Math.min(max, INVERSION_RANGE_K.max)
  return hi > lo ? new SignalTable(band, lo, hi, c) : null
}
