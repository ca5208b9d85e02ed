/**
 * Temperature from band radiance: the inverse of S(T) = ∫ R(λ) L(λ,T) dλ.
 *
 * Band radiance has no closed-form inverse. The solver is a safeguarded Newton iteration on
 * g(u) = ln S(1/u) − ln S_target in the variable u = 1/T (in the Wien limit ln S is linear in 1/T,
 * so a monochromatic band converges in one step and a wide band in three or four). Each iterate
 * narrows a bracket [lo, hi]; a Newton step that leaves the bracket, or cannot be formed, is replaced
 * by a geometric bisection √(lo·hi). S(T) is strictly increasing, so the iteration always converges
 * and never diverges. The starting point is the Sakuma–Hattori approximation of the band (see
 * ./sakumaHattori), or the caller's guess.
 *
 * Stopping: the Newton step is below 2e-6·T. Newton's error after a step of relative size ε is
 * K·ε²·T with |K| ≤ ½ for ln S in 1/T (½ in the Rayleigh–Jeans limit, 0 in the Wien limit), so at
 * most 1e-8 K at 5000 K; or the bracket is narrower than 1e-12·T. Tested: T → S → T returns T within 1 µK for
 * rectangular and tabulated bands from 0.65 µm to 14 µm between 50 K and 5000 K.
 *
 * Range: 50 K to 5000 K by default ({@link INVERSION_RANGE_K}); a radiance outside
 * [S(min), S(max)] raises an {@link EngineInputError} naming the range.
 */

import { resolveConstants, type RadiationConstants, type RadiationConstantsChoice } from './constants'
import { EngineInputError } from './errors'
import {
  bandRadianceAndDerivativeUnchecked,
  bandRadianceUnchecked,
  PreparedBand,
  prepareBand,
  needsPreparing,
  vacuumWavelengthFactor,
  validateBand,
  type Band,
} from './planck'

/** Default temperature range of the inversion, K. */
export const INVERSION_RANGE_K: { readonly min: number; readonly max: number } = Object.freeze({ min: 50, max: 5000 })

/** Options for {@link temperatureFromRadiance}. */
export interface InversionOptions {
  /** Radiation constants (default CODATA 2018). */
  constants?: RadiationConstantsChoice
  /** Lowest temperature searched, K (default 50). */
  minTemperatureK?: number
  /** Highest temperature searched, K (default 5000). */
  maxTemperatureK?: number
  /** Starting temperature, K (default: the band's Sakuma–Hattori estimate). */
  initialTemperatureK?: number
}

const OUT = new Float64Array(2)

/**
 * @internal Starting temperature from the band's Sakuma–Hattori estimate
 * (A = λ0(1 − 6σ²/λ0²), B = c2σ²/(2λ0²), C = c1L·W·λ0⁻⁵·exp(15σ²/λ0²)); NaN if not formable.
 */
export function sakumaHattoriGuess(
  meanUm: number,
  sdUm: number,
  widthUm: number,
  signal: number,
  c: RadiationConstants,
): number {
  const q = (sdUm * sdUm) / (meanUm * meanUm)
  const A = meanUm * (1 - 6 * q)
  const B = (c.c2UmK * q) / 2
  const l2 = meanUm * meanUm
  const C = (c.c1LUm * widthUm * Math.exp(15 * q)) / (l2 * l2 * meanUm)
  return (c.c2UmK / Math.log1p(C / signal) - B) / A
}

/**
 * @internal Inversion with validated band and constants. `field` names the input reported in errors.
 */
export function invertUnchecked(
  band: Band | PreparedBand,
  signal: number,
  c: RadiationConstants,
  tMin: number,
  tMax: number,
  guess: number,
  field: string,
  guessSignal = Number.NaN,
  guessDerivative = Number.NaN,
): number {
  if (!(signal > 0) || !Number.isFinite(signal)) {
    throw new EngineInputError(field, `must be a finite radiance above 0 W·m⁻²·sr⁻¹, got ${String(signal)}`)
  }
  let lo = tMin
  let hi = tMax
  let loKnown = false // S(lo) < signal established
  let hiKnown = false // S(hi) > signal established
  let T = guess
  let known = guessSignal > 0 && guessDerivative > 0 // S and S' at the guess supplied by the caller
  if (!(T > lo && T < hi)) {
    T = Math.sqrt(lo * hi)
    known = false
  }
  const lnS = Math.log(signal)
  for (let iter = 0; iter < 200; iter++) {
    let s: number
    let ds: number
    if (known) {
      s = guessSignal
      ds = guessDerivative
      known = false
    } else {
      bandRadianceAndDerivativeUnchecked(band, T, c, OUT)
      s = OUT[0]!
      ds = OUT[1]!
    }
    if (s === signal) return T
    if (s < signal) {
      lo = T
      loKnown = true
    } else {
      hi = T
      hiKnown = true
    }
    let tn = Number.NaN
    if (s > 0 && ds > 0 && Number.isFinite(s)) {
      const denom = 1 + ((Math.log(s) - lnS) * s) / (ds * T)
      if (denom > 0) tn = T / denom
    }
    if (!(tn > lo && tn < hi)) {
      // Newton left the bracket: make sure the bracket really holds the answer, then bisect.
      if (!loKnown && !(tn > lo)) {
        const sLo = bandRadianceUnchecked(band, lo, c)
        if (sLo > signal) throw belowRange(field, signal, sLo, tMin, tMax)
        loKnown = true
      }
      if (!hiKnown && !(tn < hi)) {
        const sHi = bandRadianceUnchecked(band, hi, c)
        if (sHi < signal) throw aboveRange(field, signal, sHi, tMin, tMax)
        hiKnown = true
      }
      tn = Math.sqrt(lo * hi)
    } else if (Math.abs(tn - T) <= 2e-6 * T) {
      return tn
    }
    if (hi - lo <= 1e-12 * T) return tn
    T = tn
  }
  return T
}

function belowRange(field: string, s: number, sMin: number, tMin: number, tMax: number): EngineInputError {
  return new EngineInputError(
    field,
    `radiance ${s.toPrecision(6)} W·m⁻²·sr⁻¹ is below S(${tMin} K) = ${sMin.toPrecision(6)} for this band: the temperature is outside the inversion range ${tMin} K to ${tMax} K`,
  )
}

function aboveRange(field: string, s: number, sMax: number, tMin: number, tMax: number): EngineInputError {
  return new EngineInputError(
    field,
    `radiance ${s.toPrecision(6)} W·m⁻²·sr⁻¹ is above S(${tMax} K) = ${sMax.toPrecision(6)} for this band: the temperature is outside the inversion range ${tMin} K to ${tMax} K`,
  )
}

/** @internal Band moments for the starting guess, without allocating for a plain rectangular band. */
export function guessFor(band: Band | PreparedBand, signal: number, c: RadiationConstants): number {
  if (band instanceof PreparedBand) {
    return sakumaHattoriGuess(band.meanWavelengthUm, band.standardDeviationUm, band.integratedResponseUm, signal, c)
  }
  if (band.kind === 'rectangular') {
    const n = vacuumWavelengthFactor(band)
    const w = (band.lambda2Um - band.lambda1Um) * n
    return sakumaHattoriGuess(((band.lambda1Um + band.lambda2Um) / 2) * n, w / Math.sqrt(12), w, signal, c)
  }
  return Number.NaN
}

/**
 * Temperature of the blackbody whose band radiance equals `radiance` (safeguarded Newton, see the
 * module notes).
 * @param band - rectangular band (µm), tabulated responsivity or a PreparedBand (prepare a tabulated
 *   band once when inverting many values)
 * @param radiance - band radiance S, W·m⁻²·sr⁻¹ (> 0)
 * @param options - constants (default CODATA 2018), search range (default 50 K to 5000 K), start
 * @returns temperature T with S(T) = radiance, K
 * @throws EngineInputError: `radiance` (≤ 0, NaN, ∞, or outside [S(min), S(max)]), `band…`,
 *   `minTemperatureK`/`maxTemperatureK`
 * @example temperatureFromRadiance({ kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 }, 54.9335) ≈ 300.000 K
 */
export function temperatureFromRadiance(band: Band | PreparedBand, radiance: number, options: InversionOptions = {}): number {
  validateBand(band)
  const c = resolveConstants(options.constants)
  const tMin = options.minTemperatureK ?? INVERSION_RANGE_K.min
  const tMax = options.maxTemperatureK ?? INVERSION_RANGE_K.max
  if (typeof tMin !== 'number' || !Number.isFinite(tMin) || tMin <= 0) {
    throw new EngineInputError('minTemperatureK', `must be a finite temperature above 0 K, got ${String(tMin)}`)
  }
  if (typeof tMax !== 'number' || !Number.isFinite(tMax) || tMax <= tMin) {
    throw new EngineInputError('maxTemperatureK', `must be finite and above minTemperatureK (${tMin} K), got ${String(tMax)}`)
  }
  if (typeof radiance !== 'number' || !Number.isFinite(radiance) || radiance <= 0) {
    throw new EngineInputError('radiance', `must be a finite radiance above 0 W·m⁻²·sr⁻¹, got ${String(radiance)}`)
  }
  // a plain tabulated band is prepared once per call, not once per iteration
  const p = needsPreparing(band) ? prepareBand(band) : band
  const guess = options.initialTemperatureK ?? guessFor(p, radiance, c)
  return invertUnchecked(p, radiance, c, tMin, tMax, guess, 'radiance')
}
