/**
 * Reading model of a radiation thermometer viewing a source: the expected reading and its
 * sensitivity coefficients.
 *
 * Measurement equation (the form used for wideband infrared thermometers in ASTM E2758 and
 * ASTM E2847; recalled from memory, see the domain notes):
 *
 *   ε_i·S(T_meas) + (1 − ε_i)·S(T_d) = ε_s·S(T_s) + (1 − ε_s)·S(T_w)
 *
 * ε_i instrument emissivity setting, T_d the instrument's own (detector) temperature, ε_s source
 * emissivity, T_s source temperature, T_w reflected (surroundings) temperature, S(T) the band radiance
 * of ./planck. Solving for T_meas gives the expected reading. With ε_i = ε_s and T_d = T_w the
 * instrument reads T_s exactly.
 *
 * Sensitivity coefficients ∂T_meas/∂x come from implicit differentiation of the equation, with
 * D = ε_i·S'(T_meas):
 *   ∂T/∂T_s = ε_s·S'(T_s)/D            ∂T/∂ε_s = (S(T_s) − S(T_w))/D
 *   ∂T/∂T_w = (1 − ε_s)·S'(T_w)/D      ∂T/∂T_d = −(1 − ε_i)·S'(T_d)/D
 *   ∂T/∂ε_i = −(S(T_meas) − S(T_d))/D
 * (tested against central differences).
 */

import { constantsUsed, resolveConstants, type ConstantsUsed, type RadiationConstants, type RadiationConstantsChoice } from './constants'
import { EngineInputError, requireEmissivity, requireTemperature } from './errors'
import { INVERSION_RANGE_K, invertUnchecked } from './inversion'
import { bandRadianceAndDerivativeUnchecked, bandRadianceUnchecked, needsPreparing, prepareBand, validateBand, type Band, type PreparedBand } from './planck'
import { readingModelFromTable, readingSignalTable, type ReadingModelOptions } from './signalTable'

/** Inputs of the reading model (the API's `expected-reading` body uses the same names). */
export interface ReadingInput {
  /** Instrument spectral band (µm) or tabulated responsivity, or a PreparedBand. */
  band: Band | PreparedBand
  /** Source (blackbody) temperature T_s, K. */
  sourceTemperatureK: number
  /** Source emissivity ε_s, in (0, 1]. */
  sourceEmissivity: number
  /** Reflected (surroundings) temperature T_w, K. */
  reflectedTemperatureK: number
  /** Instrument (detector) temperature T_d, K. */
  instrumentTemperatureK: number
  /** Instrument emissivity setting ε_i, in (0, 1]. */
  emissivitySetting: number
  /** Radiation constants (default CODATA 2018). */
  constants?: RadiationConstantsChoice
}

/** Result of {@link expectedReading}. */
export interface ExpectedReading {
  /** Expected reading T_meas, K. */
  expectedReadingK: number
  /** Band radiance the instrument attributes to the target, S(T_meas), W·m⁻²·sr⁻¹. */
  instrumentSignal: number
  /** The radiation constants used (id and c2 in m·K). */
  constants: ConstantsUsed
}

/** Sensitivity coefficients ∂T_meas/∂x of the reading model. */
export interface ReadingSensitivities {
  /** Expected reading T_meas, K. */
  expectedReadingK: number
  /** ∂T_meas/∂T_s, K/K. */
  sourceTemperature: number
  /** ∂T_meas/∂ε_s, K per unit emissivity. */
  sourceEmissivity: number
  /** ∂T_meas/∂T_w, K/K. */
  reflectedTemperature: number
  /** ∂T_meas/∂T_d, K/K. */
  instrumentTemperature: number
  /** ∂T_meas/∂ε_i, K per unit emissivity. */
  emissivitySetting: number
}

const OUT = new Float64Array(2)

function validate(input: ReadingInput): RadiationConstants {
  if (typeof input !== 'object' || input === null) throw new EngineInputError('band', 'reading input must be an object')
  validateBand(input.band)
  requireTemperature(input.sourceTemperatureK, 'sourceTemperatureK')
  requireEmissivity(input.sourceEmissivity, 'sourceEmissivity')
  requireTemperature(input.reflectedTemperatureK, 'reflectedTemperatureK')
  requireTemperature(input.instrumentTemperatureK, 'instrumentTemperatureK')
  requireEmissivity(input.emissivitySetting, 'emissivitySetting')
  return resolveConstants(input.constants)
}

/**
 * @internal Expected reading with validated inputs, K. Throws EngineInputError when the instrument
 * side would need a negative signal or the result is outside the inversion range.
 */
export function expectedReadingUnchecked(
  band: Band | PreparedBand,
  ts: number,
  es: number,
  tw: number,
  td: number,
  ei: number,
  c: RadiationConstants,
): number {
  // S and S' at T_s: the reading is usually within a few kelvins of T_s, so T_s is the starting
  // point of the inversion and its S, S' are reused for the first Newton step
  bandRadianceAndDerivativeUnchecked(band, ts, c, OUT)
  const ss = OUT[0]!
  const dss = OUT[1]!
  const sw = es === 1 ? 0 : bandRadianceUnchecked(band, tw, c)
  const sd = ei === 1 ? 0 : bandRadianceUnchecked(band, td, c)
  const sMeas = (es * ss + (1 - es) * sw - (1 - ei) * sd) / ei
  if (!(sMeas > 0) || !Number.isFinite(sMeas)) throw negativeSignal(sMeas)
  try {
    return invertUnchecked(band, sMeas, c, INVERSION_RANGE_K.min, INVERSION_RANGE_K.max, ts, 'sourceTemperatureK', ss, dss)
  } catch (e) {
    if (e instanceof EngineInputError) {
      throw new EngineInputError(
        'sourceTemperatureK',
        `the expected reading is outside the inversion range ${INVERSION_RANGE_K.min} K to ${INVERSION_RANGE_K.max} K (${e.message})`,
      )
    }
    throw e
  }
}

/** @internal As {@link expectedReadingUnchecked} but NaN instead of an error (for Monte Carlo trials). */
export function expectedReadingOrNaN(
  band: Band | PreparedBand,
  ts: number,
  es: number,
  tw: number,
  td: number,
  ei: number,
  c: RadiationConstants,
): number {
  bandRadianceAndDerivativeUnchecked(band, ts, c, OUT)
  const ss = OUT[0]!
  const dss = OUT[1]!
  const sw = es === 1 ? 0 : bandRadianceUnchecked(band, tw, c)
  const sd = ei === 1 ? 0 : bandRadianceUnchecked(band, td, c)
  const sMeas = (es * ss + (1 - es) * sw - (1 - ei) * sd) / ei
  if (!(sMeas > 0) || !Number.isFinite(sMeas)) return Number.NaN
  return invertUnchecked(band, sMeas, c, INVERSION_RANGE_K.min, INVERSION_RANGE_K.max, ts, 'sourceTemperatureK', ss, dss)
}

function negativeSignal(s: number): EngineInputError {
  return new EngineInputError(
    'instrumentTemperatureK',
    `the instrument would need a signal of ${s.toPrecision(4)} W·m⁻²·sr⁻¹ (≤ 0): the term (1 − emissivitySetting)·S(instrumentTemperatureK) exceeds the radiance from the source and its surroundings, so no reading satisfies the model`,
  )
}

/**
 * Expected reading of a radiation thermometer viewing a source: solves
 * ε_i·S(T_meas) + (1 − ε_i)·S(T_d) = ε_s·S(T_s) + (1 − ε_s)·S(T_w) for T_meas (ASTM E2758/E2847 form).
 * ≈ 1 µs for a rectangular band; prepare a tabulated band once with prepareBand for repeated calls.
 * @param input - band; sourceTemperatureK, reflectedTemperatureK, instrumentTemperatureK in K;
 *   sourceEmissivity, emissivitySetting in (0, 1]; constants (default CODATA 2018)
 * @returns expectedReadingK (K), instrumentSignal S(T_meas) (W·m⁻²·sr⁻¹) and the constants used
 *   (`constants.id`, `constants.c2` in m·K)
 * @throws EngineInputError with the field at fault; `instrumentTemperatureK` when the instrument side
 *   would need a negative signal; `sourceTemperatureK` when the reading is outside 50 K to 5000 K
 * @example a 0.95 plate at 373.15 K, surroundings and instrument at 296.15 K, ε_i = 1, 8–14 µm:
 *   expectedReading(...).expectedReadingK ≈ 370.08 K (reads ≈ 3.1 K low)
 */
export function expectedReading(input: ReadingInput): ExpectedReading {
  const c = validate(input)
  const band = needsPreparing(input.band) ? prepareBand(input.band) : input.band
  const { sourceTemperatureK: ts, sourceEmissivity: es, reflectedTemperatureK: tw, instrumentTemperatureK: td, emissivitySetting: ei } = input
  const t = expectedReadingUnchecked(band, ts, es, tw, td, ei, c)
  return { expectedReadingK: t, instrumentSignal: bandRadianceUnchecked(band, t, c), constants: constantsUsed(c) }
}

/**
 * Expected reading as a plain number, K (same as {@link expectedReading}, without the result object).
 * @param input - see {@link ReadingInput}
 * @returns T_meas, K
 * @example expectedReadingK({ band: { kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 }, sourceTemperatureK: 373.15,
 *   sourceEmissivity: 1, reflectedTemperatureK: 296.15, instrumentTemperatureK: 296.15, emissivitySetting: 1 }) === 373.15 (to 1e-9 K)
 */
export function expectedReadingK(input: ReadingInput): number {
  const c = validate(input)
  const band = needsPreparing(input.band) ? prepareBand(input.band) : input.band
  return expectedReadingUnchecked(
    band,
    input.sourceTemperatureK,
    input.sourceEmissivity,
    input.reflectedTemperatureK,
    input.instrumentTemperatureK,
    input.emissivitySetting,
    c,
  )
}

/**
 * Sensitivity coefficients of the expected reading, ∂T_meas/∂x, by implicit differentiation of the
 * reading model with the closed-form dS/dT (see the module notes for the formulas).
 * @param input - see {@link ReadingInput}
 * @returns expectedReadingK (K); sourceTemperature, reflectedTemperature, instrumentTemperature (K/K);
 *   sourceEmissivity, emissivitySetting (K per unit emissivity); the constants used are those of
 *   {@link expectedReading} for the same input (`constants`)
 * @throws EngineInputError as {@link expectedReading}
 * @example 8–14 µm, plate ε_s = 0.95 at 373.15 K, T_w = T_d = 296.15 K, ε_i = 0.95:
 *   sourceEmissivity ≈ 64 K per unit emissivity (≈ 0.64 K per 0.01)
 */
export function readingSensitivities(input: ReadingInput): ReadingSensitivities {
  const c = validate(input)
  const band = needsPreparing(input.band) ? prepareBand(input.band) : input.band
  const { sourceTemperatureK: ts, sourceEmissivity: es, reflectedTemperatureK: tw, instrumentTemperatureK: td, emissivitySetting: ei } = input
  const tm = expectedReadingUnchecked(band, ts, es, tw, td, ei, c)
  bandRadianceAndDerivativeUnchecked(band, tm, c, OUT)
  const sm = OUT[0]!
  const dsm = OUT[1]!
  bandRadianceAndDerivativeUnchecked(band, ts, c, OUT)
  const ss = OUT[0]!
  const dss = OUT[1]!
  bandRadianceAndDerivativeUnchecked(band, tw, c, OUT)
  const sw = OUT[0]!
  const dsw = OUT[1]!
  bandRadianceAndDerivativeUnchecked(band, td, c, OUT)
  const sd = OUT[0]!
  const dsd = OUT[1]!
  const D = ei * dsm
  return {
    expectedReadingK: tm,
    sourceTemperature: (es * dss) / D,
    sourceEmissivity: (ss - sw) / D,
    reflectedTemperature: ((1 - es) * dsw) / D,
    instrumentTemperature: (-(1 - ei) * dsd) / D,
    emissivitySetting: -(sm - sd) / D,
  }
}

/**
 * A reading-model function for Monte Carlo propagation: x = [T_s (K), ε_s, T_w (K), T_d (K), ε_i]
 * → T_meas (K). The band is prepared once. Sampled inputs are not range-checked (a sampled ε_s
 * slightly above 1 still computes); a trial whose instrument signal would be ≤ 0 returns NaN.
 * For a tabulated band, `options.temperatureRangeK` makes every trial go through a
 * SignalTable over that range (≈ 40× faster per trial with 33 points, 170× with 121; results
 * within 1e-9 K of the exact model, measured ~1e-10 K; exact
 * outside the range): see ./signalTable.
 * @param band - band or PreparedBand
 * @param constants - radiation constants (default CODATA 2018)
 * @param options - temperatureRangeK: {min, max} in K the trials visit (tabulated bands only)
 * @returns model function, K
 * @example const f = readingModel({ kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 }); f([373.15, 1, 296, 296, 1]) ≈ 373.15
 */
export function readingModel(
  band: Band | PreparedBand,
  constants?: RadiationConstantsChoice,
  options?: ReadingModelOptions,
): (x: ArrayLike<number>) => number {
  const p = needsPreparing(band) ? prepareBand(band) : (validateBand(band), band)
  const c = resolveConstants(constants)
  const table = options !== undefined && band.kind === 'tabulated' ? readingSignalTable(p as PreparedBand, c, options) : null
  if (table !== null) return readingModelFromTable(table)
  return (x: ArrayLike<number>): number => expectedReadingOrNaN(p, x[0]!, x[1]!, x[2]!, x[3]!, x[4]!, c)
}
