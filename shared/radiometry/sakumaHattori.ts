/**
 * Sakuma–Hattori interpolation equation for radiation thermometers:
 *
 *   S(T) = C / (exp(c2/(A·T + B)) − 1),     T = c2/(A·ln(C/S + 1)) − B/A
 *
 * (F. Sakuma and S. Hattori, "Establishing a practical temperature standard by using a
 * narrow-band radiation thermometer with a silicon detector", in Temperature: Its Measurement and
 * Control in Science and Industry, vol. 5, AIP, 1982, pp. 421–427; the form recommended by
 * CCT-WG5 for uncertainty work below the silver point).
 *
 * Units here: A in µm, B in µm·K, c2 in µm·K (so c2/(AT + B) is dimensionless), C in the unit of the
 * signal (W·m⁻²·sr⁻¹ when the signal is a band radiance from ./planck).
 *
 * Band estimate (P. Saunders and D. R. White, "Physical basis of interpolation equations for
 * radiation thermometry", Metrologia 40, 195–203 (2003); recalled from memory): for a band of mean
 * wavelength λ0 and standard deviation σλ,
 *   A ≈ λ0·(1 − 6σλ²/λ0²),  B ≈ c2·σλ²/(2λ0²).
 * These two match the second-order expansion of ln ∫R(λ)λ⁻⁵e^(−c2/λT) dλ about λ0 in the Wien limit
 * (re-derived for this module), which also gives C ≈ c1L·W·λ0⁻⁵·exp(15σλ²/λ0²) with W = ∫R dλ;
 * that C is this module's own derivation, not from the paper.
 */

import { resolveConstants, type RadiationConstantsChoice } from './constants'
import { EngineInputError } from './errors'
import { prepareBand, type Band, type PreparedBand } from './planck'

/** Sakuma–Hattori parameters. */
export interface SakumaHattoriParameters {
  /** A, µm. */
  A: number
  /** B, µm·K. */
  B: number
  /** C, in the unit of the signal (W·m⁻²·sr⁻¹ for band radiance). */
  C: number
}

/** Band estimate of the Sakuma–Hattori parameters, with the band moments used. */
export interface SakumaHattoriBandEstimate extends SakumaHattoriParameters {
  /** Responsivity-weighted mean wavelength λ0, µm. */
  meanWavelengthUm: number
  /** Responsivity-weighted standard deviation σλ, µm. */
  standardDeviationUm: number
}

/**
 * Sakuma–Hattori parameters estimated from a band's mean wavelength and width (Saunders & White 2003,
 * from memory; C derived here, see the module notes).
 * @param band - band or PreparedBand (λ in µm)
 * @param constants - radiation constants (default CODATA 2018)
 * @returns A (µm), B (µm·K), C (W·m⁻²·sr⁻¹), λ0 (µm), σλ (µm)
 * @example sakumaHattoriFromBand({ kind: 'rectangular', lambda1Um: 0.64, lambda2Um: 0.66 }).A ≈ 0.6498 µm
 */
export function sakumaHattoriFromBand(band: Band | PreparedBand, constants?: RadiationConstantsChoice): SakumaHattoriBandEstimate {
  const p = prepareBand(band)
  const c = resolveConstants(constants)
  const l0 = p.meanWavelengthUm
  const sd = p.standardDeviationUm
  const q = (sd * sd) / (l0 * l0)
  return {
    A: l0 * (1 - 6 * q),
    B: (c.c2UmK * q) / 2,
    C: (c.c1LUm * p.integratedResponseUm * Math.exp(15 * q)) / l0 ** 5,
    meanWavelengthUm: l0,
    standardDeviationUm: sd,
  }
}

function checkParameters(params: SakumaHattoriParameters): void {
  if (typeof params !== 'object' || params === null) throw new EngineInputError('parameters', 'must be an object { A, B, C }')
  if (!(Number.isFinite(params.A) && params.A > 0)) throw new EngineInputError('parameters.A', `must be a finite wavelength above 0 µm, got ${String(params.A)}`)
  if (!Number.isFinite(params.B)) throw new EngineInputError('parameters.B', `must be finite, got ${String(params.B)}`)
  if (!(Number.isFinite(params.C) && params.C > 0)) throw new EngineInputError('parameters.C', `must be a finite number above 0, got ${String(params.C)}`)
}

/**
 * Sakuma–Hattori signal S(T) = C/(exp(c2/(AT + B)) − 1).
 * @param params - A (µm), B (µm·K), C (signal unit)
 * @param temperatureK - temperature, K (> 0, with AT + B > 0)
 * @param constants - radiation constants for c2 (default CODATA 2018)
 * @returns signal, in the unit of C
 * @example sakumaHattoriSignal({ A: 0.65, B: 0, C: 1 }, 1337.33) ≈ exp(−16.55)
 */
export function sakumaHattoriSignal(params: SakumaHattoriParameters, temperatureK: number, constants?: RadiationConstantsChoice): number {
  checkParameters(params)
  if (!(Number.isFinite(temperatureK) && temperatureK > 0)) {
    throw new EngineInputError('temperatureK', `must be a finite temperature above 0 K, got ${String(temperatureK)}`)
  }
  const c = resolveConstants(constants)
  const d = params.A * temperatureK + params.B
  if (!(d > 0)) throw new EngineInputError('temperatureK', 'A·T + B must be positive')
  return params.C / Math.expm1(c.c2UmK / d)
}

/**
 * Inverse Sakuma–Hattori equation T = c2/(A·ln(C/S + 1)) − B/A.
 * @param params - A (µm), B (µm·K), C (signal unit)
 * @param signal - signal, in the unit of C (> 0)
 * @param constants - radiation constants for c2 (default CODATA 2018)
 * @returns temperature, K
 * @example sakumaHattoriTemperature(p, sakumaHattoriSignal(p, 1000)) ≈ 1000 K
 */
export function sakumaHattoriTemperature(params: SakumaHattoriParameters, signal: number, constants?: RadiationConstantsChoice): number {
  checkParameters(params)
  if (!(Number.isFinite(signal) && signal > 0)) {
    throw new EngineInputError('signal', `must be a finite signal above 0, got ${String(signal)}`)
  }
  const c = resolveConstants(constants)
  return c.c2UmK / (params.A * Math.log1p(params.C / signal)) - params.B / params.A
}

/** A calibration point for {@link fitSakumaHattori}. */
export interface SignalPoint {
  /** Temperature, K. */
  temperatureK: number
  /** Measured signal (> 0), any unit (the fitted C takes it). */
  signal: number
}

/** Residual of one point after the fit. */
export interface SakumaHattoriResidual {
  temperatureK: number
  signal: number
  /** Fitted signal at temperatureK, unit of signal. */
  fittedSignal: number
  /** ln(signal) − ln(fittedSignal), dimensionless (≈ relative signal residual). */
  logResidual: number
  /** temperatureK − T_fit(signal), K. */
  temperatureResidualK: number
}

/** Result of {@link fitSakumaHattori}. */
export interface SakumaHattoriFit extends SakumaHattoriParameters {
  residuals: SakumaHattoriResidual[]
  /** Root-mean-square of the log residuals. */
  rmsLogResidual: number
  /** Levenberg–Marquardt iterations used. */
  iterations: number
  /** True when the iteration met its stopping test within the iteration limit. */
  converged: boolean
}

function solve3(M: number[], v: number[]): number[] | null {
  // Gaussian elimination with partial pivoting on a 3×3 system (M row-major), returns null if singular
  const a = [M.slice(0, 3).concat(v[0]!), M.slice(3, 6).concat(v[1]!), M.slice(6, 9).concat(v[2]!)]
  for (let col = 0; col < 3; col++) {
    let piv = col
    for (let r = col + 1; r < 3; r++) if (Math.abs(a[r]![col]!) > Math.abs(a[piv]![col]!)) piv = r
    if (a[piv]![col] === 0) return null
    const tmp = a[col]!
    a[col] = a[piv]!
    a[piv] = tmp
    for (let r = col + 1; r < 3; r++) {
      const f = a[r]![col]! / a[col]![col]!
      for (let k = col; k < 4; k++) a[r]![k] = a[r]![k]! - f * a[col]![k]!
    }
  }
  const x = [0, 0, 0]
  for (let r = 2; r >= 0; r--) {
    let s = a[r]![3]!
    for (let k = r + 1; k < 3; k++) s -= a[r]![k]! * x[k]!
    x[r] = s / a[r]![r]!
  }
  return x.every(Number.isFinite) ? x : null
}

/**
 * Least-squares fit of the Sakuma–Hattori A, B, C to three or more (temperature, signal) points,
 * minimising Σ(ln S_i − ln S_SH(T_i))² by Levenberg–Marquardt (Marquardt's diagonal scaling) in the
 * parameters (A, B, ln C). Start: the band estimate when `band` is given, else a Wien fit (B = 0,
 * linear regression of ln S on 1/T). With exactly three points the fit interpolates them.
 * @param points - at least three points with distinct temperatures: temperatureK (K), signal (> 0)
 * @param options - `band` for the starting estimate, `initial` parameters, `constants`, `maxIterations` (default 200)
 * @returns A (µm), B (µm·K), C (signal unit), residuals per point, rms log residual, iterations, converged
 * @throws EngineInputError (`points`, `points[i].temperatureK`, `points[i].signal`)
 * @example fit to S(T) at 1000, 1200, 1400 K of a 0.64–0.66 µm band gives A ≈ 0.6499 µm and
 *   interpolates 1300 K to well under 1 mK
 */
export function fitSakumaHattori(
  points: readonly SignalPoint[],
  options: { band?: Band | PreparedBand; initial?: SakumaHattoriParameters; constants?: RadiationConstantsChoice; maxIterations?: number } = {},
): SakumaHattoriFit {
  if (!Array.isArray(points) || points.length < 3) throw new EngineInputError('points', 'needs at least three (temperatureK, signal) points')
  const c = resolveConstants(options.constants)
  const c2 = c.c2UmK
  const n = points.length
  const T = new Float64Array(n)
  const y = new Float64Array(n)
  const distinct = new Set<number>()
  for (let i = 0; i < n; i++) {
    const p = points[i]!
    if (!(Number.isFinite(p.temperatureK) && p.temperatureK > 0)) {
      throw new EngineInputError(`points[${i}].temperatureK`, `must be a finite temperature above 0 K, got ${String(p.temperatureK)}`)
    }
    if (!(Number.isFinite(p.signal) && p.signal > 0)) {
      throw new EngineInputError(`points[${i}].signal`, `must be a finite signal above 0, got ${String(p.signal)}`)
    }
    T[i] = p.temperatureK
    y[i] = Math.log(p.signal)
    distinct.add(p.temperatureK)
  }
  if (distinct.size < 3) throw new EngineInputError('points', 'needs at least three distinct temperatures')

  let A: number
  let B: number
  let lnC: number
  if (options.initial) {
    checkParameters(options.initial)
    A = options.initial.A
    B = options.initial.B
    lnC = Math.log(options.initial.C)
  } else if (options.band) {
    const e = sakumaHattoriFromBand(options.band, c)
    A = e.A
    B = e.B
    lnC = Math.log(e.C)
  } else {
    // Wien start: ln S = ln C − c2/(A·T)
    let sx = 0
    let sy = 0
    let sxx = 0
    let sxy = 0
    for (let i = 0; i < n; i++) {
      const xi = 1 / T[i]!
      sx += xi
      sy += y[i]!
      sxx += xi * xi
      sxy += xi * y[i]!
    }
    const slope = (n * sxy - sx * sy) / (n * sxx - sx * sx)
    const icpt = (sy - slope * sx) / n
    A = slope < 0 ? -c2 / slope : 1
    B = 0
    lnC = icpt
  }

  const model = (a: number, b: number, lc: number, t: number): number => {
    const d = a * t + b
    if (!(d > 0)) return Number.NaN
    return lc - Math.log(Math.expm1(c2 / d))
  }
  const sse = (a: number, b: number, lc: number): number => {
    let s = 0
    for (let i = 0; i < n; i++) {
      const r = y[i]! - model(a, b, lc, T[i]!)
      s += r * r
    }
    return Number.isNaN(s) ? Number.POSITIVE_INFINITY : s
  }

  const maxIter = options.maxIterations ?? 200
  let lambda = 1e-3
  let current = sse(A, B, lnC)
  let iterations = 0
  let converged = false
  for (; iterations < maxIter; iterations++) {
    // normal equations JᵀJ δ = Jᵀr
    const JtJ = [0, 0, 0, 0, 0, 0, 0, 0, 0]
    const Jtr = [0, 0, 0]
    for (let i = 0; i < n; i++) {
      const t = T[i]!
      const d = A * t + B
      const z = c2 / d
      const dmdz = -1 / -Math.expm1(-z) // −eᶻ/(eᶻ − 1)
      const j0 = dmdz * (-z * t) / d
      const j1 = dmdz * (-z / d)
      const j = [j0, j1, 1]
      const r = y[i]! - model(A, B, lnC, t)
      for (let a = 0; a < 3; a++) {
        Jtr[a] = Jtr[a]! + j[a]! * r
        for (let b = 0; b < 3; b++) JtJ[3 * a + b] = JtJ[3 * a + b]! + j[a]! * j[b]!
      }
    }
    let improved = false
    for (let tries = 0; tries < 30; tries++) {
      const M = JtJ.slice()
      for (let a = 0; a < 3; a++) M[4 * a] = M[4 * a]! * (1 + lambda)
      const step = solve3(M, Jtr)
      if (!step) {
        lambda *= 10
        continue
      }
      const nA = A + step[0]!
      const nB = B + step[1]!
      const nC = lnC + step[2]!
      const next = sse(nA, nB, nC)
      if (next <= current) {
        const drop = current - next
        A = nA
        B = nB
        lnC = nC
        lambda = Math.max(lambda / 10, 1e-12)
        improved = true
        // stop when the sum of squares no longer falls (relative 1e-12) or the fit is exact
        if (drop <= 1e-12 * current || next < 1e-30) converged = true
        current = next
        break
      }
      lambda *= 10
    }
    if (!improved) {
      // no step of any damping lowers the sum of squares: a minimum to working precision
      converged = true
      break
    }
    if (converged) {
      iterations++
      break
    }
  }

  const params: SakumaHattoriParameters = { A, B, C: Math.exp(lnC) }
  const residuals: SakumaHattoriResidual[] = []
  let sumSq = 0
  for (let i = 0; i < n; i++) {
    const p = points[i]!
    const fitted = Math.exp(model(A, B, lnC, p.temperatureK))
    const lr = Math.log(p.signal) - Math.log(fitted)
    sumSq += lr * lr
    const tFit = c2 / (A * Math.log1p(params.C / p.signal)) - B / A
    residuals.push({ temperatureK: p.temperatureK, signal: p.signal, fittedSignal: fitted, logResidual: lr, temperatureResidualK: p.temperatureK - tFit })
  }
  return { ...params, residuals, rmsLogResidual: Math.sqrt(sumSq / n), iterations, converged }
}
