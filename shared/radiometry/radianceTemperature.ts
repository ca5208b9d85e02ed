/**
 * Reference values stated as a radiance temperature, and the reading they imply in another band.
 *
 * A radiance temperature T_rad of a source in a band b0 is the temperature of the blackbody with the
 * same band radiance in b0: what an ideal instrument of band b0 with emissivity setting 1 reads. It
 * includes the radiation of the surroundings reflected by the source when it was certified (common
 * practice for flat-plate sources; see the domain notes, §7). With the source emissivity ε_s and the
 * reflected temperature T_w0 at certification, the surface temperature T_s satisfies
 *
 *   ε_s·S_b0(T_s) + (1 − ε_s)·S_b0(T_w0) = S_b0(T_rad)                                   (1)
 *
 * and the instrument of band b, with today's reflected temperature T_w, its own temperature T_d and
 * emissivity setting ε_i, is expected to read T_meas from the reading model of ./reading
 * (ASTM E2758 / E2847 form, recalled from memory):
 *
 *   ε_i·S_b(T_meas) + (1 − ε_i)·S_b(T_d) = ε_s·S_b(T_s) + (1 − ε_s)·S_b(T_w)             (2)
 *
 * S_b(T) = ∫ R_b(λ) L(λ, T) dλ is the band radiance of ./planck. In the same band with T_w = T_w0,
 * (1) and (2) give ε_i·S(T_meas) + (1 − ε_i)·S(T_d) = S(T_rad), so an instrument with ε_i = 1 reads
 * T_rad whatever ε_s is.
 *
 * Sensitivities by implicit differentiation (D0 = ε_s·S'_b0(T_s)):
 *   ∂T_s/∂T_rad = S'_b0(T_rad)/D0     ∂T_s/∂ε_s = −(S_b0(T_s) − S_b0(T_w0))/D0     ∂T_s/∂T_w0 = −(1 − ε_s)·S'_b0(T_w0)/D0
 * and, with g the reading model (2) and its partial derivatives from ./reading,
 *   dT_meas/dT_rad = g_Ts·∂T_s/∂T_rad          dT_meas/dε_s = g_εs + g_Ts·∂T_s/∂ε_s (ε_s enters both steps)
 *   dT_meas/dT_w0 = g_Ts·∂T_s/∂T_w0            dT_meas/dT_w, /dT_d, /dε_i = g_Tw, g_Td, g_εi.
 * Tested against central differences and against an independent scipy computation
 * (tests/reference/radiance_temperature.py: scipy.integrate.quad and scipy.optimize.brentq).
 *
 * Both equations are solved by the safeguarded Newton inversion of ./inversion followed by one more
 * Newton step on the band radiance, so that the same-band identity T_meas = T_rad holds to ~1e-12 K.
 */

import { constantsUsed, resolveConstants, type ConstantsUsed, type RadiationConstants, type RadiationConstantsChoice } from './constants'
import { EngineInputError, requireEmissivity, requireTemperature } from './errors'
import { guessFor, INVERSION_RANGE_K, invertUnchecked } from './inversion'
import { bandRadianceAndDerivativeUnchecked, bandRadianceUnchecked, needsPreparing, prepareBand, validateBand, type Band, type PreparedBand } from './planck'

/** Input of {@link surfaceTemperatureFromRadianceTemperature}. */
export interface RadianceTemperatureInput {
  /** Band b0 the radiance temperature was certified in (µm), or a PreparedBand. */
  band: Band | PreparedBand
  /** Radiance temperature T_rad in band b0, K. */
  radianceTemperatureK: number
  /** Source emissivity ε_s, in (0, 1]. */
  sourceEmissivity: number
  /** Reflected (surroundings) temperature T_w0 when the radiance temperature was certified, K. */
  reflectedTemperatureK: number
  /** Radiation constants (default CODATA 2018). */
  constants?: RadiationConstantsChoice
}

/** Input of {@link expectedReadingFromRadianceTemperature} (a radiance-temperature basis for the reference). */
export interface RadianceTemperatureReadingInput {
  /** Band b0 the radiance temperature belongs to (µm), or a PreparedBand. */
  radianceTemperatureBand: Band | PreparedBand
  /** Radiance temperature T_rad of the source in band b0, K. */
  radianceTemperatureK: number
  /** Source emissivity ε_s, in (0, 1]. */
  sourceEmissivity: number
  /** Reflected temperature T_w0 at the certification of T_rad, K. */
  certificationReflectedTemperatureK: number
  /** The instrument's band b (µm), or a PreparedBand. */
  band: Band | PreparedBand
  /** Reflected temperature T_w today, K. */
  reflectedTemperatureK: number
  /** Instrument (detector) temperature T_d, K. */
  instrumentTemperatureK: number
  /** Instrument emissivity setting ε_i, in (0, 1]. */
  emissivitySetting: number
  /** Radiation constants (default CODATA 2018), used for both bands. */
  constants?: RadiationConstantsChoice
}

/** Sensitivity coefficients dT_meas/dx of the expected reading on a radiance-temperature basis. */
export interface RadianceTemperatureSensitivities {
  /** dT_meas/dT_rad, K/K. */
  radianceTemperature: number
  /** dT_meas/dε_s (through T_s and the reading model), K per unit emissivity. */
  sourceEmissivity: number
  /** dT_meas/dT_w0, K/K. */
  certificationReflectedTemperature: number
  /** dT_meas/dT_w, K/K. */
  reflectedTemperature: number
  /** dT_meas/dT_d, K/K. */
  instrumentTemperature: number
  /** dT_meas/dε_i, K per unit emissivity. */
  emissivitySetting: number
}

/** Result of {@link expectedReadingFromRadianceTemperature}. */
export interface RadianceTemperatureReading {
  /** Expected reading T_meas, K. */
  expectedReadingK: number
  /** Surface temperature T_s of the source found from (1), K. */
  sourceTemperatureK: number
  /** Partial derivatives of T_s from (1): ∂T_s/∂T_rad (K/K), ∂T_s/∂ε_s (K), ∂T_s/∂T_w0 (K/K). */
  sourceTemperatureSensitivities: { radianceTemperature: number, sourceEmissivity: number, certificationReflectedTemperature: number }
  /** dT_meas/dx for every input. */
  sensitivities: RadianceTemperatureSensitivities
  /** The radiation constants used (id and c2 in m·K). */
  constants: ConstantsUsed
}

const OUT = new Float64Array(2)

/**
 * Temperature whose band radiance is `signal`, K: the safeguarded Newton inversion, then one Newton
 * step on S itself (the inversion stops at a step of 2e-6·T; the extra step takes the error from
 * ~1e-9 K to rounding level).
 */
function solveTemperature(band: Band | PreparedBand, signal: number, c: RadiationConstants, guess: number, field: string): number {
  const start = guess > INVERSION_RANGE_K.min && guess < INVERSION_RANGE_K.max ? guess : guessFor(band, signal, c)
  let t = invertUnchecked(band, signal, c, INVERSION_RANGE_K.min, INVERSION_RANGE_K.max, start, field)
  bandRadianceAndDerivativeUnchecked(band, t, c, OUT)
  if (OUT[1]! > 0) {
    const step = (signal - OUT[0]!) / OUT[1]!
    if (Math.abs(step) < 1e-6 * t) t += step
  }
  return t
}

/** @internal T_s from (1) with validated inputs, K; EngineInputError naming `field` when there is none. */
export function surfaceTemperatureUnchecked(
  band: Band | PreparedBand,
  tRad: number,
  es: number,
  tw0: number,
  c: RadiationConstants,
  field = 'radianceTemperatureK',
): number {
  if (es === 1) return tRad
  const sRad = bandRadianceUnchecked(band, tRad, c)
  const sw = bandRadianceUnchecked(band, tw0, c)
  const need = (sRad - (1 - es) * sw) / es
  if (!(need > 0) || !Number.isFinite(need)) {
    throw new EngineInputError(
      field,
      `no surface temperature gives this radiance temperature: the reflected part (1 − ε_s)·S(T_w0) = ${((1 - es) * sw).toPrecision(4)} W·m⁻²·sr⁻¹ is at least the band radiance S(T_rad) = ${sRad.toPrecision(4)} W·m⁻²·sr⁻¹, so the source would have to emit a negative radiance (T_rad too low for this ε_s and T_w0)`,
    )
  }
  try {
    return solveTemperature(band, need, c, tRad, field)
  } catch (e) {
    if (e instanceof EngineInputError) {
      throw new EngineInputError(field, `the surface temperature is outside the inversion range ${INVERSION_RANGE_K.min} K to ${INVERSION_RANGE_K.max} K (${e.message})`)
    }
    throw e
  }
}

function prepared(band: Band | PreparedBand): Band | PreparedBand {
  validateBand(band)
  return needsPreparing(band) ? prepareBand(band) : band
}

function prefixBand(e: unknown, prefix: string): never {
  if (e instanceof EngineInputError && e.field.startsWith('band')) {
    throw new EngineInputError(`${prefix}${e.field.slice(4)}`, e.message.startsWith(`${e.field}: `) ? e.message.slice(e.field.length + 2) : e.message)
  }
  throw e
}

/**
 * Surface temperature T_s of a source from its radiance temperature in band b0: solves
 * ε_s·S_b0(T_s) + (1 − ε_s)·S_b0(T_w0) = S_b0(T_rad) (domain notes §7; equation (1) of the module notes).
 * @param input - band b0 (µm); radianceTemperatureK T_rad (K); sourceEmissivity ε_s in (0, 1];
 *   reflectedTemperatureK T_w0 at certification (K); constants (default CODATA 2018)
 * @returns T_s, K
 * @throws EngineInputError: `band…`, `radianceTemperatureK` (also when (1) has no solution: the reflected
 *   part alone exceeds S(T_rad), or T_s is outside 50 K to 5000 K), `sourceEmissivity`, `reflectedTemperatureK`,
 *   `constants`
 * @example 8–14 µm, T_rad = 373.15 K, ε_s = 0.95, T_w0 = 296.15 K → T_s ≈ 376.3 K (the plate is hotter
 *   than its radiance temperature)
 */
export function surfaceTemperatureFromRadianceTemperature(input: RadianceTemperatureInput): number {
  if (typeof input !== 'object' || input === null) throw new EngineInputError('band', 'input must be an object')
  const band = prepared(input.band)
  requireTemperature(input.radianceTemperatureK, 'radianceTemperatureK')
  requireEmissivity(input.sourceEmissivity, 'sourceEmissivity')
  requireTemperature(input.reflectedTemperatureK, 'reflectedTemperatureK')
  const c = resolveConstants(input.constants)
  return surfaceTemperatureUnchecked(band, input.radianceTemperatureK, input.sourceEmissivity, input.reflectedTemperatureK, c)
}

interface Checked {
  b0: Band | PreparedBand
  b: Band | PreparedBand
  c: RadiationConstants
}

function check(input: RadianceTemperatureReadingInput): Checked {
  if (typeof input !== 'object' || input === null) throw new EngineInputError('band', 'input must be an object')
  let b0: Band | PreparedBand
  try {
    b0 = prepared(input.radianceTemperatureBand)
  } catch (e) {
    prefixBand(e, 'radianceTemperatureBand')
  }
  const b = prepared(input.band)
  requireTemperature(input.radianceTemperatureK, 'radianceTemperatureK')
  requireEmissivity(input.sourceEmissivity, 'sourceEmissivity')
  requireTemperature(input.certificationReflectedTemperatureK, 'certificationReflectedTemperatureK')
  requireTemperature(input.reflectedTemperatureK, 'reflectedTemperatureK')
  requireTemperature(input.instrumentTemperatureK, 'instrumentTemperatureK')
  requireEmissivity(input.emissivitySetting, 'emissivitySetting')
  return { b0, b, c: resolveConstants(input.constants) }
}

/** @internal T_meas from (2) with validated inputs (polished like T_s), K. */
function readingUnchecked(b: Band | PreparedBand, ts: number, es: number, tw: number, td: number, ei: number, c: RadiationConstants): number {
  const ss = bandRadianceUnchecked(b, ts, c)
  const sw = es === 1 ? 0 : bandRadianceUnchecked(b, tw, c)
  const sd = ei === 1 ? 0 : bandRadianceUnchecked(b, td, c)
  const sMeas = (es * ss + (1 - es) * sw - (1 - ei) * sd) / ei
  if (!(sMeas > 0) || !Number.isFinite(sMeas)) {
    throw new EngineInputError(
      'instrumentTemperatureK',
      `the instrument would need a signal of ${sMeas.toPrecision(4)} W·m⁻²·sr⁻¹ (≤ 0): the term (1 − emissivitySetting)·S(instrumentTemperatureK) exceeds the radiance from the source and its surroundings, so no reading satisfies the model`,
    )
  }
  try {
    return solveTemperature(b, sMeas, c, ts, 'radianceTemperatureK')
  } catch (e) {
    if (e instanceof EngineInputError) {
      throw new EngineInputError('radianceTemperatureK', `the expected reading is outside the inversion range ${INVERSION_RANGE_K.min} K to ${INVERSION_RANGE_K.max} K (${e.message})`)
    }
    throw e
  }
}

/**
 * Expected reading of an instrument of band b viewing a source whose reference value is a radiance
 * temperature in band b0: T_s from (1), then the reading model (2) with today's T_w, T_d and ε_i,
 * with the sensitivity of T_meas to every input (implicit differentiation; see the module notes).
 * @param input - radianceTemperatureBand b0 and band b (µm); radianceTemperatureK, certificationReflectedTemperatureK,
 *   reflectedTemperatureK, instrumentTemperatureK (K); sourceEmissivity, emissivitySetting in (0, 1]; constants
 * @returns expectedReadingK and sourceTemperatureK (K), sensitivities (K/K or K per unit emissivity), constants used
 * @throws EngineInputError: `radianceTemperatureBand…`, `band…`, `radianceTemperatureK`, `sourceEmissivity`,
 *   `certificationReflectedTemperatureK`, `reflectedTemperatureK`, `instrumentTemperatureK` (instrument side
 *   would need a negative signal), `emissivitySetting`, `constants`
 * @example same band 8–14 µm, ε_i = 1, T_w = T_w0: expectedReadingK = radianceTemperatureK (to ~1e-12 K);
 *   certified 8–14 µm at T_rad = 373.15 K, ε_s = 0.95, T_w0 = 296.15 K; instrument 2.0–2.4 µm, ε_i = 0.95,
 *   T_w = T_d = 296.15 K → T_s ≈ 376.3 K, expectedReadingK ≈ 376.3 K
 */
export function expectedReadingFromRadianceTemperature(input: RadianceTemperatureReadingInput): RadianceTemperatureReading {
  const { b0, b, c } = check(input)
  const { radianceTemperatureK: tRad, sourceEmissivity: es, certificationReflectedTemperatureK: tw0, reflectedTemperatureK: tw, instrumentTemperatureK: td, emissivitySetting: ei } = input
  const ts = surfaceTemperatureUnchecked(b0, tRad, es, tw0, c)
  const tm = readingUnchecked(b, ts, es, tw, td, ei, c)

  // step (1): ∂T_s/∂x
  bandRadianceAndDerivativeUnchecked(b0, ts, c, OUT)
  const s0s = OUT[0]!
  const d0s = OUT[1]!
  bandRadianceAndDerivativeUnchecked(b0, tRad, c, OUT)
  const d0rad = OUT[1]!
  bandRadianceAndDerivativeUnchecked(b0, tw0, c, OUT)
  const s0w0 = OUT[0]!
  const d0w0 = OUT[1]!
  const D0 = es * d0s
  const tsRad = d0rad / D0
  const tsEs = -(s0s - s0w0) / D0
  const tsW0 = (-(1 - es) * d0w0) / D0

  // step (2): the reading model's partial derivatives at (T_s, ε_s, T_w, T_d, ε_i)
  bandRadianceAndDerivativeUnchecked(b, tm, c, OUT)
  const sm = OUT[0]!
  const dsm = OUT[1]!
  bandRadianceAndDerivativeUnchecked(b, ts, c, OUT)
  const ss = OUT[0]!
  const dss = OUT[1]!
  bandRadianceAndDerivativeUnchecked(b, tw, c, OUT)
  const sw = OUT[0]!
  const dsw = OUT[1]!
  bandRadianceAndDerivativeUnchecked(b, td, c, OUT)
  const sd = OUT[0]!
  const dsd = OUT[1]!
  const D = ei * dsm
  const gTs = (es * dss) / D
  const gEs = (ss - sw) / D

  return {
    expectedReadingK: tm,
    sourceTemperatureK: ts,
    sourceTemperatureSensitivities: { radianceTemperature: tsRad, sourceEmissivity: tsEs, certificationReflectedTemperature: tsW0 },
    sensitivities: {
      radianceTemperature: gTs * tsRad,
      sourceEmissivity: gEs + gTs * tsEs,
      certificationReflectedTemperature: gTs * tsW0,
      reflectedTemperature: ((1 - es) * dsw) / D,
      instrumentTemperature: (-(1 - ei) * dsd) / D,
      emissivitySetting: -(sm - sd) / D,
    },
    constants: constantsUsed(c),
  }
}

/**
 * The expected reading on a radiance-temperature basis as a plain number, K (see
 * {@link expectedReadingFromRadianceTemperature}; no sensitivities).
 * @param input - see {@link RadianceTemperatureReadingInput}
 * @returns T_meas, K
 * @example same band, ε_i = 1, T_w = T_w0 → radianceTemperatureK
 */
export function expectedReadingFromRadianceTemperatureK(input: RadianceTemperatureReadingInput): number {
  const { b0, b, c } = check(input)
  const ts = surfaceTemperatureUnchecked(b0, input.radianceTemperatureK, input.sourceEmissivity, input.certificationReflectedTemperatureK, c)
  return readingUnchecked(b, ts, input.sourceEmissivity, input.reflectedTemperatureK, input.instrumentTemperatureK, input.emissivitySetting, c)
}

/**
 * A model function for Monte Carlo propagation on a radiance-temperature basis:
 * x = [T_rad (K), ε_s, T_w0 (K), T_w (K), T_d (K), ε_i] → T_meas (K). Both bands are prepared once.
 * Sampled inputs are not range-checked; a trial with no solution (negative signal, outside 50 K to
 * 5000 K) returns NaN.
 * @param radianceTemperatureBand - band b0 of the radiance temperature
 * @param band - the instrument's band b
 * @param constants - radiation constants (default CODATA 2018)
 * @returns model function, K
 * @example radianceTemperatureReadingModel(LW, LW)([373.15, 0.95, 296.15, 296.15, 296.15, 1]) ≈ 373.15
 */
export function radianceTemperatureReadingModel(
  radianceTemperatureBand: Band | PreparedBand,
  band: Band | PreparedBand,
  constants?: RadiationConstantsChoice,
): (x: ArrayLike<number>) => number {
  let b0: Band | PreparedBand
  try {
    b0 = prepared(radianceTemperatureBand)
  } catch (e) {
    prefixBand(e, 'radianceTemperatureBand')
  }
  const b = prepared(band)
  const c = resolveConstants(constants)
  return (x: ArrayLike<number>): number => {
    try {
      const ts = surfaceTemperatureUnchecked(b0, x[0]!, x[1]!, x[2]!, c)
      return readingUnchecked(b, ts, x[1]!, x[3]!, x[4]!, x[5]!, c)
    } catch (e) {
      if (e instanceof EngineInputError) return Number.NaN
      throw e
    }
  }
}
