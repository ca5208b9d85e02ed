/**
 * Ratio (two-colour) pyrometer: the expected reading and its sensitivity coefficients.
 *
 * Measurement model (the definition in the domain notes, §7, "Ratio (two-colour) pyrometer"; the
 * two-colour principle itself is textbook radiation thermometry, e.g. D. P. DeWitt and G. D. Nutter,
 * Theory and Practice of Radiation Thermometry, Wiley 1988, recalled from memory):
 *
 *   S_i = ε_i·L_i(T_s) + (1 − ε_i)·L_i(T_w),   i = 1, 2
 *   L_1(T_R) / L_2(T_R) = (S_1 / S_2) / k
 *
 * L_i(T) the blackbody band radiance in band i (rectangular or tabulated responsivity, ./planck),
 * ε_i the SOURCE emissivity in band i, T_s the source temperature, T_w the reflected (surroundings)
 * temperature, k the instrument's emissivity-ratio ("slope") setting, nominally ε_1/ε_2. A grey
 * source (ε_1 = ε_2) without reflection read at k = 1 gives T_R = T_s whatever ε is; the instrument's
 * own (detector) temperature does not enter this model.
 *
 * Bands. Band 1 must lie entirely at shorter wavelengths than band 2: the upper end of band 1's
 * responsivity support must not exceed the lower end of band 2's (they may touch, as 0.95–1.00 µm and
 * 1.00–1.05 µm do). Then r(T) = L_1(T)/L_2(T) is strictly increasing in T: d ln L_i/dT is the
 * L_i-weighted mean of x·eˣ/((eˣ − 1)·T), x = c2/(λT), which increases with x, i.e. decreases with λ;
 * every wavelength of band 1 is ≤ every wavelength of band 2, so d ln L_1/dT > d ln L_2/dT. Overlapping
 * bands (monotonicity not guaranteed, ratio insensitive) and reversed bands are refused with an
 * {@link EngineInputError} on `band2`. To use an instrument whose ratio is long/short, swap the bands
 * and the emissivities and use 1/k as the setting. The support of a tabulated band is where its
 * responsivity is above zero (zero-response end points of a table do not count as overlap).
 *
 * Solution. g(T) = ln L_1(T) − ln L_2(T) − ln((S_1/S_2)/k) is solved by a bracketed Newton iteration
 * in u = 1/T (in the Wien limit g is linear in 1/T, so narrow bands converge in one step), starting at
 * T_s; a step that leaves the bracket [lo, hi] is replaced by the geometric bisection √(lo·hi), so the
 * iteration cannot diverge. Stopping: Newton step below 1e-9·T (the error after it is of order
 * 1e-18·T) or bracket narrower than 1e-12·T. Range: 50 K to 5000 K, as ./inversion
 * ({@link INVERSION_RANGE_K}); a band radiance that underflows to zero at a very low trial temperature
 * counts as "ratio too small", which is its limit.
 *
 * Sensitivity coefficients by implicit differentiation of F = ln r(T_R) − ln S_1 + ln S_2 + ln k = 0,
 * with D = L_1'(T_R)/L_1(T_R) − L_2'(T_R)/L_2(T_R) (> 0):
 *   ∂T_R/∂T_s  = [ε_1·L_1'(T_s)/S_1 − ε_2·L_2'(T_s)/S_2] / D
 *   ∂T_R/∂ε_1  = [(L_1(T_s) − L_1(T_w))/S_1] / D
 *   ∂T_R/∂ε_2  = −[(L_2(T_s) − L_2(T_w))/S_2] / D
 *   ∂T_R/∂T_w  = [(1 − ε_1)·L_1'(T_w)/S_1 − (1 − ε_2)·L_2'(T_w)/S_2] / D
 *   ∂T_R/∂k    = −1/(k·D)
 * (tested against central differences). In the Wien limit with monochromatic bands λ_1 < λ_2 these
 * reduce to the familiar 1/T_R − 1/T_s = (λ_1λ_2/(c2(λ_2 − λ_1)))·ln(k·ε_2/ε_1).
 */

import { resolveConstants, type RadiationConstants, type RadiationConstantsChoice } from './constants'
import { EngineInputError, requireEmissivity, requireTemperature } from './errors'
import { INVERSION_RANGE_K } from './inversion'
import { bandRadianceAndDerivativeUnchecked, PreparedBand, prepareBand, type Band } from './planck'

/** Inputs of the ratio-pyrometer model (the API body uses the same names). */
export interface RatioReadingInput {
  /** Short-wavelength band (µm) or tabulated responsivity, or a PreparedBand. */
  band1: Band | PreparedBand
  /** Long-wavelength band (µm) or tabulated responsivity; entirely at or above band1's upper end. */
  band2: Band | PreparedBand
  /** Source temperature T_s, K (> 0). */
  sourceTemperatureK: number
  /** Source emissivity in band 1, ε_1, in (0, 1]. */
  sourceEmissivity1: number
  /** Source emissivity in band 2, ε_2, in (0, 1]. */
  sourceEmissivity2: number
  /** Reflected (surroundings) temperature T_w, K (> 0). */
  reflectedTemperatureK: number
  /** Instrument emissivity-ratio ("slope") setting k (> 0), nominally ε_1/ε_2. */
  emissivityRatioSetting: number
  /** Radiation constants (default CODATA 2018). */
  constants?: RadiationConstantsChoice
}

/** Sensitivity coefficients ∂T_R/∂x of the ratio reading. */
export interface RatioReadingSensitivities {
  /** ∂T_R/∂T_s, K/K. */
  sourceTemperature: number
  /** ∂T_R/∂ε_1, K per unit emissivity. */
  sourceEmissivity1: number
  /** ∂T_R/∂ε_2, K per unit emissivity. */
  sourceEmissivity2: number
  /** ∂T_R/∂T_w, K/K. */
  reflectedTemperature: number
  /** ∂T_R/∂k, K per unit of the ratio setting. */
  emissivityRatioSetting: number
}

/** Result of {@link expectedRatioReading}. */
export interface RatioReading {
  /** Expected ratio reading T_R, K. */
  expectedReadingK: number
  /** Band-1 signal S_1 = ε_1·L_1(T_s) + (1 − ε_1)·L_1(T_w), W·m⁻²·sr⁻¹. */
  signal1: number
  /** Band-2 signal S_2, W·m⁻²·sr⁻¹. */
  signal2: number
  sensitivities: RatioReadingSensitivities
}

/** Order of the inputs of {@link ratioReadingModel}'s argument vector x. */
export const RATIO_MODEL_INPUTS = Object.freeze([
  'sourceTemperatureK',
  'sourceEmissivity1',
  'sourceEmissivity2',
  'reflectedTemperatureK',
  'emissivityRatioSetting',
] as const)

/** Re-labels a band validation error (`band…`) with the field of this model (`band1…`, `band2…`). */
function prepareNamed(band: Band | PreparedBand, field: 'band1' | 'band2'): Band | PreparedBand {
  try {
    if (band instanceof PreparedBand) return band
    const p = prepareBand(band)
    // rectangular bands evaluate fastest from the plain object; a tabulated one needs its prepared form
    return p.kind === 'rectangular' ? p.source : p
  } catch (e) {
    if (e instanceof EngineInputError) {
      const rest = e.field.startsWith('band') ? e.field.slice(4) : `.${e.field}`
      throw new EngineInputError(field + rest, e.message.slice(e.field.length + 2))
    }
    throw e
  }
}

/** Wavelength interval where the responsivity is above zero, µm. */
function support(band: Band | PreparedBand): [number, number] {
  const p = prepareBand(band)
  const lam = p.lambdaUm
  const r = p.response
  const n = lam.length
  let first = 0
  while (first < n && !(r[first]! > 0)) first++
  let last = n - 1
  while (last >= 0 && !(r[last]! > 0)) last--
  return [lam[Math.max(first - 1, 0)]!, lam[Math.min(last + 1, n - 1)]!]
}

/**
 * @internal Checks that band 1 lies at shorter wavelengths than band 2 (see the module notes).
 * @throws EngineInputError on `band2`
 */
export function checkBandOrder(band1: Band | PreparedBand, band2: Band | PreparedBand): void {
  const [, hi1] = support(band1)
  const [lo2] = support(band2)
  if (hi1 > lo2) {
    const [lo1] = support(band1)
    const [, hi2] = support(band2)
    const reversed = hi2 <= lo1
    throw new EngineInputError(
      'band2',
      reversed
        ? `must lie at longer wavelengths than band1 (band2 is ${lo2}–${hi2} µm, band1 ${lo1}–${hi1} µm): swap the bands and the emissivities and use 1/k as the ratio setting`
        : `overlaps band1 (band1 ends at ${hi1} µm, band2 starts at ${lo2} µm): the ratio of overlapping bands need not be monotonic in temperature, so no reading is defined`,
    )
  }
}

function validate(input: RatioReadingInput): { b1: Band | PreparedBand; b2: Band | PreparedBand; c: RadiationConstants } {
  if (typeof input !== 'object' || input === null) throw new EngineInputError('band1', 'ratio reading input must be an object')
  const b1 = prepareNamed(input.band1, 'band1')
  const b2 = prepareNamed(input.band2, 'band2')
  checkBandOrder(b1, b2)
  requireTemperature(input.sourceTemperatureK, 'sourceTemperatureK')
  requireEmissivity(input.sourceEmissivity1, 'sourceEmissivity1')
  requireEmissivity(input.sourceEmissivity2, 'sourceEmissivity2')
  requireTemperature(input.reflectedTemperatureK, 'reflectedTemperatureK')
  const k = input.emissivityRatioSetting
  if (typeof k !== 'number' || !Number.isFinite(k) || k <= 0) {
    throw new EngineInputError('emissivityRatioSetting', `must be a finite ratio above 0, got ${String(k)}`)
  }
  return { b1, b2, c: resolveConstants(input.constants) }
}

const OUT = new Float64Array(2)

/** Outcome codes of {@link solveRatio} besides a temperature. */
const BELOW = -1
const ABOVE = -2

/**
 * @internal Solves ln L_1(T) − ln L_2(T) = lnTarget in [tMin, tMax]; returns T (K), or BELOW / ABOVE
 * when the target ratio is outside [r(tMin), r(tMax)], or NaN when it cannot be formed.
 * g0, dg0 may carry g and g' at the guess (NaN if unknown).
 */
function solveRatio(
  b1: Band | PreparedBand,
  b2: Band | PreparedBand,
  lnTarget: number,
  c: RadiationConstants,
  tMin: number,
  tMax: number,
  guess: number,
  g0: number,
  dg0: number,
): number {
  if (!Number.isFinite(lnTarget)) return Number.NaN
  let lo = tMin
  let hi = tMax
  let loKnown = false // g(lo) < 0 established
  let hiKnown = false // g(hi) > 0 established
  let T = guess
  let known = Number.isFinite(g0) && dg0 > 0
  if (!(T > lo && T < hi)) {
    T = Math.sqrt(lo * hi)
    known = false
  }
  const evalG = (t: number): void => {
    bandRadianceAndDerivativeUnchecked(b1, t, c, OUT)
    const l1 = OUT[0]!
    const d1 = OUT[1]!
    bandRadianceAndDerivativeUnchecked(b2, t, c, OUT)
    const l2 = OUT[0]!
    const d2 = OUT[1]!
    OUT[0] = Math.log(l1) - Math.log(l2) - lnTarget
    OUT[1] = d1 / l1 - d2 / l2
  }
  for (let iter = 0; iter < 200; iter++) {
    let g: number
    let dg: number
    if (known) {
      g = g0
      dg = dg0
      known = false
    } else {
      evalG(T)
      g = OUT[0]!
      dg = OUT[1]!
    }
    if (g === 0) return T
    // NaN or −∞ can only come from radiances underflowing to zero at a very low T: ratio too small
    if (g > 0) {
      hi = T
      hiKnown = true
    } else {
      lo = T
      loKnown = true
    }
    let tn = Number.NaN
    if (Number.isFinite(g) && dg > 0 && Number.isFinite(dg)) {
      const denom = 1 + g / (T * dg)
      if (denom > 0) tn = T / denom
    }
    if (!(tn > lo && tn < hi)) {
      if (!loKnown && !(tn > lo)) {
        evalG(lo)
        if (OUT[0]! > 0) return BELOW
        loKnown = true
      }
      if (!hiKnown && !(tn < hi)) {
        evalG(hi)
        if (!(OUT[0]! >= 0)) return ABOVE
        hiKnown = true
      }
      tn = Math.sqrt(lo * hi)
    } else if (Math.abs(tn - T) <= 1e-9 * T) {
      return tn
    }
    if (hi - lo <= 1e-12 * T) return tn
    T = tn
  }
  return T
}

/** @internal S_1, S_2 and T_R with validated inputs; T_R may be NaN, BELOW or ABOVE. */
function ratioReadingCore(
  b1: Band | PreparedBand,
  b2: Band | PreparedBand,
  ts: number,
  e1: number,
  e2: number,
  tw: number,
  k: number,
  c: RadiationConstants,
  out: Float64Array,
): void {
  bandRadianceAndDerivativeUnchecked(b1, ts, c, OUT)
  const l1s = OUT[0]!
  const d1s = OUT[1]!
  bandRadianceAndDerivativeUnchecked(b2, ts, c, OUT)
  const l2s = OUT[0]!
  const d2s = OUT[1]!
  let s1 = e1 * l1s
  let s2 = e2 * l2s
  if (e1 !== 1) {
    bandRadianceAndDerivativeUnchecked(b1, tw, c, OUT)
    s1 += (1 - e1) * OUT[0]!
  }
  if (e2 !== 1) {
    bandRadianceAndDerivativeUnchecked(b2, tw, c, OUT)
    s2 += (1 - e2) * OUT[0]!
  }
  out[0] = s1
  out[1] = s2
  if (!(s1 > 0 && s2 > 0 && k > 0) || !Number.isFinite(s1) || !Number.isFinite(s2)) {
    out[2] = Number.NaN
    return
  }
  const lnTarget = Math.log(s1) - Math.log(s2) - Math.log(k)
  // g and g' at T_s, reused for the first Newton step
  const g0 = Math.log(l1s) - Math.log(l2s) - lnTarget
  const dg0 = d1s / l1s - d2s / l2s
  out[2] = solveRatio(b1, b2, lnTarget, c, INVERSION_RANGE_K.min, INVERSION_RANGE_K.max, ts, g0, dg0)
}

const CORE = new Float64Array(3)

/**
 * Expected reading of a ratio (two-colour) pyrometer viewing a source, with its sensitivity
 * coefficients (see the module notes for the model, the band-order rule and the formulas).
 * @param input - band1 (shorter wavelengths) and band2 (µm, rectangular or tabulated);
 *   sourceTemperatureK and reflectedTemperatureK in K; sourceEmissivity1 and sourceEmissivity2 in
 *   (0, 1]; emissivityRatioSetting k > 0; constants (default CODATA 2018)
 * @returns expectedReadingK T_R (K); signal1, signal2 (W·m⁻²·sr⁻¹); sensitivities ∂T_R/∂x
 *   (K/K for temperatures, K per unit for emissivities and k)
 * @throws EngineInputError naming `band1…`, `band2…` (also overlapping or reversed bands),
 *   `sourceTemperatureK`, `sourceEmissivity1`, `sourceEmissivity2`, `reflectedTemperatureK`,
 *   `emissivityRatioSetting`, `constants`; `sourceTemperatureK` also when T_R is outside 50 K to 5000 K
 * @example grey source ε_1 = ε_2 = 0.9 at 1273.15 K, T_w = 296.15 K, bands 0.95–1.00 and 1.00–1.05 µm, k = 1:
 *   expectedRatioReading(...).expectedReadingK ≈ 1273.15 K (at 1 µm the 296 K surroundings add ~1e-16 of the source's radiance);
 *   with ε_1 = 0.90, ε_2 = 0.85 and k = 1 it reads ≈ 1417.20 K (see the tests)
 */
export function expectedRatioReading(input: RatioReadingInput): RatioReading {
  const { b1, b2, c } = validate(input)
  const ts = input.sourceTemperatureK
  const e1 = input.sourceEmissivity1
  const e2 = input.sourceEmissivity2
  const tw = input.reflectedTemperatureK
  const k = input.emissivityRatioSetting
  ratioReadingCore(b1, b2, ts, e1, e2, tw, k, c, CORE)
  const s1 = CORE[0]!
  const s2 = CORE[1]!
  const tr = CORE[2]!
  if (!(tr > 0)) {
    const where = tr === ABOVE ? 'above' : tr === BELOW ? 'below' : 'outside'
    throw new EngineInputError(
      'sourceTemperatureK',
      `the ratio reading is ${where} the inversion range ${INVERSION_RANGE_K.min} K to ${INVERSION_RANGE_K.max} K for these bands, emissivities and ratio setting ${k}`,
    )
  }
  const at = (band: Band | PreparedBand, t: number): [number, number] => {
    bandRadianceAndDerivativeUnchecked(band, t, c, OUT)
    return [OUT[0]!, OUT[1]!]
  }
  const [l1r, d1r] = at(b1, tr)
  const [l2r, d2r] = at(b2, tr)
  const [l1s, d1s] = at(b1, ts)
  const [l2s, d2s] = at(b2, ts)
  const [l1w, d1w] = at(b1, tw)
  const [l2w, d2w] = at(b2, tw)
  const D = d1r / l1r - d2r / l2r
  return {
    expectedReadingK: tr,
    signal1: s1,
    signal2: s2,
    sensitivities: {
      sourceTemperature: ((e1 * d1s) / s1 - (e2 * d2s) / s2) / D,
      sourceEmissivity1: (l1s - l1w) / s1 / D,
      sourceEmissivity2: -((l2s - l2w) / s2) / D,
      reflectedTemperature: (((1 - e1) * d1w) / s1 - ((1 - e2) * d2w) / s2) / D,
      emissivityRatioSetting: -1 / (k * D),
    },
  }
}

/**
 * A ratio-reading model for Monte Carlo propagation: x = [T_s (K), ε_1, ε_2, T_w (K), k]
 * (order {@link RATIO_MODEL_INPUTS}) → T_R (K). Bands are validated and prepared once. Sampled inputs
 * are not range-checked (an ε slightly above 1 still computes); a trial with a signal ≤ 0, k ≤ 0 or a
 * reading outside 50 K to 5000 K returns NaN.
 * @param band1 - short-wavelength band or PreparedBand
 * @param band2 - long-wavelength band or PreparedBand
 * @param constants - radiation constants (default CODATA 2018)
 * @returns model function, K
 * @throws EngineInputError for invalid, overlapping or reversed bands (`band1…`, `band2…`)
 * @example ratioReadingModel(b1, b2)([1273.15, 0.9, 0.9, 296.15, 1]) ≈ 1273.15
 */
export function ratioReadingModel(
  band1: Band | PreparedBand,
  band2: Band | PreparedBand,
  constants?: RadiationConstantsChoice,
): (x: ArrayLike<number>) => number {
  const b1 = prepareNamed(band1, 'band1')
  const b2 = prepareNamed(band2, 'band2')
  checkBandOrder(b1, b2)
  const c = resolveConstants(constants)
  const out = new Float64Array(3)
  return (x: ArrayLike<number>): number => {
    const ts = x[0]!
    const tw = x[3]!
    if (!(ts > 0) || !(tw > 0) || !Number.isFinite(ts) || !Number.isFinite(tw)) return Number.NaN
    ratioReadingCore(b1, b2, ts, x[1]!, x[2]!, tw, x[4]!, c, out)
    const t = out[2]!
    return t > 0 ? t : Number.NaN
  }
}
