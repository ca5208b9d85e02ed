/**
 * The calibration equation a certificate of a spot or reference pyrometer states (issue 16): a
 * Sakuma–Hattori fit through the run's as-left points with the covariance of its parameters
 * (shared/radiometry/calibrationEquation.ts), and a table at temperatures the laboratory chose, each
 * with the instrument's expected reading, the correction and the expanded uncertainty of the
 * interpolated value. Pure and framework-free; the server computes it for the run page and the
 * certificate from the stored point results.
 *
 * Points. The as-left points: those marked as left in an adjusted run, every point of a run without an
 * adjustment (there the as-found results are the as-left ones). Each gives T_i (its reference
 * temperature), R_i (its mean reading) and the expanded uncertainty it states, U_i with its k_i (the
 * budget's k, or 2 where the laboratory's CMC was stated instead), u_i = U_i/k_i. A common correlation
 * coefficient r between the points' errors may be given (a shared reference source or thermometer
 * makes them correlated): K_ij = r for i ≠ j (JCGM 100:2008 5.2.2 with correlations, in the
 * generalized least squares of the fit).
 *
 * Table. At a reference temperature T inside [min T_i, max T_i] the equation gives the reading R(T)
 * the instrument shows, the correction T − R and u(R) = √(gᵀV_p g)/|∂f/∂R| (the propagation of the
 * parameters' covariance, JCGM 100:2008 eq. (13)); U = 2·u (k = 2, about 95 % for a normal
 * distribution). A temperature outside that range is refused: the equation is not extrapolated.
 */
import { EngineInputError } from '../radiometry/errors'
import { calibrationEquationAtReference, fitCalibrationEquation, type CalibrationEquation } from '../radiometry/calibrationEquation'
import type { Band } from '../radiometry/planck'
import type { BandInput } from '../types/runs'

/** One computed point of the run as the equation takes it. */
export interface EquationPoint {
  stage: 'as-found' | 'as-left'
  /** T_i, K. */
  referenceTemperatureK: number
  /** R_i, the mean reading, K. */
  meanReadingK: number
  /** U_i, the expanded uncertainty the point states, K. */
  expandedUncertaintyK: number
  /** k_i of U_i. */
  coverageFactor: number
}

/** One row of the interpolated table. */
export interface EquationRow {
  /** The reference (true) temperature chosen, K. */
  temperatureK: number
  /** The reading the instrument shows at it, from the equation, K. */
  readingK: number
  /** Temperature − reading, K (add it to a reading). */
  correctionK: number
  /** u of the interpolated reading from the parameters' covariance, K. */
  standardUncertaintyK: number
  /** k·u, K. */
  expandedUncertaintyK: number
}

/** The equation, its parameters and its table (plain data, JSON-safe). */
export interface EquationTable {
  model: 'sakuma-hattori'
  /** Which points were fitted: the as-left points ('as-left') or, without an adjustment, all points ('all'). */
  points: 'as-left' | 'all'
  pointCount: number
  /** Common correlation coefficient between the points' errors. */
  pointCorrelation: number
  /** A (µm), B (µm·K), C (1) with their standard uncertainties. */
  parameters: { name: string, value: number, unit: string, standardUncertainty: number }[]
  /** Covariance of the parameters (A, B, C). */
  covariance: number[][]
  /** The nominal band's A_n, B_n that turn a reading into the signal fitted (µm, µm·K). */
  nominal: { A: number, B: number }
  c2UmK: number
  chiSquared: number
  degreesOfFreedom: number
  /** The calibrated range: min and max of the points' reference temperatures, K. */
  rangeK: { min: number, max: number }
  /** k of the table's expanded uncertainties. */
  coverageFactor: number
  rows: EquationRow[]
}

/** A refusal of the equation, on the run's field `calibrationEquation…`. */
export const EQUATION_FIELD = 'calibrationEquation'

/**
 * The calibration equation through a run's as-left points and its table at the chosen temperatures
 * (see the module notes).
 * @param input - band: the instrument's nominal band (µm); points: the run's computed points (K);
 *   adjusted: whether the run records an adjustment; temperaturesK: the table's reference temperatures (K);
 *   pointCorrelation: r between the points (0 ≤ r < 1)
 * @returns the fitted equation with its parameters, covariance and table (K)
 * @throws EngineInputError on `calibrationEquation` (fewer than three as-left points, or a fit they do not
 *   determine) or `calibrationEquation.temperaturesK[i]` (outside the calibrated range)
 * @example three as-left points (T, R, U k = 2) of a 0.8–1.0 µm pyrometer, (873.15, 872.4, 1.6),
 *   (1073.15, 1072.1, 2.0), (1273.15, 1271.65, 2.4): the table row at 1073.15 K gives readingK = 1072.1
 *   and expandedUncertaintyK ≈ 2.0 K (three points, three parameters: the curve passes through them and
 *   takes their uncertainty there, divided by the slope dT/dR ≈ 1)
 */
export function equationTable(input: { band: BandInput, points: readonly EquationPoint[], adjusted: boolean, temperaturesK: readonly number[], pointCorrelation: number }): EquationTable {
  const used = input.adjusted ? input.points.filter(p => p.stage === 'as-left') : [...input.points]
  if (used.length < 3) {
    throw new EngineInputError(EQUATION_FIELD, `the Sakuma–Hattori equation has three parameters and needs at least three ${input.adjusted ? 'as-left ' : ''}points; this run has ${used.length}`)
  }
  const r = input.pointCorrelation
  if (!(typeof r === 'number' && r >= 0 && r < 1)) throw new EngineInputError(`${EQUATION_FIELD}.pointCorrelation`, `must be from 0 to below 1, got ${String(r)}`)
  const n = used.length
  let eq: CalibrationEquation
  try {
    eq = fitCalibrationEquation({
      points: used.map(p => ({ referenceTemperatureK: p.referenceTemperatureK, readingK: p.meanReadingK, expandedUncertaintyK: p.expandedUncertaintyK, coverageFactor: p.coverageFactor })),
      model: 'sakuma-hattori',
      band: input.band as Band,
      ...(r > 0 ? { correlation: used.map((_, i) => used.map((__, j) => (i === j ? 1 : r))) } : {}),
      coverageFactor: 2,
    })
  }
  catch (err) {
    if (err instanceof EngineInputError) {
      const text = err.message.startsWith(`${err.field}: `) ? err.message.slice(err.field.length + 2) : err.message
      throw new EngineInputError(err.field.startsWith('band') ? 'instrument.band' : EQUATION_FIELD, `the points give no calibration equation: ${text}`)
    }
    throw err
  }
  const rows = input.temperaturesK.map((t, i) => {
    try {
      const v = calibrationEquationAtReference(eq, t)
      return { temperatureK: t, readingK: v.readingK, correctionK: v.correctionK, standardUncertaintyK: v.standardUncertaintyK, expandedUncertaintyK: v.expandedUncertaintyK }
    }
    catch (err) {
      if (err instanceof EngineInputError) {
        const text = err.message.startsWith(`${err.field}: `) ? err.message.slice(err.field.length + 2) : err.message
        throw new EngineInputError(`${EQUATION_FIELD}.temperaturesK[${i}]`, text)
      }
      throw err
    }
  })
  return {
    model: 'sakuma-hattori',
    points: input.adjusted ? 'as-left' : 'all',
    pointCount: n,
    pointCorrelation: r,
    parameters: eq.parameterNames.map((name, i) => ({ name, value: eq.parameters[i]!, unit: eq.parameterUnits[i]!, standardUncertainty: eq.parameterStandardUncertainties[i]! })),
    covariance: eq.covariance,
    nominal: eq.nominal!,
    c2UmK: eq.c2UmK,
    chiSquared: eq.chiSquared,
    degreesOfFreedom: eq.degreesOfFreedom,
    rangeK: { min: eq.referenceRangeK.min, max: eq.referenceRangeK.max },
    coverageFactor: eq.coverageFactor,
    rows,
  }
}
