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
 * Results (JCGM 101 7.6, 7.7): mean, standard deviation with M − 1, probabilistically symmetric
 * coverage interval from the sorted values, and the shortest coverage interval. Validation of a GUM
 * result (JCGM 101 8.2): {@link validateGumResult}.
 */

import { EngineInputError } from '../radiometry/errors'

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

/** Inputs validated and compiled to flat arrays for the sampling loop ({@link compileInputs}). */
export interface CompiledInputs {
  kind: Int32Array
  centre: Float64Array
  width: Float64Array
  dof: Float64Array
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
 * @returns compiled inputs
 * @throws EngineInputError (`inputs`, `inputs[i].value`, `.distribution`, `.standardUncertainty`,
 *   `.halfWidth`, `.coverageFactor`, `.resolution`, `.scale`, `.dof`)
 * @example compileInputs([{ name: 'T_s', distribution: 'normal', value: 373.15, standardUncertainty: 0.025 }])
 */
export function compileInputs(inputs: readonly MonteCarloInput[]): CompiledInputs {
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
  return out
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
    for (let i = 0; i < n; i++) {
      const mu = c.centre[i]!
      const a = c.width[i]!
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
 * @returns model values, length end − start, output unit
 * @throws EngineInputError (`inputs…`, `seed`, `start`, `end`)
 * @example runMonteCarloChunk(x => x[0] + x[1], inputs, 1, 0, 1000).length === 1000
 */
export function runMonteCarloChunk(
  model: MonteCarloModel,
  inputs: readonly MonteCarloInput[] | CompiledInputs,
  seed: number,
  start: number,
  end: number,
): Float64Array {
  const c = 'kind' in inputs && inputs.kind instanceof Int32Array ? (inputs as CompiledInputs) : compileInputs(inputs as readonly MonteCarloInput[])
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
  /** Number of trials M (default 10⁶; at least 2, at most 10⁸). */
  trials?: number
  /** Seed, integer 0 … 2³² − 1 (default 1). */
  seed?: number
  /** Coverage probability p (default 0.95). */
  coverageProbability?: number
  /** Trials per chunk between progress reports (default 65536). */
  chunkTrials?: number
  /** Called after each chunk with (trials done, trials in total). */
  onProgress?: (done: number, total: number) => void
}

/** Result of {@link runMonteCarlo}: the summary plus the run's parameters. */
export interface MonteCarloResult extends MonteCarloSummary {
  seed: number
}

function checkTrials(trials: unknown): number {
  if (typeof trials !== 'number' || !Number.isInteger(trials) || trials < 2 || trials > 1e8) {
    throw new EngineInputError('trials', `must be an integer from 2 to 100000000, got ${String(trials)}`)
  }
  return trials
}

/**
 * Propagates the input distributions through the model in M trials on the calling thread, chunk by
 * chunk (JCGM 101 7.2–7.7), and summarises the output. For 10⁶ trials of the reading model this takes
 * about a second: run it off the request thread (see ./montecarloWorker) or use
 * {@link runMonteCarloAsync}.
 * @param model - y = f(x), output unit
 * @param inputs - input distributions
 * @param options - trials (default 10⁶), seed (default 1), coverageProbability (default 0.95), chunkTrials, onProgress
 * @returns mean, u(y), coverage intervals, M, seed
 * @throws EngineInputError (`inputs…`, `trials`, `seed`, `coverageProbability`)
 * @example runMonteCarlo(x => x[0] + x[1] + x[2] + x[3], four N(0,1) inputs).standardUncertainty ≈ 2
 */
export function runMonteCarlo(model: MonteCarloModel, inputs: readonly MonteCarloInput[], options: MonteCarloOptions = {}): MonteCarloResult {
  const c = compileInputs(inputs)
  const M = checkTrials(options.trials ?? 1_000_000)
  const seed = checkSeed(options.seed ?? 1)
  const chunk = Math.max(MC_BLOCK_SIZE, Math.floor(options.chunkTrials ?? 65536))
  const values = new Float64Array(M)
  for (let s = 0; s < M; s += chunk) {
    const e = Math.min(M, s + chunk)
    values.set(runMonteCarloChunk(model, c, seed, s, e), s)
    options.onProgress?.(e, M)
  }
  return { ...summarizeMonteCarlo(values, options.coverageProbability ?? 0.95), seed }
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
  const c = compileInputs(inputs)
  const M = checkTrials(options.trials ?? 1_000_000)
  const seed = checkSeed(options.seed ?? 1)
  const chunk = Math.max(MC_BLOCK_SIZE, Math.floor(options.chunkTrials ?? 65536))
  const values = new Float64Array(M)
  for (let s = 0; s < M; s += chunk) {
    const e = Math.min(M, s + chunk)
    values.set(runMonteCarloChunk(model, c, seed, s, e), s)
    options.onProgress?.(e, M)
    await new Promise<void>((resolve) => setTimeout(resolve, 0))
  }
  return { ...summarizeMonteCarlo(values, options.coverageProbability ?? 0.95), seed }
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
