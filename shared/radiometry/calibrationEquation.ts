/**
 * Calibration equation of a spot or reference radiation thermometer from its as-left points: a
 * weighted least-squares fit giving the temperature (and the correction) at any reading between the
 * points, with the uncertainty of the interpolated value.
 *
 * What is fitted. Each as-left point i gives a reference temperature T_i, the instrument's mean reading
 * R_i and the expanded uncertainty U_i (coverage factor k_i) of the point, u_i = U_i/k_i. The equation
 * is the mapping reading → temperature, T = f(R; p), because a certificate's table of corrections is
 * used by someone holding a reading: "at a reading R, add the correction c(R) = f(R) − R". The points'
 * uncertainties u_i are attributed to the T side (they are the uncertainty of the point's correction,
 * reference and reading budgets combined); the readings R_i are taken as exact. Weighted least squares
 * minimises rᵀV_y⁻¹r, r_i = T_i − f(R_i; p), V_y = D·K·D with D = diag(u_i) and K the points'
 * correlation matrix (identity unless given: a shared reference thermometer or source makes the points'
 * errors correlated). This is the generalised least-squares estimate (JCGM 102:2011 treats such
 * multivariate models; recalled from memory) and, for uncorrelated points, ordinary weighted least
 * squares with weights 1/u_i².
 *
 * Two forms of f:
 * - `'sakuma-hattori'` (default; 3 parameters A, B, C). The reading is turned back into the signal the
 *   instrument measured, s(R) = 1/(exp(c2/(A_n·R + B_n)) − 1), where A_n, B_n are the Sakuma–Hattori
 *   band estimate of the instrument's nominal band (./sakumaHattori, Saunders & White 2003, from
 *   memory), i.e. an instrument that linearises its signal with its nominal band; then the signal is
 *   fitted by the Sakuma–Hattori equation s = C/(exp(c2/(A·T + B)) − 1) (Sakuma & Hattori 1982), so
 *       f(R) = c2/(A·ln(C/s(R) + 1)) − B/A.
 *   A perfect instrument is exactly A = A_n, B = B_n, C = 1 (f(R) = R), gain errors go into C and
 *   effective-wavelength errors into A and B: the physically motivated interpolation between points
 *   recommended for radiation thermometers (CCT-WG5; Saunders et al. 2008, Int. J. Thermophys. 29:1066,
 *   from memory). The start of the iteration is {@link fitSakumaHattori} on (T_i, s(R_i)); the
 *   weighted fit then runs in temperature residuals.
 * - `'linear'` (2 parameters a, b): f(R) = a + b·R, the straight-line calibration function
 *   (ISO/TS 28037:2010 treats its uncertainty; from memory), for short ranges or as a check.
 *
 * Uncertainty. The parameter covariance is V_p = (JᵀV_y⁻¹J)⁻¹ at the solution, J_ij = ∂f(R_i)/∂p_j
 * (JCGM 100:2008 5.2 with correlations; JCGM 102:2011 for the multivariate form), computed from a
 * Householder QR of the whitened Jacobian. It is NOT rescaled by χ²/ν ("absolute sigma"): the points'
 * stated uncertainties are taken as right, and χ² with ν = n − p is reported so that a lack of fit can
 * be seen (χ² ≫ ν). With exactly as many points as parameters the fit interpolates them, χ² = 0, ν = 0,
 * and V_p comes purely from propagating the points' u_i (at a calibration point the interpolated value
 * then has u = u_i exactly). At a reading R the corrected temperature f(R) has u² = gᵀV_p g,
 * g = ∂f(R)/∂p; at a reference temperature T the predicted reading R(T) (f(R) = T) has
 * u = √(gᵀV_p g)/|∂f/∂R|. The expanded uncertainty is k·u with k = 2 unless another is given (the
 * points' k_i only turn U_i into u_i). The parameters' uncertainty is the interpolation component only;
 * the instrument's repeatability and drift in use are separate budget lines.
 *
 * Interpolation only: evaluation outside [min, max] of the points (readings or reference temperatures)
 * raises an {@link EngineInputError} on `temperatureK` (the ends are accepted, with a rounding slack of
 * 1e-12 relative so that a value computed at an end and converted back still counts as inside).
 */

import { resolveConstants, type RadiationConstantsChoice, type RadiationConstantsId } from './constants'
import { EngineInputError } from './errors'
import type { Band, PreparedBand } from './planck'
import { fitSakumaHattori, sakumaHattoriFromBand } from './sakumaHattori'

/** One as-left calibration point (the API's `points[i]`). */
export interface CalibrationPointInput {
  /** Reference temperature T_i, K (> 0). */
  referenceTemperatureK: number
  /** Instrument reading R_i (mean of the readings), K (> 0). */
  readingK: number
  /** Expanded uncertainty U_i of the point, K (> 0). */
  expandedUncertaintyK: number
  /** Coverage factor k_i of U_i (> 0); u_i = U_i/k_i. */
  coverageFactor: number
}

/** Form of the calibration equation. */
export type CalibrationEquationModel = 'sakuma-hattori' | 'linear'

/** The models {@link fitCalibrationEquation} accepts. */
export const CALIBRATION_EQUATION_MODELS: readonly CalibrationEquationModel[] = Object.freeze(['sakuma-hattori', 'linear'])

/** Input of {@link fitCalibrationEquation}. */
export interface CalibrationEquationInput {
  /** As-left points: at least as many as the model has parameters (3, or 2 for `'linear'`), distinct readings. */
  points: CalibrationPointInput[]
  /** Equation form (default `'sakuma-hattori'`). */
  model?: CalibrationEquationModel
  /** The instrument's nominal spectral band (required for `'sakuma-hattori'`; µm). */
  band?: Band | PreparedBand
  /** Correlation matrix of the points' errors, n×n, symmetric, unit diagonal, positive definite (default identity). */
  correlation?: number[][]
  /** Coverage factor for the interpolated expanded uncertainty (default 2). */
  coverageFactor?: number
  /** Radiation constants for c2 (default CODATA 2018). */
  constants?: RadiationConstantsChoice
}

/** Residual of one point after the fit. */
export interface CalibrationResidual {
  referenceTemperatureK: number
  readingK: number
  /** f(R_i), K. */
  fittedTemperatureK: number
  /** T_i − f(R_i), K. */
  residualK: number
  /** u_i = U_i/k_i, K. */
  standardUncertaintyK: number
  /** (T_i − f(R_i))/u_i. */
  normalizedResidual: number
}

/** A fitted calibration equation (plain data, JSON-safe; evaluate it with the functions below). */
export interface CalibrationEquation {
  model: CalibrationEquationModel
  /** ['A', 'B', 'C'] or ['a', 'b']. */
  parameterNames: string[]
  /** Parameter values in the order of parameterNames. */
  parameters: number[]
  /** Units: A µm, B µm·K, C 1 (the signal s is dimensionless); a K, b 1. */
  parameterUnits: string[]
  /** Covariance matrix V_p of the parameters (units: products of parameterUnits). */
  covariance: number[][]
  /** √diag(V_p). */
  parameterStandardUncertainties: number[]
  /** A_n (µm) and B_n (µm·K) defining s(R) for `'sakuma-hattori'`; null for `'linear'`. */
  nominal: { A: number; B: number } | null
  /** c2 used, µm·K. */
  c2UmK: number
  /** Constants set used. */
  constantsId: RadiationConstantsId
  residuals: CalibrationResidual[]
  /** rᵀV_y⁻¹r at the solution. */
  chiSquared: number
  /** ν = n − p. */
  degreesOfFreedom: number
  /** Range of the readings R_i, K. */
  readingRangeK: { min: number; max: number }
  /** Range of the reference temperatures T_i, K. */
  referenceRangeK: { min: number; max: number }
  /** k used for expanded uncertainties of interpolated values. */
  coverageFactor: number
  /** Gauss–Newton iterations used. */
  iterations: number
  /** True when the iteration met its stopping test. */
  converged: boolean
}

/** The calibration equation evaluated at one temperature. */
export interface CalibrationEquationValue {
  /** Instrument reading R, K. */
  readingK: number
  /** Temperature T = f(R), K. */
  referenceTemperatureK: number
  /** Correction to add to the reading, T − R, K. */
  correctionK: number
  /** Standard uncertainty of the interpolated value (of T at a reading, of R at a reference temperature), K. */
  standardUncertaintyK: number
  /** k × standardUncertaintyK, K. */
  expandedUncertaintyK: number
  coverageFactor: number
}

// ---------------------------------------------------------------------------------------------
// Models: f(R; p), ∂f/∂p, ∂f/∂R

interface Model {
  readonly names: string[]
  readonly units: string[]
  f(R: number, p: readonly number[]): number
  /** ∂f/∂p into g (length = number of parameters). */
  grad(R: number, p: readonly number[], g: number[]): void
  dfdR(R: number, p: readonly number[]): number
}

function linearModel(): Model {
  return {
    names: ['a', 'b'],
    units: ['K', '1'],
    f: (R, p) => p[0]! + p[1]! * R,
    grad: (R, _p, g) => {
      g[0] = 1
      g[1] = R
    },
    dfdR: (_R, p) => p[1]!,
  }
}

function sakumaHattoriModel(An: number, Bn: number, c2: number): Model {
  const sig = (R: number): [number, number] => {
    const d = An * R + Bn
    const z = c2 / d
    return [1 / Math.expm1(z), (z * An) / d]
  }
  return {
    names: ['A', 'B', 'C'],
    units: ['µm', 'µm·K', '1'],
    f: (R, p) => {
      const [s] = sig(R)
      return c2 / (p[0]! * Math.log1p(p[2]! / s)) - p[1]! / p[0]!
    },
    grad: (R, p, g) => {
      const [s] = sig(R)
      const A = p[0]!
      const C = p[2]!
      const lg = Math.log1p(C / s)
      const f = c2 / (A * lg) - p[1]! / A
      g[0] = -f / A
      g[1] = -1 / A
      g[2] = -c2 / (A * lg * lg * (s + C))
    },
    dfdR: (R, p) => {
      const [s, dzdR] = sig(R)
      const A = p[0]!
      const C = p[2]!
      const lg = Math.log1p(C / s)
      // ds/dR = s(1 + s)·z·A_n/(A_n R + B_n); ∂f/∂s = c2·C/(A·lg²·s·(s + C))
      return (c2 * C * (1 + s) * dzdR) / (A * lg * lg * (s + C))
    },
  }
}

function modelOf(eq: Pick<CalibrationEquation, 'model' | 'nominal' | 'c2UmK'>): Model {
  if (eq.model === 'linear') return linearModel()
  if (eq.model === 'sakuma-hattori' && eq.nominal) return sakumaHattoriModel(eq.nominal.A, eq.nominal.B, eq.c2UmK)
  throw new EngineInputError('model', `unknown calibration equation model '${String(eq.model)}'`)
}

// ---------------------------------------------------------------------------------------------
// Small dense linear algebra (n ≤ a few dozen, p ≤ 3)

/** Lower Cholesky factor of a symmetric positive definite matrix, or null. */
function cholesky(M: number[][]): number[][] | null {
  const n = M.length
  const L = M.map(() => new Array<number>(n).fill(0))
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let s = M[i]![j]!
      for (let k = 0; k < j; k++) s -= L[i]![k]! * L[j]![k]!
      if (i === j) {
        if (!(s > 0)) return null
        L[i]![i] = Math.sqrt(s)
      } else {
        L[i]![j] = s / L[j]![j]!
      }
    }
  }
  return L
}

/** Solves L·x = b in place (L lower triangular). */
function forward(L: number[][], b: number[]): void {
  for (let i = 0; i < b.length; i++) {
    let s = b[i]!
    for (let k = 0; k < i; k++) s -= L[i]![k]! * b[k]!
    b[i] = s / L[i]![i]!
  }
}

/**
 * Householder QR of the n×p matrix J (column-major copy), returning R (p×p upper) and Qᵀb.
 * Column-wise backward stable, so the widely different scales of A, B, C do not matter.
 */
function qrSolve(J: number[][], b: number[]): { R: number[][]; qtb: number[] } {
  const n = J.length
  const p = J[0]!.length
  const a = J.map((row) => row.slice())
  const y = b.slice()
  for (let k = 0; k < p; k++) {
    let norm = 0
    for (let i = k; i < n; i++) norm += a[i]![k]! * a[i]![k]!
    norm = Math.sqrt(norm)
    if (norm === 0) continue
    const alpha = a[k]![k]! > 0 ? -norm : norm
    const v = new Array<number>(n).fill(0)
    for (let i = k; i < n; i++) v[i] = a[i]![k]!
    v[k] = v[k]! - alpha
    let vv = 0
    for (let i = k; i < n; i++) vv += v[i]! * v[i]!
    if (vv === 0) continue
    for (let j = k; j < p; j++) {
      let s = 0
      for (let i = k; i < n; i++) s += v[i]! * a[i]![j]!
      const f = (2 * s) / vv
      for (let i = k; i < n; i++) a[i]![j] = a[i]![j]! - f * v[i]!
    }
    let s = 0
    for (let i = k; i < n; i++) s += v[i]! * y[i]!
    const f = (2 * s) / vv
    for (let i = k; i < n; i++) y[i] = y[i]! - f * v[i]!
  }
  const R = []
  for (let i = 0; i < p; i++) R.push(a[i]!.slice(0, p).map((v, j) => (j < i ? 0 : v)))
  return { R, qtb: y.slice(0, p) }
}

/** Solves R·x = c (R upper triangular), or null if singular. */
function backSolve(R: number[][], c: number[]): number[] | null {
  const p = c.length
  const x = new Array<number>(p).fill(0)
  for (let i = p - 1; i >= 0; i--) {
    let s = c[i]!
    for (let k = i + 1; k < p; k++) s -= R[i]![k]! * x[k]!
    if (R[i]![i] === 0) return null
    x[i] = s / R[i]![i]!
  }
  return x.every(Number.isFinite) ? x : null
}

/** (RᵀR)⁻¹ = R⁻¹R⁻ᵀ. */
function covarianceFromR(R: number[][]): number[][] | null {
  const p = R.length
  const Rinv: number[][] = []
  for (let j = 0; j < p; j++) {
    const e = new Array<number>(p).fill(0)
    e[j] = 1
    const col = backSolve(R, e)
    if (!col) return null
    Rinv.push(col) // column j of R⁻¹
  }
  const V = R.map(() => new Array<number>(p).fill(0))
  for (let i = 0; i < p; i++) {
    for (let j = 0; j < p; j++) {
      let s = 0
      for (let k = 0; k < p; k++) s += Rinv[k]![i]! * Rinv[k]![j]!
      V[i]![j] = s
    }
  }
  return V
}

// ---------------------------------------------------------------------------------------------
// Validation

function positive(v: unknown, field: string, what: string): number {
  if (typeof v !== 'number' || !Number.isFinite(v) || v <= 0) throw new EngineInputError(field, `must be ${what} above 0, got ${String(v)}`)
  return v
}

function validateCorrelation(K: unknown, n: number): number[][] {
  if (!Array.isArray(K) || K.length !== n) throw new EngineInputError('correlation', `must be an ${n}×${n} matrix (one row per point)`)
  for (let i = 0; i < n; i++) {
    const row: unknown = K[i]
    if (!Array.isArray(row) || row.length !== n) throw new EngineInputError(`correlation[${i}]`, `must be a row of ${n} numbers`)
    for (let j = 0; j < n; j++) {
      const v: unknown = row[j]
      const f = `correlation[${i}][${j}]`
      if (typeof v !== 'number' || !Number.isFinite(v)) throw new EngineInputError(f, `must be a finite number, got ${String(v)}`)
      if (i === j && v !== 1) throw new EngineInputError(f, `the diagonal of a correlation matrix must be 1, got ${v}`)
      if (Math.abs(v) > 1) throw new EngineInputError(f, `a correlation coefficient must lie in [−1, 1], got ${v}`)
    }
  }
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < i; j++) {
      if (K[i][j] !== K[j][i]) throw new EngineInputError(`correlation[${i}][${j}]`, `must equal correlation[${j}][${i}] (the matrix is symmetric)`)
    }
  }
  return K as number[][]
}

// ---------------------------------------------------------------------------------------------
// Fit

/**
 * Fits the calibration equation to as-left points by (generalised) weighted least squares and returns
 * the parameters, their covariance, the residuals and χ² (see the module notes for the model and the
 * uncertainty).
 * @param input - points (T_i K, R_i K, U_i K, k_i), model (default `'sakuma-hattori'`), band (the
 *   instrument's nominal band, µm; required for `'sakuma-hattori'`), correlation (n×n, default
 *   identity), coverageFactor (default 2), constants (default CODATA 2018)
 * @returns the fitted equation (plain data): parameters, covariance, residuals, χ², ν, ranges
 * @throws EngineInputError naming `points`, `points[i].referenceTemperatureK`, `points[i].readingK`,
 *   `points[i].expandedUncertaintyK`, `points[i].coverageFactor`, `model`, `band…`, `correlation…`,
 *   `coverageFactor`, `constants`
 * @example five as-left points of a 0.8–1.0 µm pyrometer, 873–1673 K (the tests' case):
 *   calibrationEquationAtReading(fitCalibrationEquation({ points, band }), 1173.15)
 *   → correctionK ≈ 1.2909 K, standardUncertaintyK ≈ 0.7658 K (scipy curve_fit gives the same)
 */
export function fitCalibrationEquation(input: CalibrationEquationInput): CalibrationEquation {
  if (typeof input !== 'object' || input === null) throw new EngineInputError('points', 'calibration equation input must be an object')
  const modelName = input.model ?? 'sakuma-hattori'
  if (!CALIBRATION_EQUATION_MODELS.includes(modelName)) {
    throw new EngineInputError('model', `unknown calibration equation model '${String(modelName)}'; use ${CALIBRATION_EQUATION_MODELS.join(' or ')}`)
  }
  const nParams = modelName === 'linear' ? 2 : 3
  const pts: unknown = input.points
  if (!Array.isArray(pts) || pts.length < nParams) {
    throw new EngineInputError('points', `the ${modelName} equation has ${nParams} parameters and needs at least ${nParams} points`)
  }
  const n = pts.length
  const T: number[] = []
  const R: number[] = []
  const u: number[] = []
  for (let i = 0; i < n; i++) {
    const p = pts[i] as CalibrationPointInput
    if (typeof p !== 'object' || p === null) throw new EngineInputError(`points[${i}]`, 'must be an object')
    T.push(positive(p.referenceTemperatureK, `points[${i}].referenceTemperatureK`, 'a finite temperature in K'))
    R.push(positive(p.readingK, `points[${i}].readingK`, 'a finite reading in K'))
    const U = positive(p.expandedUncertaintyK, `points[${i}].expandedUncertaintyK`, 'a finite expanded uncertainty in K')
    const k = positive(p.coverageFactor, `points[${i}].coverageFactor`, 'a finite coverage factor')
    u.push(U / k)
  }
  if (new Set(R).size < nParams) {
    throw new EngineInputError('points', `needs at least ${nParams} distinct readings for the ${nParams} parameters of the ${modelName} equation`)
  }
  const kOut = input.coverageFactor === undefined ? 2 : positive(input.coverageFactor, 'coverageFactor', 'a finite coverage factor')
  const c = resolveConstants(input.constants)

  // whitening: V_y = D K D = (D L)(D L)ᵀ, L the Cholesky factor of K
  let W: number[][] // lower-triangular factor of V_y
  if (input.correlation === undefined) {
    W = u.map((ui, i) => u.map((_, j) => (i === j ? ui : 0)))
  } else {
    const K = validateCorrelation(input.correlation, n)
    const L = cholesky(K)
    if (!L) throw new EngineInputError('correlation', 'must be positive definite (no point may be an exact linear combination of the others)')
    W = L.map((row, i) => row.map((v) => u[i]! * v))
  }
  const whiten = (v: number[]): number[] => {
    const w = v.slice()
    forward(W, w)
    return w
  }

  let model: Model
  let nominal: { A: number; B: number } | null = null
  let p: number[]
  if (modelName === 'linear') {
    model = linearModel()
    p = [0, 1]
  } else {
    if (input.band === undefined) throw new EngineInputError('band', "the instrument's nominal band is required for the sakuma-hattori equation")
    const est = sakumaHattoriFromBand(input.band, c) // band errors name `band…`
    nominal = { A: est.A, B: est.B }
    model = sakumaHattoriModel(est.A, est.B, c.c2UmK)
    p = [est.A, est.B, 1]
    // start: the unweighted Sakuma–Hattori fit of the signals s(R_i) against T_i (./sakumaHattori)
    if (new Set(T).size >= 3) {
      const s = R.map((r) => 1 / Math.expm1(c.c2UmK / (est.A * r + est.B)))
      const start = fitSakumaHattori(
        T.map((t, i) => ({ temperatureK: t, signal: s[i]! })),
        { initial: { A: est.A, B: est.B, C: 1 }, constants: c },
      )
      if ([start.A, start.B, start.C].every(Number.isFinite) && start.A > 0 && start.C > 0) p = [start.A, start.B, start.C]
    }
  }

  // Gauss–Newton in whitened residuals, parameters (A, B, ln C) for the Sakuma–Hattori form
  const logC = modelName === 'sakuma-hattori'
  const g = new Array<number>(nParams).fill(0)
  const residuals = (q: number[]): number[] => R.map((r, i) => T[i]! - model.f(r, q))
  const sse = (q: number[]): number => {
    const w = whiten(residuals(q))
    let s = 0
    for (const v of w) s += v * v
    return Number.isFinite(s) ? s : Number.POSITIVE_INFINITY
  }
  const jacobian = (q: number[]): number[][] => {
    const cols: number[][] = []
    for (let j = 0; j < nParams; j++) {
      const col = R.map((r) => {
        model.grad(r, q, g)
        return logC && j === 2 ? g[j]! * q[2]! : g[j]!
      })
      cols.push(whiten(col))
    }
    return R.map((_, i) => cols.map((col) => col[i]!))
  }
  const apply = (q: number[], d: number[], t: number): number[] =>
    q.map((v, j) => (logC && j === 2 ? v * Math.exp(t * d[j]!) : v + t * d[j]!))

  let current = sse(p)
  let iterations = 0
  let converged = false
  for (; iterations < 100; iterations++) {
    const J = jacobian(p)
    const { R: Rq, qtb } = qrSolve(J, whiten(residuals(p)))
    const d = backSolve(Rq, qtb)
    if (!d) throw new EngineInputError('points', 'the points do not determine the parameters (singular least-squares problem)')
    // predicted change of the whitened fitted values: ‖J d‖ = ‖qtb‖ (in standard uncertainties)
    let predicted = 0
    for (const v of qtb) predicted += v * v
    let t = 1
    let next = apply(p, d, t)
    let nextSse = sse(next)
    while (!(nextSse <= current * (1 + 1e-12) + 1e-28) && t > 1e-12) {
      t /= 2
      next = apply(p, d, t)
      nextSse = sse(next)
    }
    if (!(nextSse <= current * (1 + 1e-12) + 1e-28)) break
    p = next
    current = nextSse
    if (Math.sqrt(predicted) * t <= 1e-10) {
      converged = true
      iterations++
      break
    }
  }

  // covariance at the solution
  const J = jacobian(p)
  const { R: Rq } = qrSolve(J, new Array<number>(n).fill(0))
  const V = covarianceFromR(Rq)
  if (!V || !V.every((row) => row.every(Number.isFinite))) {
    throw new EngineInputError('points', 'the points do not determine the parameters (singular least-squares problem)')
  }
  if (logC) {
    // from (A, B, ln C) to (A, B, C): multiply row and column 3 by C
    for (let i = 0; i < 3; i++) {
      V[i]![2] = V[i]![2]! * p[2]!
      V[2]![i] = V[2]![i]! * p[2]!
    }
  }
  const res = residuals(p)
  return {
    model: modelName,
    parameterNames: model.names,
    parameters: p,
    parameterUnits: model.units,
    covariance: V,
    parameterStandardUncertainties: V.map((row, i) => Math.sqrt(row[i]!)),
    nominal,
    c2UmK: c.c2UmK,
    constantsId: c.id,
    residuals: R.map((r, i) => ({
      referenceTemperatureK: T[i]!,
      readingK: r,
      fittedTemperatureK: T[i]! - res[i]!,
      residualK: res[i]!,
      standardUncertaintyK: u[i]!,
      normalizedResidual: res[i]! / u[i]!,
    })),
    chiSquared: current,
    degreesOfFreedom: n - nParams,
    readingRangeK: { min: Math.min(...R), max: Math.max(...R) },
    referenceRangeK: { min: Math.min(...T), max: Math.max(...T) },
    coverageFactor: kOut,
    iterations,
    converged,
  }
}

// ---------------------------------------------------------------------------------------------
// Evaluation

function gVg(eq: CalibrationEquation, g: number[]): number {
  let s = 0
  for (let i = 0; i < g.length; i++) for (let j = 0; j < g.length; j++) s += g[i]! * eq.covariance[i]![j]! * g[j]!
  return Math.max(s, 0)
}

function checkRange(t: unknown, range: { min: number; max: number }, what: string): number {
  if (typeof t !== 'number' || !Number.isFinite(t)) throw new EngineInputError('temperatureK', `must be a finite temperature in K, got ${String(t)}`)
  // a relative slack of 1e-12 lets values computed from the range ends (round trips) through
  if (t < range.min * (1 - 1e-12) || t > range.max * (1 + 1e-12)) {
    throw new EngineInputError(
      'temperatureK',
      `${t} K is outside the calibrated range of the ${what} (${range.min} K to ${range.max} K): the calibration equation is not extrapolated`,
    )
  }
  return t
}

/**
 * The calibration equation at an instrument reading: the temperature f(R), the correction f(R) − R and
 * the standard uncertainty √(gᵀV_p g) of f(R) from the fit (see the module notes).
 * @param eq - result of {@link fitCalibrationEquation}
 * @param temperatureK - the instrument's reading R, K, within the range of the points' readings
 * @returns readingK, referenceTemperatureK, correctionK, standardUncertaintyK, expandedUncertaintyK (K), coverageFactor
 * @throws EngineInputError on `temperatureK` (not finite, or outside [min R_i, max R_i])
 * @example linear fit through (400.5 K, 400 K), (500.2, 500), (600.4, 600), u = 0.5 K:
 *   calibrationEquationAtReading(eq, 500) → referenceTemperatureK ≈ 500.3667, standardUncertaintyK ≈ 0.2887
 */
export function calibrationEquationAtReading(eq: CalibrationEquation, temperatureK: number): CalibrationEquationValue {
  const R = checkRange(temperatureK, eq.readingRangeK, 'readings')
  const model = modelOf(eq)
  const g = new Array<number>(eq.parameters.length).fill(0)
  model.grad(R, eq.parameters, g)
  const T = model.f(R, eq.parameters)
  const su = Math.sqrt(gVg(eq, g))
  return { readingK: R, referenceTemperatureK: T, correctionK: T - R, standardUncertaintyK: su, expandedUncertaintyK: eq.coverageFactor * su, coverageFactor: eq.coverageFactor }
}

/**
 * The calibration equation at a reference (true) temperature: the reading R(T) the instrument is
 * expected to show (f(R) = T, solved by Newton's method from R = T), the correction T − R and the
 * standard uncertainty √(gᵀV_p g)/|∂f/∂R| of R(T) from the fit.
 * @param eq - result of {@link fitCalibrationEquation}
 * @param temperatureK - reference temperature T, K, within the range of the points' reference temperatures
 * @returns readingK, referenceTemperatureK, correctionK, standardUncertaintyK, expandedUncertaintyK (K), coverageFactor
 * @throws EngineInputError on `temperatureK` (not finite, or outside [min T_i, max T_i])
 * @example linear fit above: calibrationEquationAtReference(eq, 500.3667).readingK ≈ 500
 */
export function calibrationEquationAtReference(eq: CalibrationEquation, temperatureK: number): CalibrationEquationValue {
  const T = checkRange(temperatureK, eq.referenceRangeK, 'reference temperatures')
  const model = modelOf(eq)
  let R = T
  for (let i = 0; i < 100; i++) {
    const step = (model.f(R, eq.parameters) - T) / model.dfdR(R, eq.parameters)
    if (!Number.isFinite(step)) throw new EngineInputError('temperatureK', `the calibration equation cannot be inverted at ${T} K`)
    R -= step
    if (Math.abs(step) <= 1e-13 * R) break
  }
  const g = new Array<number>(eq.parameters.length).fill(0)
  model.grad(R, eq.parameters, g)
  const su = Math.sqrt(gVg(eq, g)) / Math.abs(model.dfdR(R, eq.parameters))
  return { readingK: R, referenceTemperatureK: T, correctionK: T - R, standardUncertaintyK: su, expandedUncertaintyK: eq.coverageFactor * su, coverageFactor: eq.coverageFactor }
}
