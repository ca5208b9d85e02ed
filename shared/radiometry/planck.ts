/**
 * Planck's law: spectral radiance, band radiance (rectangular and tabulated spectral responsivity)
 * and their temperature derivatives.
 *
 * Units used throughout the engine and the API:
 * - wavelength λ in micrometres (µm);
 * - temperature T in kelvins (K);
 * - spectral radiance L(λ,T) in W·m⁻²·sr⁻¹·µm⁻¹ (per micrometre, so that ∫ L dλ over λ in µm is
 *   a radiance in W·m⁻²·sr⁻¹);
 * - band radiance ("signal") S(T) = ∫ R(λ) L(λ,T) dλ in W·m⁻²·sr⁻¹, R the relative spectral
 *   responsivity (dimensionless; 1 inside a rectangular band, 0 outside);
 * - dS/dT in W·m⁻²·sr⁻¹·K⁻¹.
 *
 * Methods:
 * - Rectangular band: S = (c1L/c2⁴)·T⁴·∫ t³/(eᵗ−1) dt between t = c2/(λ2T) and c2/(λ1T), which with
 *   CODATA 2018 constants is (σT⁴/π)·[F(0→λ2T) − F(0→λ1T)]. The incomplete integrals come from
 *   piecewise Chebyshev polynomials (./bandIntegral) built at load time from the Widger–Woodall
 *   series (Bull. Am. Meteorol. Soc. 57:1217, 1976) and a Bernoulli power series (./series), and
 *   agreeing with them to ~1e-15: no loop and no exponential per call below c2/(λT) = 40.
 * - Tabulated band (piecewise-linear R between table points, zero outside the table): on each segment
 *   R = rᵢ + βᵢ(λ − λᵢ), so ∫R L dλ needs only ∫L dλ and ∫λ L dλ over the segment; the latter is
 *   (c1L/c2³)·T³·∫ t²/(eᵗ−1) dt. Both have the same kind of series, so the tabulated band is computed
 *   in closed form (exact for the piecewise-linear responsivity, to ~1e-13 relative). A segment
 *   narrower than 2 % of its wavelength (over which c2/(λT) changes by less than 1) is integrated by
 *   8-point Gauss–Legendre instead, which is exact to rounding there, because the closed form would
 *   subtract nearly equal numbers. An independent
 *   adaptive Gauss–Kronrod (7/15-point) quadrature, {@link bandRadianceQuadrature}, converged to a
 *   stated relative tolerance (default 1e-9), is provided as a cross-check and is tested against it.
 * - dS/dT: differentiating under the integral in t-form gives closed forms (Leibniz rule), e.g.
 *   rectangular dS/dT = (c1L/c2⁴)·T³·[4·D − x1⁴/(e^x1 − 1) + x2⁴/(e^x2 − 1)].
 *
 * Functions that depend on c2 take `constants` (default CODATA 2018; `'ITS-90'` for c2 = 0.014388 m·K).
 *
 * Wavelengths are vacuum wavelengths, as in Planck's law and in the ITS-90 radiometric definition,
 * unless a band says `medium: 'air'`: its wavelengths (edges or table points) are then wavelengths in
 * air and are converted once, λ_vac = n·λ_air, with n = `refractiveIndex` (default
 * {@link STANDARD_AIR_REFRACTIVE_INDEX}), before anything is computed. Only the wavelength scale is
 * converted; the relative responsivity values are kept, so an air band [λ1, λ2] gives exactly the
 * vacuum band [n·λ1, n·λ2].
 */

import { CODATA_2018, resolveConstants, type RadiationConstants, type RadiationConstantsChoice } from './constants'
import { EngineInputError, requireTemperature } from './errors'
import { bandIntegral3, bandIntegral3WithBracket } from './bandIntegral'
import { between2, between3, between3WithBracket, boundary3, boundary4, headPow3, SERIES_SWITCH_X, tailExp3, Z3 } from './series'

/**
 * Refractive index of standard air used to convert wavelengths in air to vacuum, λ_vac = n·λ_air,
 * when a band says `medium: 'air'` without its own `refractiveIndex`. Value 1.00028. Source: Ciddor's
 * dispersion formula for standard air (P. E. Ciddor, Appl. Opt. 35, 1566 (1996); dry air, 15 °C,
 * 101.325 kPa, 450 ppm CO₂): (n − 1)·10⁸ = 5792105/(238.0185 − σ²) + 167917/(57.362 − σ²), σ = 1/λ in
 * µm⁻¹, gives n − 1 = 2.763e-4 at 0.65 µm and 2.732e-4 at 1.6 µm (the formula is stated for
 * 0.23–1.69 µm; its long-wave limit is 2.726e-4). 1.00028 rounds these; the difference, below 1e-5
 * relative in a band edge, is far below the uncertainty of any band specification. Give
 * `refractiveIndex` for other conditions.
 * @example a 0.65 µm wavelength in air is 0.650182 µm in vacuum
 */
export const STANDARD_AIR_REFRACTIVE_INDEX = 1.00028

/** Medium in which a band's wavelengths are stated: vacuum (default) or air. */
export type WavelengthMedium = 'vacuum' | 'air'

/** A band with unit responsivity from λ1 to λ2 (µm) and zero outside. */
export interface RectangularBand {
  readonly kind: 'rectangular'
  /** Short-wavelength edge λ1, µm (> 0). */
  readonly lambda1Um: number
  /** Long-wavelength edge λ2, µm (> λ1). */
  readonly lambda2Um: number
  /** Medium of the stated wavelengths (default 'vacuum'); 'air' converts them by λ_vac = n·λ_air. */
  readonly medium?: WavelengthMedium
  /** n of the air, only with medium 'air' (default {@link STANDARD_AIR_REFRACTIVE_INDEX}); 1 ≤ n < 1.01. */
  readonly refractiveIndex?: number
}

/**
 * A measured relative spectral responsivity: points [λ in µm, relative response ≥ 0], wavelengths
 * strictly increasing, at least two points; linear between points and zero outside the table.
 */
export interface TabulatedBand {
  readonly kind: 'tabulated'
  readonly points: ReadonlyArray<readonly [number, number]>
  /** Medium of the table's wavelengths (default 'vacuum'); 'air' converts them by λ_vac = n·λ_air. */
  readonly medium?: WavelengthMedium
  /** n of the air, only with medium 'air' (default {@link STANDARD_AIR_REFRACTIVE_INDEX}); 1 ≤ n < 1.01. */
  readonly refractiveIndex?: number
}

/** A spectral band as accepted by the API (`band` field). */
export type Band = RectangularBand | TabulatedBand

/**
 * A band validated once and pre-processed for fast repeated evaluation (typed arrays, per-band
 * moments, scratch space). Create with {@link prepareBand}; every function that takes a `Band` also
 * takes a `PreparedBand`. Not safe to share between concurrently running threads (it owns scratch
 * arrays), but each worker can prepare its own.
 */
export class PreparedBand {
  /** The band kind. */
  readonly kind: 'rectangular' | 'tabulated'
  /** Lower edge of the support, µm. */
  readonly lambda1Um: number
  /** Upper edge of the support, µm. */
  readonly lambda2Um: number
  /** Table wavelengths, µm (for a rectangular band: [λ1, λ2]). */
  readonly lambdaUm: Float64Array
  /** Table responses (for a rectangular band: [1, 1]). */
  readonly response: Float64Array
  /** Slope of the response in each segment, µm⁻¹ (length n − 1). */
  readonly slope: Float64Array
  /** ∫R dλ, µm: the equivalent width of the band. */
  readonly integratedResponseUm: number
  /** Responsivity-weighted mean wavelength λ0 = ∫λR dλ / ∫R dλ, µm. */
  readonly meanWavelengthUm: number
  /** Responsivity-weighted standard deviation of wavelength σλ, µm (Δλ/√12 for a rectangular band). */
  readonly standardDeviationUm: number
  /** The band as given (validated). */
  readonly source: Band
  /** @internal scratch: per-node values of the t³ and t² integrals and boundary terms */
  readonly scratch: {
    readonly x: Float64Array
    readonly v3: Float64Array
    readonly v2: Float64Array
    readonly g4: Float64Array
    readonly g3: Float64Array
    readonly pow: Uint8Array
  }

  /** @internal use {@link prepareBand} */
  constructor(source: Band, lambdaUm: Float64Array, response: Float64Array) {
    this.source = source
    this.kind = source.kind
    this.lambdaUm = lambdaUm
    this.response = response
    const n = lambdaUm.length
    this.lambda1Um = lambdaUm[0]!
    this.lambda2Um = lambdaUm[n - 1]!
    this.slope = new Float64Array(n - 1)
    let w = 0
    let m1 = 0
    for (let i = 0; i < n - 1; i++) {
      const a = lambdaUm[i]!
      const b = lambdaUm[i + 1]!
      const ra = response[i]!
      const rb = response[i + 1]!
      const d = b - a
      this.slope[i] = (rb - ra) / d
      w += ((ra + rb) * d) / 2
      m1 += (d * (ra * (2 * a + b) + rb * (a + 2 * b))) / 6
    }
    const mean = m1 / w
    // second central moment, exact for piecewise-linear R, computed about the mean
    let m2 = 0
    for (let i = 0; i < n - 1; i++) {
      const a = lambdaUm[i]! - mean
      const b = lambdaUm[i + 1]! - mean
      const ra = response[i]!
      const rb = response[i + 1]!
      const d = b - a
      m2 += (d * (ra * (3 * a * a + 2 * a * b + b * b) + rb * (a * a + 2 * a * b + 3 * b * b))) / 12
    }
    this.integratedResponseUm = w
    this.meanWavelengthUm = mean
    this.standardDeviationUm = Math.sqrt(Math.max(m2 / w, 0))
    this.scratch = {
      x: new Float64Array(n),
      v3: new Float64Array(n),
      v2: new Float64Array(n),
      g4: new Float64Array(n),
      g3: new Float64Array(n),
      pow: new Uint8Array(n),
    }
  }
}

/**
 * Factor n that turns the band's stated wavelengths into vacuum wavelengths (1 for a vacuum band or a
 * PreparedBand, whose wavelengths are already in vacuum), validating `medium` and `refractiveIndex`.
 * @param band - band as given, or a PreparedBand
 * @returns n, dimensionless (≥ 1)
 * @throws EngineInputError (`band.medium`, `band.refractiveIndex`)
 * @example vacuumWavelengthFactor({ kind: 'rectangular', lambda1Um: 8, lambda2Um: 14, medium: 'air' }) === 1.00028
 */
export function vacuumWavelengthFactor(band: Band | PreparedBand): number {
  if (band instanceof PreparedBand) return 1
  const { medium, refractiveIndex: n } = band as { medium?: unknown, refractiveIndex?: unknown }
  if (medium === undefined || medium === 'vacuum') {
    if (n !== undefined) throw new EngineInputError('band.refractiveIndex', "is only used with medium 'air' (wavelengths in vacuum need no conversion)")
    return 1
  }
  if (medium !== 'air') throw new EngineInputError('band.medium', `must be 'vacuum' or 'air', got ${String(medium)}`)
  if (n === undefined) return STANDARD_AIR_REFRACTIVE_INDEX
  if (typeof n !== 'number' || !Number.isFinite(n) || n < 1 || n >= 1.01) {
    throw new EngineInputError('band.refractiveIndex', `must be a refractive index of air, 1 ≤ n < 1.01, got ${String(n)}`)
  }
  return n
}

/**
 * @internal True for a plain band that is best prepared once before repeated evaluation: a table, or
 * wavelengths in air (converted to vacuum by {@link prepareBand}).
 */
export function needsPreparing(band: Band | PreparedBand): band is Band {
  return typeof band === 'object' && band !== null && !(band instanceof PreparedBand) && (band.kind === 'tabulated' || inAir(band))
}

/** True for a plain band whose wavelengths need converting to vacuum (medium 'air'). */
function inAir(band: Band | PreparedBand): boolean {
  return !(band instanceof PreparedBand) && (band as { medium?: unknown }).medium === 'air'
}

function validateRectangular(band: RectangularBand): void {
  vacuumWavelengthFactor(band)
  const l1 = band.lambda1Um
  const l2 = band.lambda2Um
  if (typeof l1 !== 'number' || !Number.isFinite(l1) || l1 <= 0) {
    throw new EngineInputError('band.lambda1Um', `must be a finite wavelength above 0 µm, got ${String(l1)}`)
  }
  if (typeof l2 !== 'number' || !Number.isFinite(l2)) {
    throw new EngineInputError('band.lambda2Um', `must be a finite wavelength in µm, got ${String(l2)}`)
  }
  if (l2 <= l1) {
    throw new EngineInputError('band.lambda2Um', `must be greater than lambda1Um (${l1} µm), got ${l2} µm`)
  }
}

function tableArrays(band: TabulatedBand): [Float64Array, Float64Array] {
  const pts: unknown = band.points
  if (!Array.isArray(pts) || pts.length < 2) {
    throw new EngineInputError('band.points', 'needs at least two [wavelength µm, relative response] points')
  }
  const n = pts.length
  const lam = new Float64Array(n)
  const r = new Float64Array(n)
  let anyPositive = false
  for (let i = 0; i < n; i++) {
    const p: unknown = pts[i]
    if (!Array.isArray(p) || p.length !== 2) {
      throw new EngineInputError('band.points', `point ${i} must be a pair [wavelength µm, relative response]`)
    }
    const l: unknown = p[0]
    const v: unknown = p[1]
    if (typeof l !== 'number' || !Number.isFinite(l) || l <= 0) {
      throw new EngineInputError('band.points', `point ${i}: wavelength must be a finite number above 0 µm, got ${String(l)}`)
    }
    if (typeof v !== 'number' || !Number.isFinite(v) || v < 0) {
      throw new EngineInputError('band.points', `point ${i}: relative response must be a finite number ≥ 0, got ${String(v)}`)
    }
    if (i > 0 && l <= lam[i - 1]!) {
      throw new EngineInputError('band.points', `wavelengths must be strictly increasing: point ${i} (${l} µm) follows ${lam[i - 1]} µm`)
    }
    lam[i] = l
    r[i] = v
    if (v > 0) anyPositive = true
  }
  if (!anyPositive) throw new EngineInputError('band.points', 'at least one relative response must be above zero')
  return [lam, r]
}

/**
 * Validates a band and pre-processes it for repeated evaluation (do this once per band when
 * evaluating many temperatures, e.g. in an inversion or a Monte Carlo run).
 * @param band - `{ kind: 'rectangular', lambda1Um, lambda2Um }` (µm) or
 *   `{ kind: 'tabulated', points: [[λ µm, relative response], …] }`; a PreparedBand is returned as is
 * @returns the prepared band
 * @throws EngineInputError with field `band`, `band.lambda1Um`, `band.lambda2Um` or `band.points`
 * @example prepareBand({ kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 }).meanWavelengthUm === 11
 */
export function prepareBand(band: Band | PreparedBand): PreparedBand {
  if (band instanceof PreparedBand) return band
  if (typeof band !== 'object' || band === null) throw new EngineInputError('band', 'must be an object with a kind')
  if (band.kind === 'rectangular') {
    validateRectangular(band)
    const n = vacuumWavelengthFactor(band)
    const medium = n === 1 && !inAir(band) ? {} : { medium: 'air' as const, refractiveIndex: n }
    return new PreparedBand(
      { kind: 'rectangular', lambda1Um: band.lambda1Um, lambda2Um: band.lambda2Um, ...medium },
      Float64Array.of(band.lambda1Um * n, band.lambda2Um * n),
      Float64Array.of(1, 1),
    )
  }
  if (band.kind === 'tabulated') {
    const n = vacuumWavelengthFactor(band)
    const [lam, r] = tableArrays(band)
    const copy: [number, number][] = []
    for (let i = 0; i < lam.length; i++) copy.push([lam[i]!, r[i]!])
    const medium = n === 1 && !inAir(band) ? {} : { medium: 'air' as const, refractiveIndex: n }
    if (n !== 1) for (let i = 0; i < lam.length; i++) lam[i] = lam[i]! * n
    return new PreparedBand({ kind: 'tabulated', points: copy, ...medium }, lam, r)
  }
  throw new EngineInputError('band', `unknown band kind '${String((band as { kind?: unknown }).kind)}'; use 'rectangular' or 'tabulated'`)
}

/**
 * Validates a band without keeping a prepared copy (cheap for rectangular bands).
 * @param band - band to check
 * @throws EngineInputError naming the field at fault
 */
export function validateBand(band: Band | PreparedBand): void {
  if (band instanceof PreparedBand) return
  if (typeof band === 'object' && band !== null && band.kind === 'rectangular') validateRectangular(band)
  else prepareBand(band)
}

// ---------------------------------------------------------------------------------------------
// Spectral radiance

/**
 * Planck spectral radiance of a blackbody per unit wavelength,
 * L(λ,T) = c1L·λ⁻⁵ / (exp(c2/(λT)) − 1) (Planck 1901), in vacuum.
 * @param lambdaUm - wavelength λ, µm (> 0)
 * @param temperatureK - temperature T, K (> 0)
 * @param constants - radiation constants (default CODATA 2018)
 * @returns spectral radiance, W·m⁻²·sr⁻¹·µm⁻¹
 * @throws EngineInputError (`lambdaUm`, `temperatureK`)
 * @example spectralRadiance(10, 300) ≈ 9.924 W·m⁻²·sr⁻¹·µm⁻¹
 */
export function spectralRadiance(lambdaUm: number, temperatureK: number, constants?: RadiationConstantsChoice): number {
  if (typeof lambdaUm !== 'number' || !Number.isFinite(lambdaUm) || lambdaUm <= 0) {
    throw new EngineInputError('lambdaUm', `must be a finite wavelength above 0 µm, got ${String(lambdaUm)}`)
  }
  requireTemperature(temperatureK, 'temperatureK')
  const c = resolveConstants(constants)
  return spectralRadianceUnchecked(lambdaUm, temperatureK, c)
}

/** @internal Planck spectral radiance with validated inputs, W·m⁻²·sr⁻¹·µm⁻¹. */
export function spectralRadianceUnchecked(lambdaUm: number, temperatureK: number, c: RadiationConstants): number {
  const l2 = lambdaUm * lambdaUm
  return c.c1LUm / (l2 * l2 * lambdaUm * Math.expm1(c.c2UmK / (lambdaUm * temperatureK)))
}

/**
 * Temperature derivative of Planck spectral radiance,
 * ∂L/∂T = L · (x eˣ/(eˣ − 1)) / T with x = c2/(λT).
 * @param lambdaUm - wavelength, µm (> 0)
 * @param temperatureK - temperature, K (> 0)
 * @param constants - radiation constants (default CODATA 2018)
 * @returns ∂L/∂T, W·m⁻²·sr⁻¹·µm⁻¹·K⁻¹
 * @example spectralRadianceDerivative(10, 300) ≈ 0.15997 W·m⁻²·sr⁻¹·µm⁻¹·K⁻¹
 */
export function spectralRadianceDerivative(lambdaUm: number, temperatureK: number, constants?: RadiationConstantsChoice): number {
  const L = spectralRadiance(lambdaUm, temperatureK, constants)
  const c = resolveConstants(constants)
  const x = c.c2UmK / (lambdaUm * temperatureK)
  const ex = Math.exp(-x)
  return (L * x) / (temperatureK * (1 - ex))
}

/**
 * Blackbody fraction F(0→λT): the share of the total blackbody radiance emitted at wavelengths
 * below λ, F = (15/π⁴) ∫ₓ^∞ t³/(eᵗ−1) dt with x = c2/(λT) (Widger & Woodall 1976 series).
 * @param lambdaTUmK - product λT, µm·K (> 0)
 * @param constants - radiation constants (default CODATA 2018)
 * @returns fraction, dimensionless in [0, 1]
 * @throws EngineInputError (`lambdaTUmK`)
 * @example blackbodyFraction(2898) ≈ 0.2501 (handbook tables)
 */
export function blackbodyFraction(lambdaTUmK: number, constants?: RadiationConstantsChoice): number {
  if (typeof lambdaTUmK !== 'number' || !Number.isFinite(lambdaTUmK) || lambdaTUmK <= 0) {
    throw new EngineInputError('lambdaTUmK', `must be a finite product λT above 0 µm·K, got ${String(lambdaTUmK)}`)
  }
  const c = resolveConstants(constants)
  const x = c.c2UmK / lambdaTUmK
  if (x >= SERIES_SWITCH_X) return tailExp3(x) / Z3
  return 1 - headPow3(x) / Z3
}

/**
 * Total radiance of a blackbody, σT⁴/π (Stefan–Boltzmann law), with σ from CODATA 2018 h, c, k
 * for the default constants and (π⁴/15)·c1L/c2⁴ for another c2.
 * @param temperatureK - temperature, K (> 0)
 * @param constants - radiation constants (default CODATA 2018)
 * @returns radiance, W·m⁻²·sr⁻¹
 * @example totalRadiance(300) ≈ 146.2 W·m⁻²·sr⁻¹
 */
export function totalRadiance(temperatureK: number, constants?: RadiationConstantsChoice): number {
  requireTemperature(temperatureK, 'temperatureK')
  const c = resolveConstants(constants)
  const t2 = temperatureK * temperatureK
  return c.bandCoefficient * Z3 * t2 * t2
}

// ---------------------------------------------------------------------------------------------
// Band radiance: internal evaluators (validated inputs, no allocation)

/**
 * @internal Rectangular band radiance, W·m⁻²·sr⁻¹, from the piecewise-polynomial band integral of
 * ./bandIntegral (≈ 2× faster than the series; same accuracy to a few ulp).
 */
export function rectangularRadiance(l1: number, l2: number, T: number, c: RadiationConstants): number {
  const xa = c.c2UmK / (l1 * T)
  const xb = c.c2UmK / (l2 * T)
  const t2 = T * T
  return c.bandCoefficient * t2 * t2 * bandIntegral3(xa, xb)
}

/**
 * @internal Rectangular band radiance and dS/dT together (shares the panel look-ups), written to
 * out[0], out[1].
 */
export function rectangularRadianceAndDerivative(
  l1: number,
  l2: number,
  T: number,
  c: RadiationConstants,
  out: Float64Array,
): void {
  bandIntegral3WithBracket(c.c2UmK / (l1 * T), c.c2UmK / (l2 * T), out)
  const k = c.bandCoefficient * T * T * T
  out[0] = k * T * out[0]!
  out[1] = k * out[1]!
}

/**
 * @internal The previous rectangular evaluator, kept for comparison in tests and the engine benchmark
 * only: the Widger–Woodall and Bernoulli series of ./series summed at every call. W·m⁻²·sr⁻¹.
 */
export function rectangularRadianceSeries(l1: number, l2: number, T: number, c: RadiationConstants): number {
  const xa = c.c2UmK / (l1 * T)
  const xb = c.c2UmK / (l2 * T)
  const t2 = T * T
  return c.bandCoefficient * t2 * t2 * between3(xa, xb)
}

/** @internal The previous S and dS/dT evaluator by the series (tests and benchmark only), into out[0], out[1]. */
export function rectangularRadianceAndDerivativeSeries(
  l1: number,
  l2: number,
  T: number,
  c: RadiationConstants,
  out: Float64Array,
): void {
  between3WithBracket(c.c2UmK / (l1 * T), c.c2UmK / (l2 * T), out)
  const k = c.bandCoefficient * T * T * T
  out[0] = k * T * out[0]!
  out[1] = k * out[1]!
}

/** @internal Tabulated band radiance and (if wanted) dS/dT into out[0], out[1]. */
export function tabulatedRadianceAndDerivative(
  band: PreparedBand,
  T: number,
  c: RadiationConstants,
  wantDerivative: boolean,
  out: Float64Array,
): void {
  const lam = band.lambdaUm
  const r = band.response
  const beta = band.slope
  const n = lam.length
  const { x, g4, g3 } = band.scratch
  for (let j = 0; j < n; j++) {
    const xj = c.c2UmK / (lam[j]! * T)
    x[j] = xj
    if (wantDerivative) {
      g4[j] = boundary4(xj)
      g3[j] = boundary3(xj)
    }
  }
  const T2 = T * T
  const T3 = T2 * T
  const k0 = c.bandCoefficient * T3 // × T for radiance
  const k1 = c.momentCoefficient * T2 * 1e6 // × T for the λ-moment in µm·W·m⁻²·sr⁻¹
  let s = 0
  let ds = 0
  for (let i = 0; i < n - 1; i++) {
    const xa = x[i]!
    const xb = x[i + 1]!
    const b = beta[i]!
    const li = lam[i]!
    if (lam[i + 1]! - li < NARROW_SEGMENT * li && xa - xb < 1) {
      // narrow segment: the closed form would subtract nearly equal series values (losing about
      // log10(λ/Δλ) digits); 8-point Gauss–Legendre is exact to rounding here (Δx < 1)
      const half = (lam[i + 1]! - li) / 2
      const mid = li + half
      const ri = r[i]!
      for (let j = 0; j < 8; j++) {
        const l = mid + half * GL8_X[j]!
        const w = half * GL8_W[j]! * (ri + b * (l - li))
        const xl = c.c2UmK / (l * T)
        const l2 = l * l
        const L = c.c1LUm / (l2 * l2 * l * Math.expm1(xl))
        s += w * L
        if (wantDerivative) ds += (w * L * xl) / (T * -Math.expm1(-xl))
      }
      continue
    }
    const d3 = between3(xa, xb)
    const a0 = r[i]! - b * li // R = a0 + b·λ on this segment
    const d2 = b !== 0 ? between2(xa, xb) : 0
    // ∫L = k0·T·d3 ; ∫λL = k1·T·d2
    s += a0 * k0 * T * d3 + b * k1 * T * d2
    if (wantDerivative) {
      const dd3 = k0 * (4 * d3 - g4[i]! + g4[i + 1]!)
      const dd2 = b !== 0 ? k1 * (3 * d2 - g3[i]! + g3[i + 1]!) : 0
      ds += a0 * dd3 + b * dd2
    }
  }
  out[0] = s
  out[1] = ds
}

const SCRATCH = new Float64Array(2)

/** Segments narrower than this fraction of their wavelength are integrated by Gauss–Legendre. */
const NARROW_SEGMENT = 0.02
// 8-point Gauss–Legendre nodes and weights on [−1, 1] (Abramowitz & Stegun, Table 25.4)
const GL8_X = [
  -0.9602898564975363, -0.7966664774136267, -0.525532409916329, -0.1834346424956498, 0.1834346424956498, 0.525532409916329,
  0.7966664774136267, 0.9602898564975363,
]
const GL8_W = [
  0.1012285362903763, 0.2223810344533745, 0.3137066458778873, 0.362683783378362, 0.362683783378362, 0.3137066458778873,
  0.2223810344533745, 0.1012285362903763,
]

/** @internal Band radiance with validated band and temperature. */
export function bandRadianceUnchecked(band: Band | PreparedBand, T: number, c: RadiationConstants): number {
  if (band.kind === 'rectangular') {
    if (inAir(band)) {
      const n = vacuumWavelengthFactor(band)
      return rectangularRadiance(band.lambda1Um * n, band.lambda2Um * n, T, c)
    }
    return rectangularRadiance(band.lambda1Um, band.lambda2Um, T, c)
  }
  const p = band instanceof PreparedBand ? band : prepareBand(band)
  tabulatedRadianceAndDerivative(p, T, c, false, SCRATCH)
  return SCRATCH[0]!
}

/** @internal Band radiance and derivative with validated inputs, into out[0], out[1]. */
export function bandRadianceAndDerivativeUnchecked(
  band: Band | PreparedBand,
  T: number,
  c: RadiationConstants,
  out: Float64Array,
): void {
  if (band.kind === 'rectangular') {
    const n = inAir(band) ? vacuumWavelengthFactor(band) : 1
    rectangularRadianceAndDerivative(band.lambda1Um * n, band.lambda2Um * n, T, c, out)
    return
  }
  const p = band instanceof PreparedBand ? band : prepareBand(band)
  tabulatedRadianceAndDerivative(p, T, c, true, out)
}

// ---------------------------------------------------------------------------------------------
// Band radiance: public API

/**
 * Band radiance (the ideal instrument signal) S(T) = ∫ R(λ) L(λ,T) dλ of a blackbody at T.
 * Rectangular band: closed form (see the module notes), ≈ 30–45 ns per call with the checks.
 * Tabulated band: closed-form series per linear segment (pass a {@link PreparedBand} to avoid
 * re-validating the table per call; for many temperatures in a range see ./signalTable).
 * @param band - rectangular band (µm) or tabulated responsivity, or a PreparedBand
 * @param temperatureK - blackbody temperature T, K (> 0)
 * @param constants - radiation constants (default CODATA 2018)
 * @returns S(T), W·m⁻²·sr⁻¹ (weighted by the relative responsivity)
 * @throws EngineInputError (`band…`, `temperatureK`)
 * @example bandRadiance({ kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 }, 373.15) ≈ 136.78 W·m⁻²·sr⁻¹
 */
export function bandRadiance(band: Band | PreparedBand, temperatureK: number, constants?: RadiationConstantsChoice): number {
  // fast path: a valid rectangular band in vacuum (plain or prepared) at a valid temperature;
  // anything else (wavelengths in air too) goes through the full checks below, which name the field at fault
  if (typeof band === 'object' && band !== null && band.kind === 'rectangular') {
    const l1 = band.lambda1Um
    const l2 = band.lambda2Um
    if (typeof l1 === 'number' && typeof l2 === 'number' && typeof temperatureK === 'number' &&
      l1 > 0 && l2 > l1 && l2 < Infinity && temperatureK > 0 && temperatureK < Infinity &&
      (band as { medium?: unknown }).medium === undefined && (band as { refractiveIndex?: unknown }).refractiveIndex === undefined) {
      return rectangularRadiance(l1, l2, temperatureK, constants === undefined ? CODATA_2018 : resolveConstants(constants))
    }
  }
  const b = checkedBand(band)
  requireTemperature(temperatureK, 'temperatureK')
  return bandRadianceUnchecked(b, temperatureK, resolveConstants(constants))
}

/** Validates a band once: a plain tabulated band is prepared (validation included), others checked. */
function checkedBand(band: Band | PreparedBand): Band | PreparedBand {
  if (typeof band === 'object' && band !== null && (band.kind === 'tabulated' || inAir(band)) && !(band instanceof PreparedBand)) return prepareBand(band)
  validateBand(band)
  return band
}

/**
 * Temperature derivative of band radiance dS/dT, in closed form (Leibniz rule on the t-integral).
 * @param band - rectangular band (µm) or tabulated responsivity, or a PreparedBand
 * @param temperatureK - blackbody temperature T, K (> 0)
 * @param constants - radiation constants (default CODATA 2018)
 * @returns dS/dT, W·m⁻²·sr⁻¹·K⁻¹
 * @throws EngineInputError (`band…`, `temperatureK`)
 * @example bandRadianceDerivative({ kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 }, 300) ≈ 0.8378 W·m⁻²·sr⁻¹·K⁻¹
 */
export function bandRadianceDerivative(band: Band | PreparedBand, temperatureK: number, constants?: RadiationConstantsChoice): number {
  if (typeof band === 'object' && band !== null && band.kind === 'rectangular') {
    const l1 = band.lambda1Um
    const l2 = band.lambda2Um
    if (typeof l1 === 'number' && typeof l2 === 'number' && typeof temperatureK === 'number' &&
      l1 > 0 && l2 > l1 && l2 < Infinity && temperatureK > 0 && temperatureK < Infinity &&
      (band as { medium?: unknown }).medium === undefined && (band as { refractiveIndex?: unknown }).refractiveIndex === undefined) {
      rectangularRadianceAndDerivative(l1, l2, temperatureK, constants === undefined ? CODATA_2018 : resolveConstants(constants), SCRATCH)
      return SCRATCH[1]!
    }
  }
  const b = checkedBand(band)
  requireTemperature(temperatureK, 'temperatureK')
  bandRadianceAndDerivativeUnchecked(b, temperatureK, resolveConstants(constants), SCRATCH)
  return SCRATCH[1]!
}

// ---------------------------------------------------------------------------------------------
// Adaptive Gauss–Kronrod quadrature (cross-check)

// 15-point Kronrod nodes and weights, with the embedded 7-point Gauss weights (QUADPACK qk15,
// Piessens et al. 1983), to double precision.
const XGK = [
  0.9914553711208126, 0.9491079123427585, 0.8648644233597691,
  0.7415311855993945, 0.5860872354676911, 0.4058451513773972,
  0.20778495500789848, 0,
]
const WGK = [
  0.022935322010529224, 0.06309209262997856, 0.10479001032225019,
  0.14065325971552592, 0.1690047266392679, 0.19035057806478542,
  0.20443294007529889, 0.20948214108472782,
]
const WG = [0.1294849661688697, 0.27970539148927664, 0.3818300505051189, 0.4179591836734694]

/** Result of {@link bandRadianceQuadrature}. */
export interface QuadratureResult {
  /** Estimate of S(T), W·m⁻²·sr⁻¹. */
  value: number
  /** Sum over sub-intervals of |K15 − G7|, W·m⁻²·sr⁻¹ (a conservative error bound). */
  errorEstimate: number
  /** Number of sub-intervals used. */
  intervals: number
  /** True when errorEstimate ≤ relativeTolerance·|value|. */
  converged: boolean
}

/**
 * Band radiance by globally adaptive Gauss–Kronrod (G7/K15) quadrature of R(λ)·L(λ,T) over each
 * linear segment of the responsivity (the integrand is smooth within a segment). The interval with
 * the largest |K15 − G7| is bisected until Σ|K15 − G7| ≤ relativeTolerance·|S| (the raw
 * Gauss–Kronrod difference, not QUADPACK's scaled estimate, so the bound is conservative; the
 * actual error is usually far smaller). Slower than {@link bandRadiance}; kept as an independent
 * check and for responsivity models that are not piecewise linear.
 * @param band - band or PreparedBand
 * @param temperatureK - temperature, K (> 0)
 * @param options - `relativeTolerance` (default 1e-9), `maxIntervals` (default 20000), `constants`
 * @returns value (W·m⁻²·sr⁻¹), error estimate, interval count, convergence flag
 * @example bandRadianceQuadrature({ kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 }, 300).value ≈ bandRadiance(same)
 */
export function bandRadianceQuadrature(
  band: Band | PreparedBand,
  temperatureK: number,
  options: { relativeTolerance?: number; maxIntervals?: number; constants?: RadiationConstantsChoice } = {},
): QuadratureResult {
  const p = prepareBand(band)
  requireTemperature(temperatureK, 'temperatureK')
  const c = resolveConstants(options.constants)
  const tol = options.relativeTolerance ?? 1e-9
  if (!(tol > 0 && Number.isFinite(tol))) throw new EngineInputError('relativeTolerance', 'must be a positive finite number')
  const maxIntervals = options.maxIntervals ?? 20000
  const T = temperatureK
  const lam = p.lambdaUm
  const r = p.response
  const beta = p.slope

  const lo: number[] = []
  const hi: number[] = []
  const seg: number[] = []
  const val: number[] = []
  const err: number[] = []

  const gk = (a: number, b: number, i: number): [number, number] => {
    const mid = (a + b) / 2
    const half = (b - a) / 2
    const f = (l: number): number => (r[i]! + beta[i]! * (l - lam[i]!)) * spectralRadianceUnchecked(l, T, c)
    const fc = f(mid)
    let resK = fc * WGK[7]!
    let resG = fc * WG[3]!
    for (let j = 0; j < 7; j++) {
      const dx = half * XGK[j]!
      const f1 = f(mid - dx)
      const f2 = f(mid + dx)
      resK += WGK[j]! * (f1 + f2)
      if (j % 2 === 1) resG += WG[(j - 1) / 2]! * (f1 + f2)
    }
    return [resK * half, Math.abs((resK - resG) * half)]
  }

  for (let i = 0; i < lam.length - 1; i++) {
    const [v, e] = gk(lam[i]!, lam[i + 1]!, i)
    lo.push(lam[i]!)
    hi.push(lam[i + 1]!)
    seg.push(i)
    val.push(v)
    err.push(e)
  }
  const sum = (a: number[]): number => {
    let s = 0
    for (const v of a) s += v
    return s
  }
  let total = sum(val)
  let totalErr = sum(err)
  while (totalErr > tol * Math.abs(total) && lo.length < maxIntervals) {
    let k = 0
    for (let j = 1; j < err.length; j++) if (err[j]! > err[k]!) k = j
    const a = lo[k]!
    const b = hi[k]!
    const m = (a + b) / 2
    const i = seg[k]!
    const [v1, e1] = gk(a, m, i)
    const [v2, e2] = gk(m, b, i)
    hi[k] = m
    val[k] = v1
    err[k] = e1
    lo.push(m)
    hi.push(b)
    seg.push(i)
    val.push(v2)
    err.push(e2)
    total = sum(val)
    totalErr = sum(err)
  }
  return { value: total, errorEstimate: totalErr, intervals: lo.length, converged: totalErr <= tol * Math.abs(total) }
}
